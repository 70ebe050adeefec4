// Numbering of the live board's delta streams: each farm set (the farms one person may see) has
// its own stream, and GET /api/board says up to which number it includes.
import { randomBytes } from 'node:crypto';
import { BOARD_DELTA_VERSION, type BoardStreamPosition } from '@shared/schemas';
import type { AppContext } from '../context';

/**
 * The sequence numbers of the farm sets' streams. Kept in this process for now (a restart starts a
 * new epoch, which clients take as a version change); issue #11 item 2 moves them to Redis (INCR on
 * one key per farm set, the epoch in another) so that several server processes number one stream.
 */
export interface BoardSequences {
  /** Names this run of the numbering: a client that sees another epoch fetches the board. */
  readonly epoch: string;
  /** The number of the last delta given out for the farm set (0 before the first). */
  current(setKey: string): number;
  /** Gives out the farm set's next number. */
  next(setKey: string): number;
}

/** Sequence numbers in this process's memory. */
export function memorySequences(): BoardSequences {
  const last = new Map<string, number>();
  return {
    epoch: randomBytes(6).toString('base64url'),
    current: (key) => last.get(key) ?? 0,
    next: (key) => {
      const n = (last.get(key) ?? 0) + 1;
      last.set(key, n);
      return n;
    },
  };
}

const sequencesOf = new WeakMap<AppContext, BoardSequences>();

/** The server's stream numbering (one per context). */
export function boardSequences(ctx: AppContext): BoardSequences {
  let kept = sequencesOf.get(ctx);
  if (!kept) sequencesOf.set(ctx, (kept = memorySequences()));
  return kept;
}

/** The key of a farm set: the organisation and its sorted farm ids (the board keep and the socket room use the same). */
export function farmSetKey(organisationId: number, farmIds: readonly number[]): string {
  return `${organisationId}:${[...farmIds].sort((a, b) => a - b).join(',')}`;
}

/** Where the farm set's stream stands now. */
export function streamPosition(ctx: AppContext, setKey: string): BoardStreamPosition {
  const sequences = boardSequences(ctx);
  return { version: BOARD_DELTA_VERSION, epoch: sequences.epoch, seq: sequences.current(setKey) };
}
