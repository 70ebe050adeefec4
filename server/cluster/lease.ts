// A lease: one process of several holds a Redis key for a short while and renews it while it lives,
// so that one piece of continuous work (building the board deltas) has one owner at a time. A
// process that dies, hangs or loses Redis stops renewing; the key lapses after HOLD_MS and the next
// process to try takes it. The holder counts the lease as lost a little before the key could lapse,
// so two processes do not both count themselves holders for longer than a round trip to Redis.
import { randomBytes } from 'node:crypto';
import type { Logger } from 'pino';
import { withinMs, type RedisConnection } from './redis';

export interface Lease {
  /** True while this process holds the lease. */
  held(): boolean;
  /** Stops renewing and gives the lease back (when held). */
  close(): Promise<void>;
}

export interface LeaseOptions {
  /** How long the key lives without a renewal. */
  holdMs?: number;
  /** How often the holder renews and the others try to take it. */
  tryMs?: number;
  /** Called when this process starts holding the lease (again). */
  onGained?: () => void;
}

const RENEW = `if redis.call('GET', KEYS[1]) == ARGV[1] then return redis.call('PEXPIRE', KEYS[1], ARGV[2]) else return 0 end`;
const GIVE_BACK = `if redis.call('GET', KEYS[1]) == ARGV[1] then return redis.call('DEL', KEYS[1]) else return 0 end`;

/** The lease `name` among the processes on `client`'s Redis; the first try is made at once. */
export function redisLease(client: RedisConnection, name: string, logger: Logger, options: LeaseOptions = {}): Lease {
  const holdMs = options.holdMs ?? 3_000;
  const tryMs = options.tryMs ?? 1_000;
  const key = `brimstock:lease:${name}`;
  // The holder's process id first, so `redis-cli GET brimstock:lease:<name>` tells which process it is.
  const token = `${process.pid}:${randomBytes(9).toString('base64url')}`;
  /** Until when this process counts itself the holder (0: not). */
  let validUntil = 0;
  let closed = false;
  let trying = false;

  const attempt = async () => {
    if (trying || closed) return;
    trying = true;
    const askedAt = Date.now();
    const wasHeld = validUntil > askedAt;
    try {
      const ok = wasHeld
        ? Number(await withinMs(client.sendCommand(['EVAL', RENEW, '1', key, token, String(holdMs)]), tryMs, `the ${name} lease renewal`)) === 1
        : (await withinMs(client.set(key, token, { condition: 'NX', expiration: { type: 'PX', value: holdMs } }), tryMs, `the ${name} lease`)) === 'OK';
      // Counted from when it was asked, less a margin for clocks and the answer's way back.
      validUntil = ok ? askedAt + holdMs - tryMs : 0;
      if (ok && !wasHeld) {
        logger.info({ lease: name, pid: process.pid }, `this process now holds the ${name} lease`);
        options.onGained?.();
      } else if (!ok && wasHeld) logger.warn({ lease: name, pid: process.pid }, `this process lost the ${name} lease`);
    } catch (err) {
      // Redis away: the lease ends on its own clock; the next try after Redis returns takes it again.
      if (validUntil && Date.now() >= validUntil) validUntil = 0;
      logger.debug({ err, lease: name }, 'lease not renewed');
    } finally {
      trying = false;
    }
  };
  const timer = setInterval(() => void attempt(), tryMs);
  timer.unref();
  void attempt();

  return {
    held: () => validUntil > Date.now(),
    async close() {
      closed = true;
      clearInterval(timer);
      if (validUntil <= Date.now()) return;
      validUntil = 0;
      await withinMs(client.sendCommand(['EVAL', GIVE_BACK, '1', key, token]), 1_000, `the ${name} lease given back`).catch(() => undefined);
    },
  };
}
