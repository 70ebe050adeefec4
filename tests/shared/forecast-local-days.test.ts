// The forecast's local days across a daylight-saving change: every day of the window keeps the offset
// in force on it. Europe/Madrid follows Directive 2000/84/EC, art. 2 and 3 (summer time from 01:00 UTC
// on the last Sunday of March to 01:00 UTC on the last Sunday of October; IANA tzdb "Rule EU"): in 2026
// the clocks go forward on 29 March (UTC+1 → UTC+2) and back on 25 October. Readings are invented.
import { describe, expect, it } from 'vitest';
import { dailyUse, detectLeak, tankForecast } from '@shared/forecast';
import { farmDayStart, addDays } from '@shared/time';

const HOUR = 3_600_000;
const MADRID = 'Europe/Madrid';

/** Readings at each local midnight from `firstDate` on; day i's use is `uses[i]` L. */
function midnightReadings(firstDate: string, uses: number[]): { takenAt: number; volumeL: number }[] {
  let volumeL = 5_000;
  const out = [{ takenAt: farmDayStart(firstDate, MADRID), volumeL }];
  uses.forEach((use, i) => {
    volumeL -= use;
    out.push({ takenAt: farmDayStart(addDays(firstDate, i + 1), MADRID), volumeL });
  });
  return out;
}

// 14 days alternating 100 L and 20 L: mean 60 L/day; every deviation is ±40 L, so the sample
// variance is 14 · 1600 / 13 and the spread √1723.08 = 41.510 L/day (hand computation).
const USES = Array.from({ length: 14 }, (_, i) => (i % 2 === 0 ? 100 : 20));
const SD = Math.sqrt((14 * 1600) / 13);

describe('dailyUse in a farm time zone', () => {
  it.each([
    ['spring', '2026-03-22', '2026-04-05T10:00:00Z'],
    ['autumn', '2026-10-18', '2026-11-01T10:00:00Z'],
  ])('bins each day from its own local midnight across the %s change (hand computation)', (_season, firstDate, now) => {
    const result = dailyUse(midnightReadings(firstDate, USES), { windowDays: 14, now: Date.parse(now), noiseL: 1, timeZone: MADRID });
    expect(result.days).toBe(14);
    expect(result.totalUseL).toBeCloseTo(840, 9);
    expect(result.meanLPerDay).toBeCloseTo(60, 9);
    expect(result.sdLPerDay).toBeCloseTo(SD, 9);
  });

  it('differs from one fixed offset taken on the day of the forecast, which mis-bins the days before the change', () => {
    const readings = midnightReadings('2026-03-22', USES);
    const fixed = dailyUse(readings, { windowDays: 14, now: Date.parse('2026-04-05T10:00:00Z'), noiseL: 1, utcOffsetMinutes: 120 });
    // With UTC+2 throughout the winter-time days start an hour early and take an hour of the day before.
    expect(fixed.sdLPerDay).toBeLessThan(SD - 1);
  });

  it('is what tankForecast reports for the farm zone', () => {
    const f = tankForecast(midnightReadings('2026-03-22', USES), {
      geometry: { shape: 'vertical-cylinder', diameterMm: 2000, heightMm: 2000 }, usableL: 600, levelMm: 1000, now: Date.parse('2026-04-05T10:00:00Z'), timeZone: MADRID,
    });
    expect(f.days).toBe(14);
    expect(f.meanLPerDay).toBeCloseTo(60, 9);
    expect(f.sdLPerDay).toBeCloseTo(SD, 9);
  });
});

describe('detectLeak in a farm time zone', () => {
  it('reads the quiet hours of the change night on the local clock: 23:00 CET to 05:00 CEST is 22:00 to 03:00 UTC', () => {
    // Hourly readings from 20:00 UTC on 28 March to 05:00 UTC on 29 March, 3 L lost every hour.
    const start = Date.parse('2026-03-28T20:00:00Z');
    const readings = Array.from({ length: 10 }, (_, i) => ({ takenAt: start + i * HOUR, volumeL: 900 - 3 * i }));
    const options = { quietHours: { startHour: 23, endHour: 5 }, thresholdLPerHour: 1, noiseL: 1 };
    // Inside 22:00–03:00 UTC: five falls of 3 L over 5 h (hand computation).
    expect(detectLeak(readings, { ...options, timeZone: MADRID })).toEqual([
      { from: Date.parse('2026-03-28T22:00:00Z'), to: Date.parse('2026-03-29T03:00:00Z'), lossL: 15, rateLPerHour: 3 },
    ]);
    // Summer time all night would open the period an hour early.
    expect(detectLeak(readings, { ...options, utcOffsetMinutes: 120 })[0].from).toBe(Date.parse('2026-03-28T21:00:00Z'));
  });
});
