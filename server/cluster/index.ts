// What the server processes of one installation share: a bus for "this changed, drop your copy",
// claims that make background jobs run once, and the store of the sign-in limits. With REDIS_URL
// set they go through Redis; without it they live in this process's memory, as one process needs.
import { RedisStore, type RedisReply } from 'rate-limit-redis';
import type { Logger } from 'pino';
import type { Config } from '../config';
import type { AppContext } from '../context';
import type { LimitStoreFor } from '../middleware/rate-limits';
import { memoryBus, redisBus, type Bus } from './bus';
import { memoryLock, redisLock, type JobLock } from './job-lock';
import { connectRedis } from './redis';

export interface Cluster {
  /** True when other processes may share the work (Redis). */
  shared: boolean;
  bus: Bus;
  locks: JobLock;
  /** The sign-in limits' store per limiter name; undefined: the limiter's own memory. */
  limitStoreFor: LimitStoreFor;
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
  return {
    shared: true,
    bus,
    locks: redisLock(client),
    // A store per limiter (express-rate-limit refuses one store for two limiters), its keys under the limiter's name.
    limitStoreFor: (name) => new RedisStore({ prefix: `brimstock:limit:${name}:`, sendCommand: (...args: string[]) => client.sendCommand(args) as Promise<RedisReply> }),
    async close() {
      await bus.close();
      await client.quit().catch(() => client.destroy());
    },
  };
}

/** The context's cluster; a context made without one (tests, scripts) gets the one-process cluster. */
export function clusterOf(ctx: AppContext): Cluster {
  ctx.cluster ??= localCluster(ctx.logger);
  return ctx.cluster;
}
