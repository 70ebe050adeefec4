// The live board's delta stream: each farm set (the farms one person may see) has a numbered stream
// of deltas. A delta holds what changed of each tank tile since the last one (the fields that
// changed; a new tile whole); the receiver works the totals out from its tiles. It is built once per
// change and farm set and sent to the set's socket.io room. GET /api/board says up to which number it
// includes (its `stream`), so a client applies the deltas after that in order and fetches the board
// again on a gap.
//
// With several server processes (Redis) one of them builds every delta, the holder of the board
// builder's lease (server/realtime.ts): the others tell it which farms changed. A process that starts
// building forgets what it kept before, so its first deltas carry whole farms.
import { BOARD_DELTA_VERSION, type BoardDelta, type FarmBoard, type FarmDelta, type TankTile, type TankTilePatch } from '@shared/schemas';
import { clusterOf } from '../cluster';
import type { AppContext } from '../context';
import { boardOf } from './board';
import { boardSequences } from './board-sequences';

/** A farm set watched over sockets: its stream key and the farms it shows. */
export interface WatchedSet {
  key: string;
  farmIds: ReadonlySet<number>;
}

/** A farm as last sent: its name and each tile. */
interface KeptFarm {
  name: string;
  tiles: Map<number, TankTile>;
  readAt: number;
}

/**
 * A farm unchanged by events is read again after this long, so edits that send no event (a tank
 * renamed, added or archived) reach the watchers too; the kept board is rebuilt as often.
 */
const KEPT_FARM_MS = 30_000;

/**
 * What changed of a tile since it was last sent: the fields whose value differs (the whole tile when
 * it was not sent before), or null when nothing did. Days of cover count down with the clock: they
 * go along with another change, never alone.
 */
export function tilePatch(before: TankTile | undefined, tile: TankTile): TankTilePatch | null {
  if (!before) return tile;
  const patch: Record<string, unknown> = {};
  let changed = false;
  for (const key of Object.keys(tile) as (keyof TankTile)[]) {
    if (tile[key] === before[key] || key === 'tankId') continue;
    patch[key] = tile[key];
    if (key !== 'daysOfCover') changed = true;
  }
  return changed ? { tankId: tile.tankId, ...patch } : null;
}

/** Builds the deltas of one server: keeps each organisation's farms as last sent to compare new reads with. */
export function createDeltaBuilder(ctx: AppContext) {
  const kept = new Map<number, Map<number, KeptFarm>>();
  /** Reads under way of farms a new socket watches that are not kept yet, per organisation. */
  const priming = new Map<number, Promise<void>>();
  const shared = clusterOf(ctx).shared;

  const keepFarm = (farms: Map<number, KeptFarm>, fresh: FarmBoard, readAt: number) => {
    farms.set(fresh.farmId, { name: fresh.name, tiles: new Map(fresh.tanks.map((tile) => [tile.tankId, tile])), readAt });
  };

  /**
   * Reads the farms of a newly watched set that are not kept yet, so that the first change after
   * it sends only what changed (the socket's client has the rest from GET /api/board).
   */
  function watch(organisationId: number, farmIds: readonly number[]): Promise<void> {
    // Across processes a farm read now may be newer than what the clients were sent: the first build reads it instead.
    if (shared) return Promise.resolve();
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
    const { epoch, seqs } = await boardSequences(ctx).next(touched.map((set) => set.key));
    const numbered = touched.map((set, i) => ({ set, seq: seqs[i] }));

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
      const patches = fresh.tanks.flatMap((tile) => tilePatch(before?.tiles.get(tile.tankId), tile) ?? []);
      const removedTankIds = before ? [...before.tiles.keys()].filter((id) => !tiles.has(id)) : [];
      if (patches.length || removedTankIds.length || !before || before.name !== fresh.name) farmDeltas.set(farmId, { farmId, name: fresh.name, tanks: patches, removedTankIds });
    }

    return numbered.map(({ set, seq }) => {
      const delta: BoardDelta = {
        version: BOARD_DELTA_VERSION,
        epoch,
        seq,
        generatedAt: board.generatedAt,
        farms: [...set.farmIds].flatMap((id) => farmDeltas.get(id) ?? []),
        removedFarmIds: [...set.farmIds].filter((id) => removedFarms.has(id)),
      };
      return { key: set.key, delta };
    });
  }

  /** Forgets every farm kept, so the next deltas carry them whole (this process starts building after another). */
  const forget = () => kept.clear();

  return { watch, build, forget };
}
