// The rounds kept on the device (per user): typed drafts, the last farm, and each farm's tank-list copy for use without signal (a piece of src/stores/round.ts).
import type { Tank } from '@shared/schemas';
import type { RoundDraft } from './round-entry';

/** The tank-list copy kept on the device so a round can go on without signal. */
export interface TanksCopy {
  savedAt: string;
  farmName: string;
  /** The farm's cold-culture limit (°C) when the copy was saved (absent in copies saved before). */
  coldCultureC?: number;
  tanks: Tank[];
}

export interface Saved {
  v: 1;
  lastFarmId: number | null;
  drafts: Record<string, RoundDraft>;
  copies: Record<string, TanksCopy>;
}

export const STORAGE_PREFIX = 'brimstock.round.v1.user-';

export function emptySaved(): Saved {
  return { v: 1, lastFarmId: null, drafts: {}, copies: {} };
}

export function readSaved(key: string): Saved {
  try {
    const raw = localStorage.getItem(key);
    if (!raw) return emptySaved();
    const parsed = JSON.parse(raw) as Partial<Saved>;
    if (parsed.v !== 1) return emptySaved();
    return { v: 1, lastFarmId: parsed.lastFarmId ?? null, drafts: parsed.drafts ?? {}, copies: parsed.copies ?? {} };
  } catch {
    return emptySaved();
  }
}
