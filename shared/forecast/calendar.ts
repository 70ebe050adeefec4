import { fixedOffsetCalendar, zoneCalendar, type DayCalendar } from '../time/index';
import { finiteNumber } from '../checks';

/**
 * The local-day calendar of a forecast's options: the farm's IANA `timeZone` when given (each day
 * with its own offset, so a daylight-saving change inside the window moves it), otherwise the fixed
 * `utcOffsetMinutes` (default 0). Throws RangeError for an unknown zone or an offset of ±24 h or more.
 */
export function calendarOf(options: { timeZone?: string; utcOffsetMinutes?: number }): DayCalendar {
  if (options.timeZone !== undefined) return zoneCalendar(options.timeZone);
  return fixedOffsetCalendar(finiteNumber('utcOffsetMinutes', options.utcOffsetMinutes ?? 0));
}
