// Numbering of the live board's delta streams: each farm set (the farms one person may see) has
// its own stream, and GET /api/board says up to which number it includes. One process numbers in
// its memory (a restart starts a new epoch, which clients take as another stream). Several
// processes on one Redis number together: INCR on one key per farm set and the epoch in another,
// so a client that changes process through the balancer sees one stream without false gaps.
import { randomBytes } from 'node:crypto';
import type { Logger } from 'pino';
import { BOARD_DELTA_VERSION, type BoardStreamPosition } from '@shared/schemas';
import { clusterOf } from '../cluster';
import { withinMs, type RedisConnection } from '../cluster/redis';
import type { AppContext } from '../context';

export interface BoardSequences {
  /** The epoch last given out (for entity tags): a client that sees another epoch fetches the board. */
  readonly epoch: string;
  /** Where the farm set's stream stands: its epoch and the number of the last delta given out (0 before the first). */
  position(setKey: string): Promise<{ epoch: string; seq: number }>;
  /** Gives out the next number of each farm set, all in one epoch; rejects when they cannot be given out. */
  next(setKeys: readonly string[]): Promise<{ epoch: string; seqs: number[] }>;
}

const newEpoch = () => randomBytes(6).toString('base64url');

/** Sequence numbers in this process's memory. */
export function memorySequences(): BoardSequences {
  const last = new Map<string, number>();
  const epoch = newEpoch();
  return {
    epoch,
    position: async (key) => ({ epoch, seq: last.get(key) ?? 0 }),
    next: async (keys) => ({
      epoch,
      seqs: keys.map((key) => {
        const n = (last.get(key) ?? 0) + 1;
        last.set(key, n);
        return n;
      }),
    }),
  };
}

export const EPOCH_KEY = 'brimstock:board:epoch';
const seqKey = (setKey: string) => `brimstock:board:seq:${setKey}`;
/** How long a numbering may wait for Redis before the board answers without it. */
const REDIS_WAIT_MS = 1_000;

// KEYS[1] the epoch, KEYS[2..] the sets' counters; ARGV[1] an epoch to start if none (Redis new or
// flushed), ARGV[2] an epoch to replace ('' for none: the one a process knew before Redis went away
// from it, so the first process back starts a new stream and the others adopt it), ARGV[3] 'next' or 'get'.
const SCRIPT = `
local e = redis.call('GET', KEYS[1])
if (not e) or (ARGV[2] ~= '' and e == ARGV[2]) then
  e = ARGV[1]
  redis.call('SET', KEYS[1], e)
end
local out = { e }
for i = 2, #KEYS do
  if ARGV[3] == 'next' then out[i] = redis.call('INCR', KEYS[i]) else out[i] = tonumber(redis.call('GET', KEYS[i]) or '0') end
end
return out`;

/**
 * Sequence numbers in Redis, shared by the processes. While Redis is away a position names an
 * epoch of this process's own (so the client fetches the board again once deltas flow), numbers
 * are refused (no delta goes out), and the first numbering after it returns starts a new epoch:
 * every client then fetches the board once, whatever it missed meanwhile.
 */
export function redisSequences(client: RedisConnection, logger: Logger): BoardSequences {
  let known = '';
  let replace = '';
  let away: string | null = null;
  const lost = () => {
    if (known) replace = known;
    away ??= `away-${newEpoch()}`;
  };
  client.on('error', lost);
  const run = async (keys: readonly string[], mode: 'next' | 'get'): Promise<[string, ...number[]]> => {
    const args = ['EVAL', SCRIPT, String(keys.length + 1), EPOCH_KEY, ...keys.map(seqKey), newEpoch(), replace, mode];
    let reply: unknown[];
    try {
      reply = (await withinMs(client.sendCommand(args), REDIS_WAIT_MS, 'the board stream numbers')) as unknown[];
    } catch (err) {
      lost();
      throw err;
    }
    const [epoch, ...seqs] = reply;
    known = String(epoch);
    replace = '';
    away = null;
    return [known, ...seqs.map(Number)];
  };
  return {
    get epoch() {
      return away ?? known;
    },
    async position(key) {
      try {
        const [epoch, seq] = await run([key], 'get');
        return { epoch, seq };
      } catch (err) {
        logger.debug({ err }, 'board stream position without Redis');
        return { epoch: away!, seq: 0 };
      }
    },
    async next(keys) {
      const [epoch, ...seqs] = await run(keys, 'next');
      return { epoch, seqs };
    },
  };
}

const sequencesOf = new WeakMap<AppContext, BoardSequences>();

/** The server's stream numbering (one per context): in Redis when the processes share one, else in memory. */
export function boardSequences(ctx: AppContext): BoardSequences {
  let kept = sequencesOf.get(ctx);
  if (!kept) {
    const { redis } = clusterOf(ctx);
    sequencesOf.set(ctx, (kept = redis ? redisSequences(redis, ctx.logger) : memorySequences()));
  }
  return kept;
}

/** The key of a farm set: the organisation and its sorted farm ids (the board keep and the socket room use the same). */
export function farmSetKey(organisationId: number, farmIds: readonly number[]): string {
  return `${organisationId}:${[...farmIds].sort((a, b) => a - b).join(',')}`;
}

/** Where the farm set's stream stands now. */
export async function streamPosition(ctx: AppContext, setKey: string): Promise<BoardStreamPosition> {
  const { epoch, seq } = await boardSequences(ctx).position(setKey);
  return { version: BOARD_DELTA_VERSION, epoch, seq };
}
