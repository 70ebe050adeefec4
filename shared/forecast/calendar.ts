import { finiteNumber } from './checks';
import { MS_PER_DAY } from './series';

/** Checks a UTC offset in minutes (strictly within ±24 h) and returns it in ms. */
export function offsetMs(utcOffsetMinutes: number | undefined): number {
  const minutes = finiteNumber('utcOffsetMinutes', utcOffsetMinutes ?? 0);
  if (Math.abs(minutes) >= 1440) throw new RangeError(`utcOffsetMinutes must be within ±1439 (got ${minutes})`);
  return minutes * 60_000;
}

/** Index of the local calendar day holding instant `at` (days since 1970-01-01 local). */
export function localDayIndex(at: number, offset: number): number {
  return Math.floor((at + offset) / MS_PER_DAY);
}

/** Instant at which local day `dayIndex` begins (epoch ms). */
export function localDayStart(dayIndex: number, offset: number): number {
  return dayIndex * MS_PER_DAY - offset;
}
