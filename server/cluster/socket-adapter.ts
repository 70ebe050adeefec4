// socket.io across the server processes: @socket.io/redis-adapter over two duplicates of the shared
// Redis connection (one publishes, one listens), so a push raised on any process reaches the sockets
// of its room on every process. The packet is encoded once by the process that raises it and once
// per room by each process that hears it, never per socket.
import { createAdapter } from '@socket.io/redis-adapter';
import type { Logger } from 'pino';
import { watchConnection, type RedisConnection } from './redis';

export interface SocketAdapter {
  /** What `io.adapter(…)` takes. */
  adapter: ReturnType<typeof createAdapter>;
  close(): Promise<void>;
}

/** The Redis adapter on two new connections made from `client`; a publish that fails while Redis is away is dropped, never thrown at the process. */
export async function redisSocketAdapter(client: RedisConnection, logger: Logger): Promise<SocketAdapter> {
  const pub = client.duplicate();
  const sub = client.duplicate();
  watchConnection(pub, logger, 'socket pushes');
  watchConnection(sub, logger, 'socket pushes (listening)');
  await Promise.all([pub.connect(), sub.connect()]);
  // The adapter does not wait on its publishes: without Redis they would reject with no one to catch them.
  const publish = pub.publish.bind(pub);
  Object.defineProperty(pub, 'publish', { value: (...args: Parameters<typeof publish>) => publish(...args).catch(() => 0), configurable: true });
  return {
    adapter: createAdapter(pub, sub, { key: 'brimstock:io' }),
    async close() {
      await Promise.all([pub, sub].map((c) => c.quit().catch(() => c.destroy())));
    },
  };
}
