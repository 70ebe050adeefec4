import { calendarOf } from './calendar';
import { finiteNumber, nonNegative } from '../checks';
import { deadBandMovements, MS_PER_HOUR, prepareSeries, type LevelReading } from './series';

/** Local hours when no draw is planned; endHour ≤ startHour wraps past midnight (22 → 5). */
export interface QuietHours {
  /** Local hour the quiet period starts (0–24, fractions allowed). */
  startHour: number;
  /** Local hour it ends (0–24, fractions allowed; not equal to startHour). */
  endHour: number;
}

/** Options of detectLeak. */
export interface LeakOptions {
  quietHours: QuietHours;
  /** The farm's IANA time zone: quiet hours are read on the local clock of each night, daylight saving included. */
  timeZone?: string;
  /** Without `timeZone`: one fixed offset from UTC for every night (minutes, east positive; default 0). */
  utcOffsetMinutes?: number;
  /** Loss rate above which a quiet period is flagged (L/h). */
  thresholdLPerHour: number;
  /** Half-width of the reading noise band (L). */
  noiseL: number;
}

/** A quiet period in which the tank lost more than the threshold rate. */
export interface LeakWindow {
  /** First reading inside the quiet period (epoch ms). */
  from: number;
  /** Last reading inside the quiet period (epoch ms). */
  to: number;
  /** Falls registered between them, refills not netted off (L). */
  lossL: number;
  /** lossL over the hours from `from` to `to` (L/h). */
  rateLPerHour: number;
}

function hour(field: string, value: unknown): number {
  const h = finiteNumber(field, value);
  if (h < 0 || h > 24) throw new RangeError(`${field} must be between 0 and 24 (got ${h})`);
  return h;
}

/**
 * Quiet periods whose readings show a loss faster than thresholdLPerHour (L, L/h, epoch ms).
 *
 * Only readings taken inside a quiet period are used, so a fall is blamed on the period only when
 * it happened between two readings that both lie inside it (manual readings in the evening and the
 * morning never flag anything); a period needs at least two readings inside it. Falls are found
 * with the same dead band as splitMovements, run afresh from the period's first reading, so reading
 * jitter adds no loss, and a float-valve refill inside the period does not hide the falls around it.
 * The rate is the loss over the whole span of those readings: the average loss across the quiet
 * hours, which is what a leak shows, rather than the peak of one draw.
 */
export function detectLeak(series: readonly LevelReading[], options: LeakOptions): LeakWindow[] {
  const startHour = hour('quietHours.startHour', options?.quietHours?.startHour);
  const endHour = hour('quietHours.endHour', options.quietHours.endHour);
  if (startHour === endHour) {
    throw new RangeError('quietHours.endHour must differ from quietHours.startHour');
  }
  const calendar = calendarOf(options);
  const threshold = nonNegative('thresholdLPerHour', options.thresholdLPerHour);
  const noiseL = nonNegative('noiseL', options.noiseL);

  const { t, v } = prepareSeries(series);
  const windows: LeakWindow[] = [];
  if (t.length < 2) return windows;
  let next = 0;
  for (let day = calendar.dayNumberOf(t[0]) - 1; day <= calendar.dayNumberOf(t[t.length - 1]); day++) {
    const opens = calendar.atHour(day, startHour);
    // A period past midnight closes on the next day's clock, which may have another offset.
    const closes = endHour > startHour ? calendar.atHour(day, endHour) : calendar.atHour(day + 1, endHour);
    while (next < t.length && t[next] < opens) next++;
    let end = next;
    while (end < t.length && t[end] <= closes) end++;
    if (end - next < 2) continue;
    const inside = { t: t.slice(next, end), v: v.slice(next, end) };
    const lossL = deadBandMovements(inside, noiseL)
      .filter((m) => m.kind === 'use')
      .reduce((sum, m) => sum - m.changeL, 0);
    const from = inside.t[0];
    const to = inside.t[inside.t.length - 1];
    const rateLPerHour = lossL / ((to - from) / MS_PER_HOUR);
    if (lossL > 0 && rateLPerHour > threshold) windows.push({ from, to, lossL, rateLPerHour });
  }
  return windows;
}
