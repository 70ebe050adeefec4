// Time: calendar dates, farm-local days in IANA time zones (offsets from @date-fns/tz) and day calendars.
export { addDays, dateOfDayNumber, datesEndingOn, dayNumberOf } from './dates';
export { farmDay, farmDayEnd, farmDayNumberOf, farmDayOf, farmDayReader, farmDayStart, farmDaysBefore, instantOfWallClock, utcOffsetMinutes, wallClockOf } from './zone';
export type { FarmDay } from './zone';
export { fixedOffsetCalendar, zoneCalendar } from './calendar';
export type { DayCalendar } from './calendar';
