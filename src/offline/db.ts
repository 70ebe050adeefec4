// The device's own database (IndexedDB through Dexie): rounds in progress with each farm's tank copy, the
// outbox of rounds waiting for the network, and the last session answer, so the round works without signal.
import Dexie, { type EntityTable } from 'dexie';
import type { RoundEntry, RoundEntryResult, SessionUser, Tank, TankTile } from '@shared/schemas';
import type { RoundDraft } from '@/stores/round-entry';

/** A farm's tanks as this device last loaded them, with their last readings from the board. */
export interface TanksCopy {
  savedAt: string;
  farmName: string;
  /** The farm's cold-culture limit (°C) when the copy was saved (absent in copies saved before). */
  coldCultureC?: number;
  tanks: Tank[];
  /** The board's tiles of those tanks (last readings) when the copy was saved (absent in older copies). */
  tiles?: TankTile[];
}

/** One person's rounds on this device: typed drafts per farm, the last farm walked, and each farm's tank copy. */
export interface SavedRounds {
  userId: number;
  lastFarmId: number | null;
  drafts: Record<string, RoundDraft>;
  copies: Record<string, TanksCopy>;
}

export type OutboxStatus = 'waiting' | 'sent' | 'refused';

/** A round waiting for the network (or sent): what goes to POST /api/rounds, with its keys fixed. */
export interface OutboxRound {
  seq?: number;
  userId: number;
  farmId: number;
  farmName: string;
  /** When the round was walked; every resend uses it, so a reading is the same reading. */
  takenAt: string;
  entries: RoundEntry[];
  queuedAt: string;
  status: OutboxStatus;
  attempts: number;
  /** Not before this instant (the back-off after a failed try), or null to send at once. */
  nextTryAt: string | null;
  /** Why the last try did not get through, or why the server refused the round as a whole. */
  lastError: string | null;
  /** The HTTP status of the last failed try (0: no connection), or null. */
  lastErrorStatus: number | null;
  sentAt: string | null;
  /** The server's answer per entry once sent. */
  results: RoundEntryResult[] | null;
  /** The answer has been written into the farm's draft on this device (the cards show it). */
  applied: boolean;
}

/** The last session answer while signed in, so the app opens without signal (removed at sign-out). */
export interface SessionCopy {
  key: 'last';
  user: SessionUser;
  savedAt: string;
}

export type BrimstockDb = Dexie & {
  rounds: EntityTable<SavedRounds, 'userId'>;
  outbox: EntityTable<OutboxRound, 'seq'>;
  session: EntityTable<SessionCopy, 'key'>;
};

let instance: BrimstockDb | null = null;

/** The device database, opened on first use. */
export function deviceDb(): BrimstockDb {
  if (instance) return instance;
  const db = new Dexie('brimstock') as BrimstockDb;
  db.version(1).stores({ rounds: 'userId', outbox: '++seq, userId', session: 'key' });
  instance = db;
  return db;
}

/** Closes and forgets the database (tests start each case with a fresh one). */
export function closeDeviceDb(): void {
  instance?.close();
  instance = null;
}
