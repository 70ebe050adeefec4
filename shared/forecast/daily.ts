import { calendarOf } from './calendar';
import { finiteNumber, nonNegative } from '../checks';
import { deadBandMovements, MS_PER_DAY, prepareSeries, type LevelReading } from './series';

/** Options of dailyUse. */
export interface DailyUseOptions {
  /** How many whole local days before the day holding `now` to look at (a whole number ≥ 1). */
  windowDays: number;
  /** The moment of the forecast (epoch ms); its own, unfinished day is left out. */
  now: number;
  /** Half-width of the reading noise band (L). */
  noiseL: number;
  /** The farm's IANA time zone: each local day starts at its own midnight, daylight saving included. */
  timeZone?: string;
  /** Without `timeZone`: one fixed offset from UTC for every day (minutes, east positive; default 0). */
  utcOffsetMinutes?: number;
}

/** Result of dailyUse. */
export interface DailyUse {
  /** Mean use per whole day with data (L/day); 0 when there is no such day. */
  meanLPerDay: number;
  /** Sample standard deviation of daily use (L/day); 0 with fewer than two days. */
  sdLPerDay: number;
  /** Number of whole local days in the window that the readings span from start to end. */
  days: number;
  /** Use over those days (L). */
  totalUseL: number;
  /** Refills over those days (L). */
  totalRefillL: number;
}

/**
 * Mean and sample spread of use per local calendar day (L/day), with use and refill totals (L),
 * over the `windowDays` whole days before the day of `now`.
 *
 * Movements come from the same dead band as splitMovements; a movement spanning several days is
 * shared between them in proportion to time. Only days that the readings span completely (a reading
 * at or before the day's start and one at or after its end) are counted, and each counts with its
 * falls only: a refill never offsets use, and a day with a refill still counts its use.
 */
export function dailyUse(series: readonly LevelReading[], options: DailyUseOptions): DailyUse {
  const windowDays = finiteNumber('windowDays', options?.windowDays);
  if (!Number.isInteger(windowDays) || windowDays < 1) {
    throw new RangeError(`windowDays must be a whole number of at least 1 (got ${windowDays})`);
  }
  const now = finiteNumber('now', options.now);
  const noiseL = nonNegative('noiseL', options.noiseL);
  const calendar = calendarOf(options);

  const prepared = prepareSeries(series);
  const firstDay = calendar.dayNumberOf(now) - windowDays;
  const useL = new Array<number>(windowDays).fill(0);
  const refillL = new Array<number>(windowDays).fill(0);

  for (const m of deadBandMovements(prepared, noiseL)) {
    if (m.kind === 'steady') continue;
    const bins = m.kind === 'use' ? useL : refillL;
    const amountL = Math.abs(m.changeL);
    const from = Math.max(calendar.dayNumberOf(m.from), firstDay);
    const to = Math.min(calendar.dayNumberOf(m.to), firstDay + windowDays - 1);
    for (let day = from; day <= to; day++) {
      const overlap =
        Math.min(m.to, calendar.dayStart(day + 1)) - Math.max(m.from, calendar.dayStart(day));
      if (overlap > 0) bins[day - firstDay] += (amountL * overlap) / (m.to - m.from);
    }
  }

  const firstAt = prepared.t[0];
  const lastAt = prepared.t[prepared.t.length - 1];
  const counted: number[] = [];
  let totalRefillL = 0;
  for (let i = 0; i < windowDays; i++) {
    if (prepared.t.length < 2 || firstAt > calendar.dayStart(firstDay + i) || lastAt < calendar.dayStart(firstDay + i + 1)) continue;
    counted.push(useL[i]);
    totalRefillL += refillL[i];
  }

  const days = counted.length;
  const totalUseL = counted.reduce((sum, x) => sum + x, 0);
  const meanLPerDay = days === 0 ? 0 : totalUseL / days;
  const sdLPerDay =
    days < 2 ? 0 : Math.sqrt(counted.reduce((sum, x) => sum + (x - meanLPerDay) ** 2, 0) / (days - 1));
  return { meanLPerDay, sdLPerDay, days, totalUseL, totalRefillL };
}

/** Days the usable volume lasts at the mean use (days): Infinity when use is 0, 0 when empty. */
export function daysOfCover(usableL: number, meanLPerDay: number): number {
  const usable = finiteNumber('usableL', usableL);
  const use = nonNegative('meanLPerDay', meanLPerDay);
  if (usable <= 0) return 0;
  if (use === 0) return Infinity;
  return usable / use;
}

/**
 * Days the usable volume of a reading lasts from `now` at the mean use (days): the days of cover of what
 * is left once the use since the reading (taken at `takenAt`, epoch ms) is taken off; Infinity when use is 0.
 */
export function daysOfCoverSince(usableAtReadingL: number, meanLPerDay: number, takenAt: number, now: number): number {
  const use = nonNegative('meanLPerDay', meanLPerDay);
  const sinceDays = Math.max(0, finiteNumber('now', now) - finiteNumber('takenAt', takenAt)) / MS_PER_DAY;
  return daysOfCover(finiteNumber('usableAtReadingL', usableAtReadingL) - use * sinceDays, use);
}

/** When the usable volume runs out at the mean use (epoch ms): `now` when empty, null when use is 0. */
export function projectedEmptyDate(now: number, usableL: number, meanLPerDay: number): number | null {
  const at = finiteNumber('now', now);
  const days = daysOfCover(usableL, meanLPerDay);
  return days === Infinity ? null : at + days * MS_PER_DAY;
}
