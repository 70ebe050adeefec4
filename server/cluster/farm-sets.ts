// Which farm sets someone watches over a live socket, across the processes: the board pushes one
// delta per watched set, and its watchers may sit on any process. Each process lists the sets of
// its own sockets in Redis (a sorted set per organisation, scored by when the entry lapses) and
// renews them while the sockets stay; a set nobody renews lapses after WATCH_TTL_MS. Without Redis
// (one process) only the local socket rooms count, as before.
import type { Logger } from 'pino';
import { withinMs, type RedisConnection } from './redis';

/** How long a watched set stays listed without being renewed. */
export const WATCH_TTL_MS = 60_000;
/** How often a process renews the sets of its sockets. */
export const WATCH_RENEW_MS = 15_000;

export interface WatchedSets {
  /** Lists `setKeys` of `organisationId` as watched from now (a socket joined). */
  add(organisationId: number, setKeys: readonly string[]): Promise<void>;
  /** The set keys of `organisationId` watched on any process; rejects when that cannot be known. */
  list(organisationId: number): Promise<string[]>;
}

const listKey = (organisationId: number) => `brimstock:board:watched:${organisationId}`;

/** The sets watched across the processes, in Redis. */
export function redisWatchedSets(client: RedisConnection, logger: Logger): WatchedSets {
  return {
    async add(organisationId, setKeys) {
      if (!setKeys.length) return;
      const key = listKey(organisationId);
      const until = Date.now() + WATCH_TTL_MS;
      await withinMs(
        client
          .multi()
          .zAdd(key, setKeys.map((value) => ({ score: until, value })))
          .zRemRangeByScore(key, '-inf', Date.now())
          .pExpire(key, WATCH_TTL_MS)
          .exec(),
        1_000,
        'the watched farm sets',
      ).catch((err: unknown) => logger.debug({ err }, 'watched farm sets not listed while Redis is away'));
    },
    async list(organisationId) {
      return withinMs(client.zRangeByScore(listKey(organisationId), Date.now(), '+inf'), 1_000, 'the watched farm sets');
    },
  };
}
