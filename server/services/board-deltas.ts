// The live board's delta stream: each farm set (the farms one person may see) has a numbered stream
// of deltas. A delta holds what changed of each tank tile since the last one (the fields that
// changed; a new tile whole); the receiver works the totals out from its tiles. It is built once per
// change and farm set and sent to the set's socket.io room. GET /api/board says up to which number it includes (its `stream`), so a
// client applies the deltas after that in order and fetches the board again on a gap.
//
// With several server processes (Redis), the process where a change happened builds its delta. The
// builds of one organisation take turns across the processes (server/cluster/turns.ts) and each is
// counted; the farm changes a build sends go out on the bus, and every other process applies them
// to its own copy of the farms, so whichever process builds next compares with what the clients
// were sent. A process that missed a build (the bus dropped it, it started late) forgets its copy
// of that organisation's farms and reads them whole once.
import { BOARD_DELTA_VERSION, tankTileSchema, type BoardDelta, type FarmBoard, type FarmDelta, type TankTile, type TankTilePatch } from '@shared/schemas';
import { clusterOf } from '../cluster';
import { withinMs } from '../cluster/redis';
import { redisTurns } from '../cluster/turns';
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

/** What one build sent, on the bus: its number in the organisation's count and its farm changes (null: lost, forget the farms). */
interface SentFarms {
  organisationId: number;
  n: number;
  farms: FarmDelta[] | null;
  removedFarmIds: number[];
}
const SENT_TOPIC = 'board-sent';
const builtKey = (organisationId: number) => `brimstock:board:built:${organisationId}`;
/** How long a build waits for the bus to bring the previous build's farm changes before reading the farms whole. */
const CATCH_UP_MS = 100;
/** How often the count of builds that read the farms whole is logged (when there were any). */
const MISSES_LOG_MS = 60_000;

/** Builds the deltas of one server: keeps each organisation's farms as last sent to compare new reads with. */
export function createDeltaBuilder(ctx: AppContext) {
  const kept = new Map<number, Map<number, KeptFarm>>();
  /** Reads under way of farms a new socket watches that are not kept yet, per organisation. */
  const priming = new Map<number, Promise<void>>();
  const cluster = clusterOf(ctx);
  const redis = cluster.redis;
  const turns = redis ? redisTurns(redis) : null;
  /** Per organisation, the last build (of any process) whose farm changes the kept farms include. */
  const applied = new Map<number, number>();
  const misses = { builds: 0, missed: 0, since: Date.now() };

  const keepFarm = (farms: Map<number, KeptFarm>, fresh: FarmBoard, readAt: number) => {
    farms.set(fresh.farmId, { name: fresh.name, tiles: new Map(fresh.tanks.map((tile) => [tile.tankId, tile])), readAt });
  };

  /** Another process's build: its farm changes applied to the kept farms, or the farms forgotten when one was missed. */
  const heard = ({ organisationId, n, farms: sent, removedFarmIds }: SentFarms) => {
    const at = applied.get(organisationId) ?? 0;
    if (n <= at) return;
    applied.set(organisationId, n);
    const farms = kept.get(organisationId);
    if (!farms) return;
    if (n !== at + 1 || !sent) return void farms.clear();
    for (const change of sent) {
      const farm = farms.get(change.farmId);
      if (!farm) continue;
      farm.name = change.name;
      for (const patch of change.tanks) {
        const tile = farm.tiles.get(patch.tankId);
        // A patch of a tile this process never had: it reads the farm whole next time.
        if (tile) farm.tiles.set(patch.tankId, { ...tile, ...patch });
        else {
          const whole = tankTileSchema.safeParse(patch);
          if (whole.success) farm.tiles.set(patch.tankId, whole.data);
          else farm.readAt = 0;
        }
      }
      for (const id of change.removedTankIds) farm.tiles.delete(id);
    }
    for (const id of removedFarmIds) farms.delete(id);
  };
  const stopHearing = redis ? cluster.bus.subscribe(SENT_TOPIC, (body) => heard(body as SentFarms)) : () => undefined;

  /** This process's build number `n` of the organisation, once the kept farms include every build before it. */
  const countBuild = async (organisationId: number): Promise<number> => {
    const n = await withinMs(redis!.incr(builtKey(organisationId)), 1_000, 'the board build count');
    const until = Date.now() + CATCH_UP_MS;
    while ((applied.get(organisationId) ?? 0) < n - 1 && Date.now() < until) await new Promise((r) => setTimeout(r, 2));
    misses.builds++;
    if ((applied.get(organisationId) ?? 0) !== n - 1) {
      misses.missed++;
      kept.get(organisationId)?.clear();
    }
    if (Date.now() - misses.since > MISSES_LOG_MS) {
      // Each miss makes a bigger delta (whole farms): a bus that keeps missing shows here.
      if (misses.missed) ctx.logger.warn({ builds: misses.builds, missed: misses.missed }, 'board deltas read whole farms after missing another process build');
      Object.assign(misses, { builds: 0, missed: 0, since: Date.now() });
    }
    applied.set(organisationId, n);
    return n;
  };

  /**
   * Reads the farms of a newly watched set that are not kept yet, so that the first change after
   * it sends only what changed (the socket's client has the rest from GET /api/board).
   */
  function watch(organisationId: number, farmIds: readonly number[]): Promise<void> {
    // Across processes a farm read now may be newer than what the clients were sent: the first build reads it instead.
    if (redis) return Promise.resolve();
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
    if (!turns) return buildTouched(organisationId, changed, touched, null);
    return turns.take(`board:${organisationId}`, async () => {
      const n = await countBuild(organisationId);
      try {
        return await buildTouched(organisationId, changed, touched, n);
      } catch (err) {
        // The other processes cannot know what this build changed: they read the farms whole next time.
        cluster.bus.publish(SENT_TOPIC, { organisationId, n, farms: null, removedFarmIds: [] } satisfies SentFarms);
        kept.get(organisationId)?.clear();
        throw err;
      }
    });
  }

  /** The deltas of `touched`; `n`: this build's number in the organisation's count across processes (null: one process). */
  async function buildTouched(organisationId: number, changed: Set<number>, touched: WatchedSet[], n: number | null): Promise<{ key: string; delta: BoardDelta }[]> {
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
    if (n !== null) cluster.bus.publish(SENT_TOPIC, { organisationId, n, farms: [...farmDeltas.values()], removedFarmIds: [...removedFarms] } satisfies SentFarms);

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

  return { watch, build, close: stopHearing };
}
