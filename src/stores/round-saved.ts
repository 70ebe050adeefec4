// The rounds kept on the device (per user) in IndexedDB: typed drafts, the last farm, and each farm's tank copy
// for use without signal (a piece of src/stores/round.ts). Rounds kept in localStorage before move over once.
import type { Tank, TankTile } from '@shared/schemas';
import { deviceDb, type SavedRounds } from '@/offline/db';
import type { RoundDraft } from './round-entry';

export type { SavedRounds, TanksCopy } from '@/offline/db';

/** Where rounds were kept before IndexedDB (read once, then removed). */
export const LEGACY_STORAGE_PREFIX = 'brimstock.round.v1.user-';

export function emptySaved(userId: number): SavedRounds {
  return { userId, lastFarmId: null, drafts: {}, copies: {} };
}

/** The localStorage copy of an earlier version, or null (and removes it: IndexedDB holds it from now on). */
function takeLegacy(userId: number): Omit<SavedRounds, 'userId'> | null {
  try {
    const key = `${LEGACY_STORAGE_PREFIX}${userId}`;
    const raw = localStorage.getItem(key);
    if (!raw) return null;
    localStorage.removeItem(key);
    const parsed = JSON.parse(raw) as { v?: number; lastFarmId?: number | null; drafts?: Record<string, RoundDraft>; copies?: SavedRounds['copies'] };
    if (parsed.v !== 1) return null;
    return { lastFarmId: parsed.lastFarmId ?? null, drafts: parsed.drafts ?? {}, copies: parsed.copies ?? {} };
  } catch {
    return null;
  }
}

/** A person's kept rounds; what an earlier version left in localStorage is merged in and stored once. */
export async function readSaved(userId: number): Promise<SavedRounds> {
  const stored = (await deviceDb().rounds.get(userId)) ?? emptySaved(userId);
  const legacy = takeLegacy(userId);
  if (!legacy) return stored;
  // Drafts on the device from before win over nothing; a farm already drafted here keeps this version's draft.
  const merged: SavedRounds = {
    userId,
    lastFarmId: stored.lastFarmId ?? legacy.lastFarmId,
    drafts: { ...legacy.drafts, ...stored.drafts },
    copies: { ...legacy.copies, ...stored.copies },
  };
  await deviceDb().rounds.put(merged);
  return merged;
}

/** Stores a person's rounds as they stand (a plain JSON copy: reactive drafts cannot be cloned into IndexedDB). */
export async function writeSaved(saved: SavedRounds): Promise<void> {
  await deviceDb().rounds.put(JSON.parse(JSON.stringify(saved)) as SavedRounds);
}

/** Keeps each farm's tanks (and their last readings, when the board answered) as the device's copy, in `saved`. */
export function keepCopies(
  saved: SavedRounds,
  live: Tank[],
  boardTiles: Map<number, TankTile[]> | null,
  farmIds: number[],
  farms: { id: number; name: string; coldCultureC?: number }[],
): void {
  const savedAt = new Date().toISOString();
  for (const fid of new Set([...farmIds, ...live.map((t) => t.farmId)])) {
    const key = String(fid);
    const farm = farms.find((f) => f.id === fid);
    const before = saved.copies[key];
    saved.copies[key] = {
      savedAt,
      farmName: farm?.name ?? before?.farmName ?? '',
      coldCultureC: farm?.coldCultureC ?? before?.coldCultureC,
      tanks: live.filter((t) => t.farmId === fid),
      tiles: boardTiles ? (boardTiles.get(fid) ?? []) : before?.tiles,
    };
  }
}
