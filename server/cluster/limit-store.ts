// The sign-in limits' store while several processes share a Redis: the counts live in Redis
// (rate-limit-redis), and while Redis cannot be reached this process counts in its own memory, so
// sign-in keeps answering and a guesser is still held back (per process) until Redis returns.
import { MemoryStore, type ClientRateLimitInfo, type Options, type Store } from 'express-rate-limit';
import type { Logger } from 'pino';
import { withinMs } from './redis';

/** How long a count may wait for Redis before this process counts it itself. */
const REDIS_WAIT_MS = 500;

/** `shared` (Redis), falling back to an in-memory store for each count that Redis does not answer. */
export function fallbackStore(shared: Store, logger: Logger): Store {
  const own = new MemoryStore();
  let warnedAt = 0;
  const fallBack = (err: unknown) => {
    if (Date.now() - warnedAt > 10_000) {
      warnedAt = Date.now();
      logger.warn({ err }, 'sign-in limits counted in this process while Redis is away');
    }
  };
  const both = async (work: (s: Store) => Promise<void> | void) => {
    await Promise.all([work(own), withinMs(Promise.resolve(work(shared)), REDIS_WAIT_MS, 'a sign-in limit').catch(fallBack)]);
  };
  return {
    prefix: shared.prefix,
    localKeys: false,
    init(options: Options) {
      own.init(options);
      return shared.init?.(options);
    },
    async increment(key): Promise<ClientRateLimitInfo> {
      const mine = await own.increment(key);
      try {
        return await withinMs(Promise.resolve(shared.increment(key)), REDIS_WAIT_MS, 'a sign-in limit');
      } catch (err) {
        fallBack(err);
        return mine;
      }
    },
    decrement: (key) => both((s) => s.decrement(key)),
    resetKey: (key) => both((s) => s.resetKey(key)),
    async get(key) {
      try {
        return await withinMs(Promise.resolve(shared.get?.(key)), REDIS_WAIT_MS, 'a sign-in limit');
      } catch (err) {
        fallBack(err);
        return own.get(key);
      }
    },
    shutdown: () => own.shutdown(),
  };
}
