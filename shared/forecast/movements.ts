import { nonNegative } from '../checks';
import { deadBandMovements, prepareSeries, type LevelMovement, type LevelReading } from './series';

/** Options of splitMovements. */
export interface SplitOptions {
  /** Half-width of the noise band (L): level changes of at most this much count as no change. */
  noiseL: number;
}

/**
 * The series (readings in any order) as consecutive refill, use and steady stretches (ms, L), using a
 * dead band of ±noiseL around a held reference level so that reading jitter never adds up to false use.
 * Back-to-back stretches of one kind are merged. Fewer than two distinct instants give [].
 */
export function splitMovements(series: readonly LevelReading[], options: SplitOptions): LevelMovement[] {
  const noiseL = nonNegative('noiseL', options?.noiseL);
  const merged: LevelMovement[] = [];
  for (const m of deadBandMovements(prepareSeries(series), noiseL)) {
    const last = merged[merged.length - 1];
    if (last && last.kind === m.kind) {
      merged[merged.length - 1] = { ...last, to: m.to, toL: m.toL, changeL: m.toL - last.fromL };
    } else {
      merged.push({ ...m });
    }
  }
  return merged;
}
