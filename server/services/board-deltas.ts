// The live board's delta stream: each farm set (the farms one person may see) has a numbered stream
// of deltas. A delta holds the tank tiles that changed since the last one, the totals of the farms
// they are on and the totals across the set; it is built once per change and farm set and sent to
// the set's socket.io room. GET /api/board says up to which number it includes (its `stream`), so a
// client applies the deltas after that in order and fetches the board again on a gap.
import { totalsOf } from '@shared/board';
import { BOARD_DELTA_VERSION, type BoardDelta, type FarmBoard, type FarmDelta, type TankTile } from '@shared/schemas';
import type { AppContext } from '../context';
import { boardOf } from './board';
import { boardSequences } from './board-sequences';

/** A farm set watched over sockets: its stream key and the farms it shows. */
export interface WatchedSet {
  key: string;
  farmIds: ReadonlySet<number>;
}

/** A farm as last sent: its name and totals, and each tile with what it showed. */
interface KeptFarm {
  name: string;
  totals: FarmBoard['totals'];
  tiles: Map<number, { tile: TankTile; shown: string }>;
  readAt: number;
}

/**
 * A farm unchanged by events is read again after this long, so edits that send no event (a tank
 * renamed, added or archived) reach the watchers too; the kept board is rebuilt as often.
 */
const KEPT_FARM_MS = 30_000;

// Days of cover count down with the clock: a tile whose other figures stayed is not a change.
const shownOf = (tile: TankTile) => JSON.stringify({ ...tile, daysOfCover: null });

/** Builds the deltas of one server: keeps each organisation's farms as last sent to compare new reads with. */
export function createDeltaBuilder(ctx: AppContext) {
  const kept = new Map<number, Map<number, KeptFarm>>();
  /** Reads under way of farms a new socket watches that are not kept yet, per organisation. */
  const priming = new Map<number, Promise<void>>();

  const keepFarm = (farms: Map<number, KeptFarm>, fresh: FarmBoard, readAt: number) => {
    const tiles = new Map(fresh.tanks.map((tile) => [tile.tankId, { tile, shown: shownOf(tile) }]));
    farms.set(fresh.farmId, { name: fresh.name, totals: fresh.totals, tiles, readAt });
  };

  /**
   * Reads the farms of a newly watched set that are not kept yet, so that the first change after
   * it sends only what changed (the socket's client has the rest from GET /api/board).
   */
  function watch(organisationId: number, farmIds: readonly number[]): Promise<void> {
    const farms = kept.get(organisationId) ?? new Map<number, KeptFarm>();
    kept.set(organisationId, farms);
    const missing = farmIds.filter((id) => !farms.has(id));
    if (!missing.length) return priming.get(organisationId) ?? Promise.resolve();
    const before = priming.get(organisationId) ?? Promise.resolve();
    const readAt = Date.now();
    const read = before
      .then(() => boardOf(ctx, organisationId, missing))
      .then((board) => {
        // A farm read by a delta meanwhile is newer than this read.
        for (const fresh of board.farms) if (!farms.has(fresh.farmId)) keepFarm(farms, fresh, readAt);
      })
      .finally(() => {
        if (priming.get(organisationId) === read) priming.delete(organisationId);
      });
    priming.set(organisationId, read);
    return read;
  }

  /**
   * The deltas of the watched farm sets that show any of `changedFarmIds`, numbered (numbers are
   * given out before the read, so a board built after a number was given out includes what it carries).
   */
  async function build(organisationId: number, changedFarmIds: Iterable<number>, sets: WatchedSet[]): Promise<{ key: string; delta: BoardDelta }[]> {
    if (!sets.length) {
      kept.delete(organisationId);
      return [];
    }
    await priming.get(organisationId)?.catch(() => undefined);
    const changed = new Set(changedFarmIds);
    const touched = sets.filter((s) => [...changed].some((id) => s.farmIds.has(id)));
    if (!touched.length) return [];
    const sequences = boardSequences(ctx);
    const numbered = touched.map((set) => ({ set, seq: sequences.next(set.key) }));

    let farms = kept.get(organisationId);
    if (!farms) kept.set(organisationId, (farms = new Map()));
    const now = Date.now();
    const toRead = new Set<number>();
    for (const { farmIds } of touched) {
      for (const id of farmIds) {
        const farm = farms.get(id);
        if (changed.has(id) || !farm || now - farm.readAt > KEPT_FARM_MS) toRead.add(id);
      }
    }
    const board = await boardOf(ctx, organisationId, [...toRead]);
    const byId = new Map(board.farms.map((f) => [f.farmId, f]));
    const farmDeltas = new Map<number, FarmDelta>();
    const removedFarms = new Set<number>();
    for (const farmId of toRead) {
      const fresh = byId.get(farmId);
      const before = farms.get(farmId);
      if (!fresh) {
        // No tanks left, or the farm archived: it leaves the board.
        if (before) removedFarms.add(farmId);
        farms.delete(farmId);
        continue;
      }
      keepFarm(farms, fresh, now);
      const tiles = farms.get(farmId)!.tiles;
      const changedTiles = [...tiles.values()].filter((t) => before?.tiles.get(t.tile.tankId)?.shown !== t.shown).map((t) => t.tile);
      const removedTankIds = before ? [...before.tiles.keys()].filter((id) => !tiles.has(id)) : [];
      const totalsMoved = !before || before.name !== fresh.name || JSON.stringify(before.totals) !== JSON.stringify(fresh.totals);
      if (changedTiles.length || removedTankIds.length || totalsMoved) farmDeltas.set(farmId, { farmId, name: fresh.name, totals: fresh.totals, tanks: changedTiles, removedTankIds });
    }

    return numbered.map(({ set, seq }) => {
      const shown = [...set.farmIds].flatMap((id) => {
        const farm = farms.get(id);
        return farm ? [farm] : [];
      });
      shown.sort((a, b) => a.name.localeCompare(b.name));
      const delta: BoardDelta = {
        version: BOARD_DELTA_VERSION,
        epoch: sequences.epoch,
        seq,
        generatedAt: board.generatedAt,
        totals: totalsOf(shown.flatMap((f) => [...f.tiles.values()].map((t) => t.tile))),
        farms: [...set.farmIds].flatMap((id) => farmDeltas.get(id) ?? []),
        removedFarmIds: [...set.farmIds].filter((id) => removedFarms.has(id)),
      };
      return { key: set.key, delta };
    });
  }

  return { watch, build };
}
