// The daily summary's clock: once per local day from the digest hour, in the farm's time zone.
// Time-zone offsets checked against the IANA tz database rules (Europe/Dublin: IST = UTC+1 from the
// last Sunday of March to the last Sunday of October; Pacific/Auckland: NZDT = UTC+13 in December).
import { describe, expect, it } from 'vitest';
import { digestDue, localDayAndHour } from '../../server/services/flag-mail';

describe('localDayAndHour', () => {
  it('reads the wall-clock day and hour in a zone', () => {
    expect(localDayAndHour(new Date('2030-06-10T06:10:00Z'), 'Europe/Dublin')).toEqual({ day: '2030-06-10', hour: 7 });
    expect(localDayAndHour(new Date('2030-12-10T06:10:00Z'), 'Europe/Dublin')).toEqual({ day: '2030-12-10', hour: 6 });
    expect(localDayAndHour(new Date('2030-12-10T18:30:00Z'), 'Pacific/Auckland')).toEqual({ day: '2030-12-11', hour: 7 });
  });
});

describe('digestDue', () => {
  const zone = 'Europe/Dublin';
  it('waits for the digest hour, then sends once that local day', () => {
    expect(digestDue(new Date('2030-06-10T05:59:00Z'), null, zone, 7)).toBe(false);
    expect(digestDue(new Date('2030-06-10T06:00:00Z'), null, zone, 7)).toBe(true);
    const sent = new Date('2030-06-10T06:05:00Z');
    expect(digestDue(new Date('2030-06-10T22:59:00Z'), sent, zone, 7)).toBe(false);
    // 23:30 UTC is already 00:30 on the 11th in Dublin, but before 07:00 there.
    expect(digestDue(new Date('2030-06-10T23:30:00Z'), sent, zone, 7)).toBe(false);
    expect(digestDue(new Date('2030-06-11T06:00:00Z'), sent, zone, 7)).toBe(true);
  });

  it('sends on a late sweep the same day, and at midnight when the hour is 0', () => {
    expect(digestDue(new Date('2030-06-10T15:00:00Z'), new Date('2030-06-09T06:00:00Z'), zone, 7)).toBe(true);
    expect(digestDue(new Date('2030-06-09T23:01:00Z'), new Date('2030-06-09T06:00:00Z'), zone, 0)).toBe(true);
  });
});
