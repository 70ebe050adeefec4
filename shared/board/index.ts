// Stock-board totals: sums of each tank's latest volumes by contents.
import { stockFigures } from '../readings/index';
import { TANK_CONTENTS, type ContentsTotal, type TankTile } from '../schemas/index';

/** Totals per contents (L) over the given tiles; the percentage is of the usable capacity of the tanks that have a reading. */
export function totalsOf(tiles: TankTile[]): ContentsTotal[] {
  return TANK_CONTENTS.map((contents) => {
    const of = tiles.filter((t) => t.contents === contents);
    const read = of.filter((t) => t.grossL !== null);
    const grossL = read.reduce((s, t) => s + t.grossL!, 0);
    const usableL = read.reduce((s, t) => s + t.usableL!, 0);
    const figures = stockFigures({ grossL, usableL }, read.reduce((s, t) => s + t.usableCapacityL, 0));
    const oldest = read.reduce<string | null>((o, t) => (o === null || t.takenAt! < o ? t.takenAt : o), null);
    return {
      contents,
      grossL,
      usableL,
      capacityL: of.reduce((s, t) => s + t.capacityL, 0),
      usableCapacityL: figures.usableCapacityL,
      percentOfUsableCapacity: figures.percentOfUsableCapacity,
      tanks: of.length,
      tanksWithoutReading: of.length - read.length,
      oldestReadingAt: oldest,
    };
  });
}
