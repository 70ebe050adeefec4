// Farm-local days against the published clock-change rules, as the IANA Time Zone Database encodes them.
//
// EU (Europe/Madrid): Directive 2000/84/EC, art. 2 and 3: summer time begins and ends at 01:00 UTC on
// the last Sunday of March and of October (IANA tzdb, europe file, "Rule EU … lastSun Mar 1:00u" and
// "lastSun Oct 1:00u"). In 2026: 29 March (CET UTC+1 → CEST UTC+2) and 25 October.
// US (America/Los_Angeles): Energy Policy Act of 2005 §110 (15 U.S.C. §260a): from 02:00 local on the
// second Sunday of March to 02:00 local on the first Sunday of November; in 2026 8 March and 1 November.
// New Zealand (Pacific/Auckland): New Zealand Daylight Time Order 2007: from 02:00 NZST on the last
// Sunday of September to 03:00 NZDT on the first Sunday of April (UTC+12 / UTC+13); in 2026 5 April and
// 27 September (recalled from memory, not re-checked against the Order's text).
// Chile (America/Santiago): clocks go forward at local midnight on the first Sunday of September, so
// 00:00 does not exist that day (IANA tzdb southamerica file, "Rule Chile … Sep Sun>=2 4:00u"; recalled
// from memory, not re-checked).
import { describe, expect, it } from 'vitest';
import {
  addDays,
  datesEndingOn,
  dayNumberOf,
  farmDay,
  farmDayOf,
  farmDayReader,
  farmDaysBefore,
  fixedOffsetCalendar,
  instantOfWallClock,
  utcOffsetMinutes,
  zoneCalendar,
} from '@shared/time';

const utc = (iso: string) => Date.parse(iso);
const iso = (ms: number) => new Date(ms).toISOString();

describe('utcOffsetMinutes', () => {
  it.each([
    ['Europe/Madrid', '2026-03-29T00:59:59.999Z', 60],
    ['Europe/Madrid', '2026-03-29T01:00:00.000Z', 120],
    ['Europe/Madrid', '2026-10-25T00:59:59.999Z', 120],
    ['Europe/Madrid', '2026-10-25T01:00:00.000Z', 60],
    // 02:00 PST = 10:00 UTC on 8 March; 02:00 PDT = 09:00 UTC on 1 November.
    ['America/Los_Angeles', '2026-03-08T09:59:59.999Z', -480],
    ['America/Los_Angeles', '2026-03-08T10:00:00.000Z', -420],
    ['America/Los_Angeles', '2026-11-01T09:00:00.000Z', -480],
    // 03:00 NZDT on 5 April = 14:00 UTC on 4 April; 02:00 NZST on 27 September = 14:00 UTC on 26 September.
    ['Pacific/Auckland', '2026-04-04T13:59:59.999Z', 780],
    ['Pacific/Auckland', '2026-04-04T14:00:00.000Z', 720],
    ['Pacific/Auckland', '2026-09-26T14:00:00.000Z', 780],
    // Nepal keeps UTC+5:45 all year (IANA tzdb, asia file, Zone Asia/Kathmandu since 1986).
    ['Asia/Kathmandu', '2026-06-01T00:00:00.000Z', 345],
  ])('gives %s at %s as %d minutes', (zone, at, want) => {
    expect(utcOffsetMinutes(zone, utc(at))).toBe(want);
  });

  it('refuses a zone name the database does not know', () => {
    expect(() => utcOffsetMinutes('Mars/Olympus_Mons', 0)).toThrow(RangeError);
  });
});

describe('farmDayOf', () => {
  it.each([
    // 13:57 UTC on 3 December is 02:57 on 4 December in Auckland (UTC+13) and 05:57 on 3 December in Los Angeles (UTC−8).
    ['Pacific/Auckland', '2026-12-03T13:57:00Z', '2026-12-04'],
    ['America/Los_Angeles', '2026-12-03T13:57:00Z', '2026-12-03'],
    ['America/Los_Angeles', '2026-12-04T07:59:59Z', '2026-12-03'],
    ['America/Los_Angeles', '2026-12-04T08:00:00Z', '2026-12-04'],
    // 23:30 UTC on 28 March is 00:30 CET on 29 March; 22:30 UTC on 29 March is 00:30 CEST on 30 March.
    ['Europe/Madrid', '2026-03-28T23:30:00Z', '2026-03-29'],
    ['Europe/Madrid', '2026-03-29T22:30:00Z', '2026-03-30'],
  ])('gives the date in %s of %s as %s', (zone, at, want) => {
    expect(farmDayOf(utc(at), zone)).toBe(want);
    expect(farmDayOf(new Date(at), zone)).toBe(want);
  });
});

describe('farmDay', () => {
  it.each([
    ['Europe/Madrid', '2026-03-29', '2026-03-28T23:00:00.000Z', '2026-03-29T22:00:00.000Z', 23, 60],
    ['Europe/Madrid', '2026-10-25', '2026-10-24T22:00:00.000Z', '2026-10-25T23:00:00.000Z', 25, 120],
    ['Europe/Madrid', '2026-03-30', '2026-03-29T22:00:00.000Z', '2026-03-30T22:00:00.000Z', 24, 120],
    ['America/Los_Angeles', '2026-03-08', '2026-03-08T08:00:00.000Z', '2026-03-09T07:00:00.000Z', 23, -480],
    ['Pacific/Auckland', '2026-04-05', '2026-04-04T11:00:00.000Z', '2026-04-05T12:00:00.000Z', 25, 780],
    // Santiago skips midnight on 6 September: the day begins when the clocks jump to 01:00 (−03).
    ['America/Santiago', '2026-09-06', '2026-09-06T04:00:00.000Z', '2026-09-07T03:00:00.000Z', 23, -180],
  ])('gives %s %s from %s to %s (%d h, starting at an offset of %d min)', (zone, date, start, end, hours, offset) => {
    const day = farmDay(date, zone);
    expect({ start: iso(day.startMs), end: iso(day.endMs), hours: day.hours, offset: day.utcOffsetMinutes }).toEqual({ start, end, hours, offset });
  });
});

describe('instantOfWallClock', () => {
  const wall = (text: string) => Date.parse(`${text}Z`);

  it('gives the moment the clocks jumped for a local time that was skipped', () => {
    // 02:30 on 29 March 2026 never showed in Madrid: the clocks went from 02:00 CET to 03:00 CEST at 01:00 UTC.
    expect(iso(instantOfWallClock(wall('2026-03-29T02:30:00'), 'Europe/Madrid'))).toBe('2026-03-29T01:00:00.000Z');
  });

  it('gives the first pass of a local time that was repeated', () => {
    // 02:30 on 25 October 2026 showed twice in Madrid: 00:30 UTC (CEST) and 01:30 UTC (CET).
    expect(iso(instantOfWallClock(wall('2026-10-25T02:30:00'), 'Europe/Madrid'))).toBe('2026-10-25T00:30:00.000Z');
  });
});

describe('farmDaysBefore', () => {
  it('gives the 14 days before the spring change its own offset on each day', () => {
    const days = farmDaysBefore(utc('2026-04-05T10:00:00Z'), 'Europe/Madrid', 14);
    expect(days.map((d) => d.date)).toEqual(datesEndingOn('2026-04-04', 14));
    expect(days[0].date).toBe('2026-03-22');
    // Days up to and including 29 March begin in winter time (UTC+1), the rest in summer time (UTC+2).
    expect(days.map((d) => d.utcOffsetMinutes)).toEqual([...Array(8).fill(60), ...Array(6).fill(120)]);
    expect(days.map((d) => d.hours)).toEqual([...Array(7).fill(24), 23, ...Array(6).fill(24)]);
    for (let i = 1; i < days.length; i++) expect(days[i].startMs).toBe(days[i - 1].endMs);
  });

  it('gives the autumn change its 25-hour day and winter time after it', () => {
    const days = farmDaysBefore(utc('2026-11-01T10:00:00Z'), 'Europe/Madrid', 14);
    expect(days[0].date).toBe('2026-10-18');
    expect(days.map((d) => d.utcOffsetMinutes)).toEqual([...Array(8).fill(120), ...Array(6).fill(60)]);
    expect(days.find((d) => d.hours !== 24)).toMatchObject({ date: '2026-10-25', hours: 25 });
  });
});

describe('farmDayReader and farmDayOf', () => {
  it('gives the date the runtime\'s Intl formatter gives, every 47 minutes of a year, in zones with odd offsets and midnight changes', () => {
    // Kathmandu is UTC+5:45; Lord Howe moves by half an hour; Santiago and Havana change their clocks at midnight.
    // The reference is Intl.DateTimeFormat (ECMA-402) in the en-CA locale, which writes dates as YYYY-MM-DD.
    for (const zone of ['Europe/Dublin', 'Asia/Kathmandu', 'Australia/Lord_Howe', 'America/Santiago', 'America/Havana', 'Pacific/Auckland', 'UTC']) {
      const intl = new Intl.DateTimeFormat('en-CA', { timeZone: zone, year: 'numeric', month: '2-digit', day: '2-digit' });
      const dayOf = farmDayReader(zone);
      const wrong: string[] = [];
      for (let ms = utc('2025-01-01T00:00:00Z'); ms < utc('2026-01-01T00:00:00Z'); ms += 47 * 60_000 + 17) {
        const want = intl.format(ms);
        if (dayOf(ms) !== want || farmDayOf(ms, zone) !== want) wrong.push(`${iso(ms)} ${want}`);
      }
      expect({ zone, wrong: wrong.slice(0, 3) }).toEqual({ zone, wrong: [] });
    }
  }, 30_000);
});

describe('day calendars', () => {
  it('puts the quiet hours of a change night on each side of the change (Madrid, 28–29 March 2026)', () => {
    const calendar = zoneCalendar('Europe/Madrid');
    const day = calendar.dayNumberOf(utc('2026-03-28T12:00:00Z'));
    // 23:00 CET on 28 March = 22:00 UTC; 05:00 CEST on 29 March = 03:00 UTC.
    expect(iso(calendar.atHour(day, 23))).toBe('2026-03-28T22:00:00.000Z');
    expect(iso(calendar.atHour(day + 1, 5))).toBe('2026-03-29T03:00:00.000Z');
    expect(iso(calendar.dayStart(day + 1))).toBe('2026-03-28T23:00:00.000Z');
    expect(iso(calendar.dayStart(day + 2))).toBe('2026-03-29T22:00:00.000Z');
  });

  it('keeps one offset for every day of a fixed-offset calendar', () => {
    const calendar = fixedOffsetCalendar(330);
    const day = dayNumberOf('2026-03-29');
    expect(iso(calendar.dayStart(day))).toBe('2026-03-28T18:30:00.000Z');
    expect(iso(calendar.atHour(day, 5.5))).toBe('2026-03-29T00:00:00.000Z');
    expect(calendar.dayNumberOf(utc('2026-03-28T18:30:00Z'))).toBe(day);
    expect(() => fixedOffsetCalendar(1440)).toThrow(/utcOffsetMinutes/);
  });
});

describe('calendar dates', () => {
  it.each([
    // Gregorian calendar: 2028 is a leap year (divisible by 4, not a century), 2100 is not (a century not divisible by 400).
    ['2028-02-28', 1, '2028-02-29'],
    ['2100-02-28', 1, '2100-03-01'],
    ['2026-01-01', -1, '2025-12-31'],
  ])('gives %s plus %d days as %s', (date, days, want) => {
    expect(addDays(date, days)).toBe(want);
  });

  it.each(['2026-02-30', '2026-13-01', '3 March 2026', ''])('refuses %j as a calendar date', (text) => {
    expect(() => dayNumberOf(text)).toThrow(RangeError);
  });
});
