// One connection to the Redis that several server processes share (REDIS_URL). The client
// reconnects by itself; while it is away every command fails at once (no offline queue: nothing
// waits for Redis on a request's path, nothing stale is sent when it returns), publishes and lock
// claims fail and are logged, and every kept value still ends within its own time limit.
import { createClient } from 'redis';
import type { Logger } from 'pino';

/** Builds the client (default modules, RESP 3), so its type is the one every caller holds. */
const makeClient = (url: string) =>
  createClient({ url, disableOfflineQueue: true, socket: { connectTimeout: 5_000, reconnectStrategy: (tries: number) => Math.min(2_000, 50 * 2 ** tries) } });

export type RedisConnection = ReturnType<typeof makeClient>;

/** Listens to a connection's errors so none reaches the process; logs a failure once every 10 s and the return once. */
export function watchConnection(client: Pick<RedisConnection, 'on'>, logger: Logger, role: string): void {
  let lastLoggedAt = 0;
  let away = false;
  client.on('error', (err: unknown) => {
    away = true;
    // A Redis that is away would log on every retry: once every 10 s is enough to notice.
    if (Date.now() - lastLoggedAt < 10_000) return;
    lastLoggedAt = Date.now();
    logger.warn({ err, role }, 'Redis connection failed; retrying');
  });
  client.on('ready', () => {
    if (!away) return;
    away = false;
    lastLoggedAt = 0;
    logger.warn({ role }, 'Redis connection is back');
  });
}

/** Connects to `url` and waits until Redis answers; errors after that are logged, never thrown at the process. */
export async function connectRedis(url: string, logger: Logger, role: string): Promise<RedisConnection> {
  const client = makeClient(url);
  watchConnection(client, logger, role);
  await client.connect();
  return client;
}

/** `work`, or a rejection once `ms` pass without an answer (a Redis that hangs must not hold a request). */
export function withinMs<T>(work: Promise<T>, ms: number, what: string): Promise<T> {
  let timer: NodeJS.Timeout | undefined;
  const late = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`Redis did not answer ${what} within ${ms} ms`)), ms);
  });
  return Promise.race([work, late]).finally(() => clearTimeout(timer));
}
