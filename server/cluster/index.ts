// What the server processes of one installation share: a bus for "this changed, drop your copy",
// claims that make background jobs run once, the store of the sign-in limits, socket.io's adapter,
// the board streams' numbers and the list of watched farm sets. With REDIS_URL set they go through
// Redis; without it they live in this process's memory, as one process needs.
import { RedisStore, type RedisReply } from 'rate-limit-redis';
import type { Logger } from 'pino';
import type { Config } from '../config';
import type { AppContext } from '../context';
import type { LimitStoreFor } from '../middleware/rate-limits';
import { memoryBus, redisBus, type Bus } from './bus';
import { memoryLock, redisLock, type JobLock } from './job-lock';
import { fallbackStore } from './limit-store';
import { connectRedis, type RedisConnection } from './redis';
import { redisSocketAdapter, type SocketAdapter } from './socket-adapter';
import { redisWatchedSets, type WatchedSets } from './farm-sets';

export interface Cluster {
  /** True when other processes may share the work (Redis). */
  shared: boolean;
  bus: Bus;
  locks: JobLock;
  /** The sign-in limits' store per limiter name; undefined: the limiter's own memory. */
  limitStoreFor: LimitStoreFor;
  /** The shared Redis connection (board stream numbers); absent for one process. */
  redis?: RedisConnection;
  /** socket.io's Redis adapter; absent for one process (socket.io's own in-memory adapter). */
  socketAdapter?: SocketAdapter;
  /** The farm sets watched on any process; absent for one process (its socket rooms say). */
  watchedSets?: WatchedSets;
  close(): Promise<void>;
}

/** The one-process cluster: an in-memory bus and claims, the limiters' own memory stores. */
export function localCluster(logger: Logger): Cluster {
  const bus = memoryBus(logger);
  return { shared: false, bus, locks: memoryLock(), limitStoreFor: () => undefined, close: () => bus.close() };
}

/** Connects to `config.redisUrl` when set (and waits for it), else the one-process cluster. */
export async function openCluster(config: Pick<Config, 'redisUrl'>, logger: Logger): Promise<Cluster> {
  if (!config.redisUrl) return localCluster(logger);
  const client = await connectRedis(config.redisUrl, logger, 'shared state');
  const bus = await redisBus(client, logger);
  const socketAdapter = await redisSocketAdapter(client, logger);
  return {
    shared: true,
    bus,
    locks: redisLock(client),
    // A store per limiter (express-rate-limit refuses one store for two limiters), its keys under the limiter's name;
    // while Redis is away each process counts in its memory.
    limitStoreFor: (name) =>
      fallbackStore(new RedisStore({ prefix: `brimstock:limit:${name}:`, sendCommand: (...args: string[]) => client.sendCommand(args) as Promise<RedisReply> }), logger),
    redis: client,
    socketAdapter,
    watchedSets: redisWatchedSets(client, logger),
    async close() {
      await bus.close();
      await socketAdapter.close();
      await client.quit().catch(() => client.destroy());
    },
  };
}

/** The context's cluster; a context made without one (tests, scripts) gets the one-process cluster. */
export function clusterOf(ctx: AppContext): Cluster {
  ctx.cluster ??= localCluster(ctx.logger);
  return ctx.cluster;
}
