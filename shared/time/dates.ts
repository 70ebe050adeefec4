// Calendar dates ('YYYY-MM-DD') as plain day numbers: no instant, no time zone.
const MS_PER_DAY = 86_400_000;
const DATE_PATTERN = /^(\d{4})-(\d{2})-(\d{2})$/;

/** The day number of a calendar date 'YYYY-MM-DD' (days since 1970-01-01); throws RangeError on anything else. */
export function dayNumberOf(date: string): number {
  const m = DATE_PATTERN.exec(date);
  const ms = m ? Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])) : NaN;
  if (!m || Number.isNaN(ms) || new Date(ms).toISOString().slice(0, 10) !== date) throw new RangeError(`"${date}" is not a calendar date (YYYY-MM-DD)`);
  return ms / MS_PER_DAY;
}

/** The calendar date 'YYYY-MM-DD' of a day number (days since 1970-01-01). */
export function dateOfDayNumber(dayNumber: number): string {
  return new Date(dayNumber * MS_PER_DAY).toISOString().slice(0, 10);
}

/** The calendar date `days` days after `date` (before it when negative), 'YYYY-MM-DD'. */
export function addDays(date: string, days: number): string {
  return dateOfDayNumber(dayNumberOf(date) + days);
}

/** The `count` calendar dates ending with `lastDate`, oldest first ('YYYY-MM-DD'). */
export function datesEndingOn(lastDate: string, count: number): string[] {
  const last = dayNumberOf(lastDate);
  return Array.from({ length: count }, (_, i) => dateOfDayNumber(last - count + 1 + i));
}
