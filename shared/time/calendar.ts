// Day calendars: where local days begin, for the forecast's day bins and quiet hours. A zone calendar
// gives each day its own offset (daylight saving moves it); a fixed-offset one keeps one offset.
import { instantOfWallClock, utcOffsetMinutes } from './zone';

const MS_PER_MINUTE = 60_000;
const MS_PER_HOUR = 3_600_000;
const MS_PER_DAY = 86_400_000;

/** Local days as day numbers (days since 1970-01-01 local) and the instants (epoch ms) they and their hours begin. */
export interface DayCalendar {
  /** The day number of the local date holding instant `at`. */
  dayNumberOf(at: number): number;
  /** The instant (epoch ms) local day `dayNumber` begins. */
  dayStart(dayNumber: number): number;
  /** The instant (epoch ms) the local clocks show `hour` (0–24, fractions allowed) on day `dayNumber`. */
  atHour(dayNumber: number, hour: number): number;
}

/** A calendar of `timeZone`'s local days (IANA name), each with the offset in force on it; throws RangeError for an unknown zone. */
export function zoneCalendar(timeZone: string): DayCalendar {
  utcOffsetMinutes(timeZone, 0);
  // Offsets per clock hour when the hour has one offset throughout (a forecast reads thousands of instants).
  const hourOffsets = new Map<number, number | null>();
  const offsetMsAt = (at: number) => {
    const hour = Math.floor(at / MS_PER_HOUR);
    let kept = hourOffsets.get(hour);
    if (kept === undefined) {
      const first = utcOffsetMinutes(timeZone, hour * MS_PER_HOUR);
      kept = first === utcOffsetMinutes(timeZone, hour * MS_PER_HOUR + MS_PER_HOUR - 1) ? first * MS_PER_MINUTE : null;
      if (hourOffsets.size >= 100_000) hourOffsets.clear();
      hourOffsets.set(hour, kept);
    }
    return kept ?? Math.round(utcOffsetMinutes(timeZone, at) * MS_PER_MINUTE);
  };
  const starts = new Map<number, number>();
  return {
    dayNumberOf: (at) => Math.floor((at + offsetMsAt(at)) / MS_PER_DAY),
    dayStart(dayNumber) {
      let start = starts.get(dayNumber);
      if (start === undefined) {
        start = instantOfWallClock(dayNumber * MS_PER_DAY, timeZone);
        starts.set(dayNumber, start);
      }
      return start;
    },
    atHour: (dayNumber, hour) => instantOfWallClock(dayNumber * MS_PER_DAY + hour * MS_PER_HOUR, timeZone),
  };
}

/** A calendar whose days all have one fixed UTC offset (minutes, east positive, strictly within ±24 h). */
export function fixedOffsetCalendar(offsetMinutes: number): DayCalendar {
  if (!Number.isFinite(offsetMinutes) || Math.abs(offsetMinutes) >= 1440) {
    throw new RangeError(`utcOffsetMinutes must be a finite number within ±1439 (got ${offsetMinutes})`);
  }
  const offset = offsetMinutes * MS_PER_MINUTE;
  return {
    dayNumberOf: (at) => Math.floor((at + offset) / MS_PER_DAY),
    dayStart: (dayNumber) => dayNumber * MS_PER_DAY - offset,
    atHour: (dayNumber, hour) => dayNumber * MS_PER_DAY - offset + hour * MS_PER_HOUR,
  };
}
