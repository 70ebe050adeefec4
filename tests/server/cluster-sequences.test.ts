// The board streams' numbers in Redis (services/board-sequences.ts) and the lease of the delta builder
// (cluster/lease.ts), each over two connections to a real redis-server as two server processes would
// hold them; and the sign-in limits' store that counts in memory while Redis cannot be reached.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pino from 'pino';
import { MemoryStore, type Options } from 'express-rate-limit';
import type { RedisServer } from '../../scripts/lib/redis';
import { connectRedis, type RedisConnection } from '../../server/cluster/redis';
import { fallbackStore } from '../../server/cluster/limit-store';
import { redisLease } from '../../server/cluster/lease';
import { EPOCH_KEY, memorySequences, redisSequences } from '../../server/services/board-sequences';
import { testRedis } from '../support/cluster-processes';

const logger = pino({ level: 'silent' });
let redis: RedisServer;
const clients: RedisConnection[] = [];

beforeAll(async () => {
  redis = await testRedis();
}, 30_000);
afterAll(async () => {
  for (const c of clients) c.destroy();
  await redis?.stop();
});

async function connection(): Promise<RedisConnection> {
  const c = await connectRedis(redis.url, logger, 'test');
  clients.push(c);
  return c;
}

describe('board stream numbers in Redis', () => {
  it('numbers one stream per farm set across two processes, in one epoch', async () => {
    const [one, two] = [redisSequences(await connection(), logger), redisSequences(await connection(), logger)];
    const key = `9:${Date.now()}`;
    expect((await one.position(key)).seq).toBe(0);
    const a = await one.next([key, `${key}-other`]);
    const b = await two.next([key]);
    expect(a.seqs).toEqual([1, 1]);
    expect(b.seqs).toEqual([2]);
    expect(b.epoch).toBe(a.epoch);
    expect(await two.position(key)).toEqual({ epoch: a.epoch, seq: 2 });
    expect(one.epoch).toBe(a.epoch);
  });

  it('starts a new epoch when Redis has lost its keys (flushed or restarted)', async () => {
    const c = await connection();
    const seq = redisSequences(c, logger);
    const key = `10:${Date.now()}`;
    const before = await seq.next([key]);
    await c.flushAll();
    const after = await seq.next([key]);
    expect(after.epoch).not.toBe(before.epoch);
    expect(after.seqs).toEqual([1]);
  });

  it('gives a position of its own while Redis cannot be reached, refuses numbers, and starts a new epoch once it is back', async () => {
    const c = await connection();
    const other = redisSequences(await connection(), logger);
    const seq = redisSequences(c, logger);
    const key = `11:${Date.now()}`;
    const known = (await seq.next([key])).epoch;
    // This process's connection goes away (the others keep theirs).
    c.destroy();
    c.emit('error', new Error('gone'));
    const away = await seq.position(key);
    expect(away.epoch).not.toBe(known);
    expect(away.epoch).toMatch(/^away-/);
    expect(away.seq).toBe(0);
    await expect(seq.next([key])).rejects.toThrow();
    // Back: a new connection under the same numbering (the client object reconnects by itself in a server).
    await c.connect();
    const back = await seq.next([key]);
    expect(back.epoch).not.toBe(known);
    expect(back.epoch).not.toBe(away.epoch);
    // The other processes adopt the new epoch instead of starting yet another.
    expect((await other.next([key])).epoch).toBe(back.epoch);
    expect(await c.get(EPOCH_KEY)).toBe(back.epoch);
  });

  it('keeps numbering in memory as before without Redis', async () => {
    const seq = memorySequences();
    expect(await seq.position('1:1')).toEqual({ epoch: seq.epoch, seq: 0 });
    expect((await seq.next(['1:1', '1:2'])).seqs).toEqual([1, 1]);
    expect((await seq.next(['1:1'])).seqs).toEqual([2]);
    expect(memorySequences().epoch).not.toBe(seq.epoch);
  });
});

describe('the board builder lease in Redis', () => {
  const until = async (what: string, check: () => boolean, ms: number) => {
    const startedAt = Date.now();
    while (!check()) {
      if (Date.now() - startedAt > ms) throw new Error(`${what} not within ${ms} ms`);
      await new Promise((r) => setTimeout(r, 10));
    }
    return Date.now() - startedAt;
  };

  it('is held by one of two processes at a time, and passes to the other once given back', async () => {
    const name = `lease-${Date.now()}`;
    const gained: string[] = [];
    const one = redisLease(await connection(), name, logger, { holdMs: 600, tryMs: 100, onGained: () => gained.push('one') });
    await until('a first holder', () => one.held(), 1_000);
    const two = redisLease(await connection(), name, logger, { holdMs: 600, tryMs: 100, onGained: () => gained.push('two') });
    // Renewed while it lives: the other never holds it meanwhile.
    for (let i = 0; i < 10; i++) {
      expect([one.held(), two.held()]).toEqual([true, false]);
      await new Promise((r) => setTimeout(r, 100));
    }
    await one.close();
    expect(one.held()).toBe(false);
    // Given back: taken at the other's next try.
    expect(await until('the second holder', () => two.held(), 1_000)).toBeLessThan(400);
    expect(gained).toEqual(['one', 'two']);
    await two.close();
  });

  it('passes to another process once its holder stops renewing (died or lost Redis), not before its hold lapses', async () => {
    const name = `lapse-${Date.now()}`;
    const dying = await connection();
    const one = redisLease(dying, name, logger, { holdMs: 800, tryMs: 100 });
    await until('a first holder', () => one.held(), 1_000);
    const two = redisLease(await connection(), name, logger, { holdMs: 800, tryMs: 100 });
    // The holder's connection goes, as when its process is killed.
    dying.destroy();
    const lostAt = Date.now();
    // It stops counting itself the holder before the key can lapse for the other.
    await until('the old holder to let go', () => !one.held(), 1_000);
    const gainedAfter = await until('the second holder', () => two.held(), 2_000);
    expect(Date.now() - lostAt).toBeGreaterThanOrEqual(600);
    expect(gainedAfter).toBeLessThan(1_500);
    await Promise.all([one.close(), two.close()]);
  });
});

describe('sign-in limits while Redis is away', () => {
  const options = { windowMs: 60_000 } as Options;

  it('counts in the shared store while it answers, and in memory when it fails', async () => {
    const shared = new MemoryStore();
    let failing = false;
    const flaky = {
      init: (o: Options) => shared.init(o),
      increment: (key: string) => (failing ? Promise.reject(new Error('Redis away')) : shared.increment(key)),
      decrement: (key: string) => shared.decrement(key),
      resetKey: (key: string) => shared.resetKey(key),
      get: (key: string) => (failing ? Promise.reject(new Error('Redis away')) : shared.get(key)),
    };
    // Another process's failures, already in the shared store.
    flaky.init(options);
    await shared.increment('acct-ip:a');
    await shared.increment('acct-ip:a');
    const store = fallbackStore(flaky, logger);
    store.init!(options);
    expect((await store.increment('acct-ip:a')).totalHits).toBe(3);
    failing = true;
    // Counted here from this process's own failures: one before, one now.
    expect((await store.increment('acct-ip:a')).totalHits).toBe(2);
    expect((await store.increment('acct-ip:a')).totalHits).toBe(3);
    failing = false;
    expect((await store.increment('acct-ip:a')).totalHits).toBe(4);
    shared.shutdown();
    store.shutdown!();
  });
});
