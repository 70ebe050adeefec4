// Turns: work that at most one process does at a time for a given key (the board deltas of one
// organisation: numbered and built one after another across the processes, as one process does
// them). A turn is a Redis key set with NX and an expiry, held by a random token and given back
// by a script that deletes it only while it still holds that token.
import { randomBytes } from 'node:crypto';
import { withinMs, type RedisConnection } from './redis';

export interface Turns {
  /** Runs `work` once no other process holds `key`'s turn; rejects (without running it) when the turn cannot be had. */
  take<T>(key: string, work: () => Promise<T>): Promise<T>;
}

/** How long a turn is held at most (a process that dies holding it frees it after this). */
const HOLD_MS = 5_000;
/** How long a process waits for a turn before giving up. */
const WAIT_MS = 3_000;
const RETRY_MS = 3;
const GIVE_BACK = `if redis.call('GET', KEYS[1]) == ARGV[1] then return redis.call('DEL', KEYS[1]) else return 0 end`;

/** Turns in Redis, shared by every process on it. */
export function redisTurns(client: RedisConnection): Turns {
  return {
    async take(key, work) {
      const turnKey = `brimstock:turn:${key}`;
      const token = randomBytes(9).toString('base64url');
      const until = Date.now() + WAIT_MS;
      for (;;) {
        const reply = await withinMs(client.set(turnKey, token, { condition: 'NX', expiration: { type: 'PX', value: HOLD_MS } }), 1_000, 'a turn');
        if (reply === 'OK') break;
        if (Date.now() > until) throw new Error(`the turn ${key} was not free within ${WAIT_MS} ms`);
        await new Promise((r) => setTimeout(r, RETRY_MS));
      }
      try {
        return await work();
      } finally {
        await withinMs(client.sendCommand(['EVAL', GIVE_BACK, '1', turnKey, token]), 1_000, 'a turn given back').catch(() => undefined);
      }
    },
  };
}
