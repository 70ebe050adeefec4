// The round's result summary: how many entries were stored, already stored, refused or clashed, and what is still waiting (a piece of src/stores/round.ts).
import { i18n } from '@/i18n';
import type { RoundRow } from './round-entry';

export interface RoundSummary {
  stored: number;
  duplicate: number;
  refused: number;
  /** Not stored: another reading of the tank holds the same moment (sent again, it is stored at a new time). */
  conflict: number;
  /** The names of those tanks. */
  conflictNames: string[];
  /** Typed entries not yet stored (to send, or to fix). */
  waiting: number;
  /** Some entries were sent and every typed entry is now stored. */
  complete: boolean;
  /** "7 stored, 1 refused", in the screens' language. */
  text: string;
}

/** Counts the rows' answers from the server into the summary line. */
export function summarizeRound(rows: RoundRow[]): RoundSummary {
  let stored = 0;
  let duplicate = 0;
  let refused = 0;
  const conflictNames: string[] = [];
  let waiting = 0;
  for (const row of rows) {
    const outcome = row.entry.result?.status;
    if (outcome === 'stored') stored++;
    else if (outcome === 'duplicate') duplicate++;
    else if (outcome === 'refused') refused++;
    else if (outcome === 'conflict') conflictNames.push(row.tank.name);
    if (!row.locked && row.reading.state !== 'empty') waiting++;
  }
  const { t } = i18n.global;
  const parts: string[] = [];
  const conflict = conflictNames.length;
  if (stored || (!duplicate && !refused && !conflict)) parts.push(t('round.summary.stored', stored));
  if (duplicate) parts.push(t('round.summary.duplicate', duplicate));
  if (refused) parts.push(t('round.summary.refused', refused));
  if (conflict) parts.push(t('round.summary.conflict', conflict));
  return { stored, duplicate, refused, conflict, conflictNames, waiting, complete: stored + duplicate > 0 && waiting === 0, text: parts.join(', ') };
}

/** Where the round stands before it is sent: tanks ready (stored, or typed and valid with every question answered), and those still to fix or answer. */
export interface RoundProgress {
  total: number;
  /** Stored, or typed with nothing refused and nothing left to answer. */
  ready: number;
  /** Codes of the tanks whose entry is refused here or by the server. */
  toFix: string[];
  /** Codes of the tanks whose entry waits on "Yes, this is right". */
  toAnswer: string[];
}

/** Counts only valid entries as ready and names the tanks still to fix or to answer. */
export function roundProgress(rows: RoundRow[]): RoundProgress {
  let ready = 0;
  const toFix: string[] = [];
  const toAnswer: string[] = [];
  for (const row of rows) {
    if (row.locked) ready++;
    else if (row.problem !== null || row.entry.result?.status === 'refused') toFix.push(row.tank.code);
    else if (row.awaitingAnswer) toAnswer.push(row.tank.code);
    else if (row.reading.state === 'ok') ready++;
  }
  return { total: rows.length, ready, toFix, toAnswer };
}

/** Why a round could not be sent: no network, a server refusal, or entries still to fix. */
export interface SubmitProblem {
  kind: 'network' | 'server' | 'invalid';
  message: string;
}

/** What the round says while a sent round waits in the outbox for the network, in the screens' language. */
export function waitingMessage(): string {
  return i18n.global.t('round.problems.waiting');
}
