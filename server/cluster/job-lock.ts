// Claims that make a background job run in one process only. A periodic job claims its period's
// slot (wall-clock time divided by the period): of the processes whose timers fire within one
// slot, the first claim wins and the others skip, so it runs once per period across them. A
// one-off piece of work claims a key of its own. Claims are never released: they expire.
import type { RedisConnection } from './redis';

export interface JobLock {
  /** True for the one claim of `key` within `ttlMs` (the first caller across the processes). */
  claim(key: string, ttlMs: number): Promise<boolean>;
}

/** The slot of `now` (epoch ms) for a job every `periodMs`. */
export const slotOf = (now: number, periodMs: number) => Math.floor(now / periodMs);

/** Claims `name`'s slot of `now`: true in the one process that runs the job this period. */
export function claimSlot(lock: JobLock, name: string, periodMs: number, now = Date.now()): Promise<boolean> {
  // Kept for two periods, so a late claim of the same slot still finds it.
  return lock.claim(`${name}:${slotOf(now, periodMs)}`, Math.max(1, Math.round(periodMs * 2)));
}

/** Claims kept in this process's memory: for one process, where every claim of a new key wins. */
export function memoryLock(): JobLock {
  const held = new Map<string, number>();
  return {
    async claim(key, ttlMs) {
      const now = Date.now();
      for (const [k, until] of held) if (until <= now) held.delete(k);
      if (held.has(key)) return false;
      held.set(key, now + ttlMs);
      return true;
    },
  };
}

/** Claims in Redis (SET NX with an expiry), shared by every process on the same Redis. */
export function redisLock(client: RedisConnection): JobLock {
  return {
    async claim(key, ttlMs) {
      const reply = await client.set(`brimstock:job:${key}`, String(process.pid), { condition: 'NX', expiration: { type: 'PX', value: ttlMs } });
      return reply === 'OK';
    },
  };
}
