// Farm-local days in an IANA time zone. Offsets come from @date-fns/tz, which reads the runtime's copy
// of the IANA time zone database, so every day has the offset in force on that day (daylight saving
// included), never the offset of today applied to other days.
import { tzOffset } from '@date-fns/tz';
import { dateOfDayNumber, dayNumberOf } from './dates';

const MS_PER_MINUTE = 60_000;
const MS_PER_HOUR = 3_600_000;
const MS_PER_DAY = 86_400_000;

/** The offset straight from the zone database; throws RangeError for an unknown zone. */
function offsetFromDatabase(timeZone: string, at: number): number {
  const minutes = tzOffset(timeZone, new Date(at));
  if (Number.isNaN(minutes)) throw new RangeError(`Unknown time zone "${timeZone}"`);
  return minutes;
}

/**
 * Per zone, per UTC day (day number): the offset of the whole day when it is the same at the day's
 * first and last millisecond, else null (a change that day: asked of the database each time). A zone
 * changes its offset at most once in ~28 h, so equal ends mean no change in between. Reading a series
 * asks for the offset of every reading: most of them are answered here.
 */
const dayOffsets = new Map<string, Map<number, number | null>>();
const DAYS_KEPT_PER_ZONE = 20_000;

/** The UTC offset of `timeZone` at instant `at` (minutes, east positive); throws RangeError for an unknown zone. */
export function utcOffsetMinutes(timeZone: string, at: number | Date): number {
  const ms = typeof at === 'number' ? at : at.getTime();
  const day = Math.floor(ms / MS_PER_DAY);
  let days = dayOffsets.get(timeZone);
  const kept = days?.get(day);
  if (kept !== undefined) return kept ?? offsetFromDatabase(timeZone, ms);
  const first = offsetFromDatabase(timeZone, day * MS_PER_DAY);
  const whole = first === offsetFromDatabase(timeZone, (day + 1) * MS_PER_DAY - 1) ? first : null;
  if (!days) dayOffsets.set(timeZone, (days = new Map()));
  if (days.size >= DAYS_KEPT_PER_ZONE) days.clear();
  days.set(day, whole);
  return whole ?? offsetFromDatabase(timeZone, ms);
}

const offsetMsAt = (timeZone: string, at: number) => Math.round(utcOffsetMinutes(timeZone, at) * MS_PER_MINUTE);

/** The wall-clock time of instant `at` in `timeZone`, as if that local time were UTC (epoch ms). */
export function wallClockOf(at: number, timeZone: string): number {
  return at + offsetMsAt(timeZone, at);
}

/**
 * The first instant (epoch ms) at which the clocks of `timeZone` show `wallClockMs` (a local time read
 * as if it were UTC). In a repeated hour that is its first pass; a time the clocks skipped (spring
 * forward) gives the moment they jumped past it. Zones change offset at most once in ~28 h, so the
 * offsets 18 h either side and at the time itself are all the candidates.
 */
export function instantOfWallClock(wallClockMs: number, timeZone: string): number {
  const offsets = new Set([-18 * MS_PER_HOUR, 0, 18 * MS_PER_HOUR].map((d) => offsetMsAt(timeZone, wallClockMs + d)));
  const fits = [...offsets].map((o) => wallClockMs - o).filter((t) => wallClockOf(t, timeZone) === wallClockMs);
  if (fits.length) return Math.min(...fits);
  // Skipped: the clocks read before it at `lo` and past it at `hi`; find the jump to the millisecond.
  let lo = wallClockMs - Math.max(...offsets);
  let hi = wallClockMs - Math.min(...offsets);
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (wallClockOf(mid, timeZone) < wallClockMs) lo = mid;
    else hi = mid;
  }
  return hi;
}

/** The farm-local calendar date 'YYYY-MM-DD' holding instant `at` in `timeZone`. */
export function farmDayOf(at: number | Date, timeZone: string): string {
  return dateOfDayNumber(farmDayNumberOf(typeof at === 'number' ? at : at.getTime(), timeZone));
}

/** The day number (days since 1970-01-01) of the farm-local date holding instant `at` in `timeZone`. */
export function farmDayNumberOf(at: number, timeZone: string): number {
  return Math.floor(wallClockOf(at, timeZone) / MS_PER_DAY);
}

/** The instant (epoch ms) the farm-local day `date` ('YYYY-MM-DD' or a day number) begins in `timeZone`. */
export function farmDayStart(date: string | number, timeZone: string): number {
  return instantOfWallClock((typeof date === 'number' ? date : dayNumberOf(date)) * MS_PER_DAY, timeZone);
}

/** The instant (epoch ms) the farm-local day `date` ends in `timeZone`: the start of the next day. */
export function farmDayEnd(date: string | number, timeZone: string): number {
  return farmDayStart((typeof date === 'number' ? date : dayNumberOf(date)) + 1, timeZone);
}

/** One farm-local day: its date, the instants it begins and ends (epoch ms), its length (h) and its UTC offset at the start (min). */
export interface FarmDay {
  date: string;
  startMs: number;
  endMs: number;
  hours: number;
  utcOffsetMinutes: number;
}

/** The farm-local day `date` ('YYYY-MM-DD') in `timeZone`, with its own start, end and offset. */
export function farmDay(date: string, timeZone: string): FarmDay {
  const startMs = farmDayStart(date, timeZone);
  const endMs = farmDayEnd(date, timeZone);
  return { date, startMs, endMs, hours: (endMs - startMs) / MS_PER_HOUR, utcOffsetMinutes: utcOffsetMinutes(timeZone, startMs) };
}

/** The `count` whole farm-local days before the day holding instant `now`, oldest first, each with its own offset. */
export function farmDaysBefore(now: number, timeZone: string, count: number): FarmDay[] {
  const today = farmDayNumberOf(now, timeZone);
  return Array.from({ length: count }, (_, i) => farmDay(dateOfDayNumber(today - count + i), timeZone));
}

/**
 * A reader of farm-local dates for many instants in one zone, remembered per clock hour: an hour
 * whose first and last millisecond fall on the same local date lies wholly in it (an offset changes
 * at most once in an hour); other hours are worked out per instant. Same answers as farmDayOf.
 */
export function farmDayReader(timeZone: string): (at: number) => string {
  utcOffsetMinutes(timeZone, 0);
  const byHour = new Map<number, string>();
  return (at) => {
    const hour = Math.floor(at / MS_PER_HOUR);
    let date = byHour.get(hour);
    if (date === undefined) {
      const first = farmDayOf(hour * MS_PER_HOUR, timeZone);
      date = first === farmDayOf(hour * MS_PER_HOUR + MS_PER_HOUR - 1, timeZone) ? first : '';
      if (byHour.size >= 200_000) byHour.clear();
      byHour.set(hour, date);
    }
    return date || farmDayOf(at, timeZone);
  };
}
