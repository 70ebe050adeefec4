// Writing the server's answer to a round into the farm's draft: each entry's result, found by its idempotency
// key, and for a clash a new round time (a piece of src/stores/round.ts; pure).
import type { RoundEntryResult } from '@shared/schemas';
import { i18n } from '@/i18n';
import type { OutboxRound } from '@/offline/db';
import type { RoundDraft } from './round-entry';

/** Writes the results into the draft's entries; returns whether any entry changed. */
export function applyResults(draft: RoundDraft, results: RoundEntryResult[], nowIso = new Date().toISOString()): boolean {
  let changed = false;
  for (const result of results) {
    const entry = draft.entries[String(result.tankId)];
    if (!entry) continue;
    entry.result = { status: result.status, reason: result.reason, problem: result.problem, takenAt: result.reading?.takenAt, grossL: result.reading?.grossL, usableL: result.reading?.usableL };
    entry.outboxSeq = null;
    changed = true;
    // Another reading holds this moment: a new round time (every entry sent has its answer now)
    // and this entry's answer as its last change, so sending it again stores it at a new time.
    if (result.status === 'conflict') {
      draft.takenAt = null;
      entry.editedAt = nowIso;
    }
  }
  return changed;
}

/**
 * Writes an answered outbox round into its farm's draft: only entries still waiting in that round (or
 * queued a moment before they were marked) with the same key take it. A round refused as a whole marks
 * each of its entries refused with the server's reason, so they can be corrected and sent again.
 */
export function applyAnswered(draft: RoundDraft, round: OutboxRound): boolean {
  const ours = round.entries.filter((sent) => {
    const entry = draft.entries[String(sent.tankId)];
    if (!entry || entry.idempotencyKey !== sent.idempotencyKey) return false;
    return entry.outboxSeq === round.seq || ((entry.outboxSeq ?? null) === null && entry.result === null);
  });
  if (!ours.length) return false;
  const keys = new Set(ours.map((e) => e.tankId));
  const results: RoundEntryResult[] =
    round.status === 'sent'
      ? (round.results ?? []).filter((r) => keys.has(r.tankId))
      : ours.map((e) => ({ tankId: e.tankId, status: 'refused', reason: round.lastError ?? i18n.global.t('round.problems.serverRefusedRound') }));
  applyResults(draft, results);
  for (const e of ours) draft.entries[String(e.tankId)].outboxSeq = null;
  return true;
}
