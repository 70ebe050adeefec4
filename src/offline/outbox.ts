// The outbox of rounds in IndexedDB: rounds wait here until the server answers, and are sent oldest first
// with their own idempotency keys and time, so a resend never stores a reading twice.
import type { RoundSubmitAnswer } from '@shared/schemas';
import { ApiError, errorMessage, isApiError } from '@/api/http';
import { deviceDb, type OutboxRound } from './db';

/** The first wait after a failed try (ms); it doubles with each try up to OUTBOX_MAX_WAIT_MS. */
export const OUTBOX_FIRST_WAIT_MS = 5_000;
export const OUTBOX_MAX_WAIT_MS = 5 * 60_000;
/** Sent rounds kept per person to show what went out. */
export const OUTBOX_SENT_KEPT = 10;

/** How long to wait after the given number of failed tries (ms): 5 s, 10 s, 20 s … at most 5 min. */
export function outboxWaitMs(attempts: number): number {
  return Math.min(OUTBOX_MAX_WAIT_MS, OUTBOX_FIRST_WAIT_MS * 2 ** Math.max(0, attempts - 1));
}

export type NewOutboxRound = Pick<OutboxRound, 'userId' | 'farmId' | 'farmName' | 'takenAt' | 'entries'>;

/** Puts a round in the outbox; returns its place in the queue. */
export async function enqueueRound(round: NewOutboxRound): Promise<number> {
  const item: OutboxRound = { ...round, queuedAt: new Date().toISOString(), status: 'waiting', attempts: 0, nextTryAt: null, lastError: null, lastErrorStatus: null, sentAt: null, results: null, applied: false };
  return (await deviceDb().outbox.add(item)) as number;
}

/** A person's rounds in the outbox, oldest first. */
export async function listOutbox(userId: number): Promise<OutboxRound[]> {
  return (await deviceDb().outbox.where('userId').equals(userId).toArray()).sort((a, b) => a.seq! - b.seq!);
}

/** Marks an answered round as written into its draft. */
export async function markApplied(seq: number): Promise<void> {
  await deviceDb().outbox.update(seq, { applied: true });
}

/** Keeps the newest OUTBOX_SENT_KEPT answered rounds whose answers are in their drafts; older ones go. */
export async function pruneAnswered(userId: number): Promise<void> {
  const done = (await listOutbox(userId)).filter((r) => r.status !== 'waiting' && r.applied);
  const old = done.slice(0, Math.max(0, done.length - OUTBOX_SENT_KEPT)).map((r) => r.seq!);
  if (old.length) await deviceDb().outbox.bulkDelete(old);
}

/** Whether a failed send is worth trying again later (no connection, the server away or busy, signed out). */
export function isPassing(error: unknown): boolean {
  if (!(error instanceof ApiError)) return true;
  if (error.status === 0 || error.status >= 500 || error.status === 408 || error.status === 429) return true;
  // Signed out (session expired) or the form token stale: the round waits until the person signs in again.
  return error.status === 401 || isApiError(error, { code: 'csrf_invalid' });
}

const statusOf = (error: unknown): number | null => (error instanceof ApiError ? error.status : null);

export interface OutboxRun {
  /** Rounds the server answered in this run (their entries may still be refused one by one). */
  answered: OutboxRound[];
  /** The next try after a failure (ms from now), or null when nothing is left waiting. */
  retryInMs: number | null;
}

type Send = (round: OutboxRound) => Promise<RoundSubmitAnswer>;

/**
 * Sends a person's waiting rounds, oldest first, stopping at the first that does not get through (the
 * later ones would meet the same). `force` ignores the back-off (the network just came back).
 * Tabs of the same browser take turns through a Web Lock, so two never send one round at once.
 */
export async function sendOutbox(userId: number, send: Send, options: { force?: boolean; now?: () => number } = {}): Promise<OutboxRun> {
  const run = () => sendWaiting(userId, send, options);
  const locks = typeof navigator === 'undefined' ? undefined : navigator.locks;
  return locks ? locks.request(`brimstock-outbox-${userId}`, run) : run();
}

async function sendWaiting(userId: number, send: Send, { force = false, now = Date.now }: { force?: boolean; now?: () => number }): Promise<OutboxRun> {
  const answered: OutboxRound[] = [];
  const table = deviceDb().outbox;
  for (const listed of await listOutbox(userId)) {
    // Read again inside the lock: another tab may have sent it a moment ago.
    const round = await table.get(listed.seq!);
    if (!round || round.status !== 'waiting') continue;
    if (!force && round.nextTryAt && Date.parse(round.nextTryAt) > now()) return { answered, retryInMs: Date.parse(round.nextTryAt) - now() };
    try {
      const { results } = await send(round);
      const done: Partial<OutboxRound> = { status: 'sent', results, sentAt: new Date(now()).toISOString(), lastError: null, lastErrorStatus: null, nextTryAt: null, attempts: round.attempts + 1 };
      await table.update(round.seq!, done);
      answered.push({ ...round, ...done });
    } catch (error) {
      if (isPassing(error)) {
        const attempts = round.attempts + 1;
        const waitMs = outboxWaitMs(attempts);
        await table.update(round.seq!, { attempts, lastError: errorMessage(error), lastErrorStatus: statusOf(error), nextTryAt: new Date(now() + waitMs).toISOString() });
        return { answered, retryInMs: waitMs };
      }
      // Refused as a whole (farm archived, access gone, invalid): sending again would not help; the person is told.
      const refused: Partial<OutboxRound> = { status: 'refused', lastError: errorMessage(error), lastErrorStatus: statusOf(error), attempts: round.attempts + 1, sentAt: new Date(now()).toISOString() };
      await table.update(round.seq!, refused);
      answered.push({ ...round, ...refused });
    }
  }
  return { answered, retryInMs: null };
}
