// Stock-board totals: sums of each tank's latest volumes by contents.
import { TANK_CONTENTS, type ContentsTotal, type TankTile } from '../schemas/index';

/** Totals per contents (L) over the given tiles; percentFull over the capacity of tanks that have a reading. */
export function totalsOf(tiles: TankTile[]): ContentsTotal[] {
  return TANK_CONTENTS.map((contents) => {
    const of = tiles.filter((t) => t.contents === contents);
    const read = of.filter((t) => t.grossL !== null);
    const grossL = read.reduce((s, t) => s + t.grossL!, 0);
    const readCapacityL = read.reduce((s, t) => s + t.capacityL, 0);
    const oldest = read.reduce<string | null>((o, t) => (o === null || t.takenAt! < o ? t.takenAt : o), null);
    return {
      contents,
      grossL,
      usableL: read.reduce((s, t) => s + t.usableL!, 0),
      capacityL: of.reduce((s, t) => s + t.capacityL, 0),
      percentFull: readCapacityL > 0 ? (grossL / readCapacityL) * 100 : 0,
      tanks: of.length,
      tanksWithoutReading: of.length - read.length,
      oldestReadingAt: oldest,
    };
  });
}
