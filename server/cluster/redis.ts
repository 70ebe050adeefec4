// One connection to the Redis that several server processes share (REDIS_URL). The client
// reconnects by itself; while it is away, publishes and lock claims fail and are logged, and
// every kept value still ends within its own time limit.
import { createClient } from 'redis';
import type { Logger } from 'pino';

/** Builds the client (default modules, RESP 3), so its type is the one every caller holds. */
const makeClient = (url: string) => createClient({ url, socket: { connectTimeout: 5_000, reconnectStrategy: (tries: number) => Math.min(2_000, 50 * 2 ** tries) } });

export type RedisConnection = ReturnType<typeof makeClient>;

/** Connects to `url` and waits until Redis answers; errors after that are logged, never thrown at the process. */
export async function connectRedis(url: string, logger: Logger, role: string): Promise<RedisConnection> {
  const client = makeClient(url);
  let lastLoggedAt = 0;
  client.on('error', (err: unknown) => {
    // A Redis that is away would log on every retry: once every 10 s is enough to notice.
    if (Date.now() - lastLoggedAt < 10_000) return;
    lastLoggedAt = Date.now();
    logger.warn({ err, role }, 'Redis connection failed; retrying');
  });
  await client.connect();
  return client;
}
