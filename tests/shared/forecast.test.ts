import { describe, expect, it } from 'vitest';
import {
  dailyUse,
  daysOfCover,
  daysOfCoverSince,
  detectLeak,
  projectedEmptyDate,
  splitMovements,
  type LevelReading,
} from '@shared/forecast';

const HOUR = 3_600_000;
const DAY = 86_400_000;
// Monday 3 March 2025 00:00 UTC; the tank, farm and readings are an invented scenario.
const T0 = Date.UTC(2025, 2, 3);
const at = (hours: number) => T0 + hours * HOUR;
const series = (rows: [number, number][]): LevelReading[] => rows.map(([h, volumeL]) => ({ takenAt: at(h), volumeL }));

describe('splitMovements', () => {
  it('classifies use, refill and steady stretches with a dead band (hand computation)', () => {
    // noiseL = 2. Reference 1000 at 0 h; 999.5 and 1000.4 stay inside ±2 (steady). 940 at 18 h is
    // −60: use, placed on the last strictly falling run 1000.4 → 940 (12 h → 18 h). Reference 940;
    // 939.8 is inside the band; 1200 at 30 h is +260: refill on the rising run 939.8 → 1200
    // (24 h → 30 h). 1199.5 stays inside the band around 1200.
    const readings = series([
      [0, 1000],
      [6, 999.5],
      [12, 1000.4],
      [18, 940],
      [24, 939.8],
      [30, 1200],
      [36, 1199.5],
    ]);
    expect(splitMovements(readings, { noiseL: 2 })).toEqual([
      { kind: 'steady', from: at(0), to: at(12), fromL: 1000, toL: 1000, changeL: 0 },
      { kind: 'use', from: at(12), to: at(18), fromL: 1000, toL: 940, changeL: -60 },
      { kind: 'steady', from: at(18), to: at(24), fromL: 940, toL: 940, changeL: 0 },
      { kind: 'refill', from: at(24), to: at(30), fromL: 940, toL: 1200, changeL: 260 },
      { kind: 'steady', from: at(30), to: at(36), fromL: 1200, toL: 1200, changeL: 0 },
    ]);
  });

  it('registers a slow draw once it leaves the band instead of losing it (hand computation)', () => {
    // 0.8 L every hour with noiseL = 2: 100 → 99.2 → 98.4 → 97.6 (−2.4, registers) → 96.8 → 96.0
    // → 95.2 (−2.4 from 97.6, registers). Both registrations lie on unbroken falling runs, so they
    // are back to back and merge into one use of −4.8 L from 0 h to 6 h.
    const readings = series([0, 1, 2, 3, 4, 5, 6].map((h) => [h, 100 - 0.8 * h] as [number, number]));
    const moves = splitMovements(readings, { noiseL: 2 });
    expect(moves).toHaveLength(1);
    expect(moves[0]).toMatchObject({ kind: 'use', from: at(0), to: at(6), fromL: 100 });
    expect(moves[0].changeL).toBeCloseTo(-4.8, 9);
  });

  it('sorts readings and averages readings taken at the same instant', () => {
    // Readings of 500 and 504 at 2 h become 502; with noiseL 1 that is a +2 refill from 500.
    const readings = series([
      [2, 504],
      [0, 500],
      [2, 500],
      [4, 502],
    ]);
    expect(splitMovements(readings, { noiseL: 1 })).toEqual([
      { kind: 'refill', from: at(0), to: at(2), fromL: 500, toL: 502, changeL: 2 },
      { kind: 'steady', from: at(2), to: at(4), fromL: 502, toL: 502, changeL: 0 },
    ]);
  });

  it('returns no movements for fewer than two instants', () => {
    expect(splitMovements([], { noiseL: 1 })).toEqual([]);
    expect(splitMovements(series([[0, 10]]), { noiseL: 1 })).toEqual([]);
  });

  it.each([
    [[{ takenAt: T0, volumeL: -1 }], { noiseL: 1 }, /series\[0\]\.volumeL/],
    [[{ takenAt: Number.NaN, volumeL: 1 }], { noiseL: 1 }, /series\[0\]\.takenAt/],
    [[], { noiseL: -1 }, /noiseL/],
  ])('throws a RangeError naming the field for bad input %#', (readings, options, field) => {
    expect(() => splitMovements(readings, options)).toThrow(RangeError);
    expect(() => splitMovements(readings, options)).toThrow(field);
  });
});

// One tank over Sun 22:00 → Thu 03:00 (hours from Monday 00:00 UTC), noiseL = 1:
//   8→10 h   use 60 (Mon)             22→26 h  use 40, 2 h Mon + 2 h Tue
//   26→32 h  refill 300 (Tue)         32→34 h  use 20 (Tue)
//   50→52 h  use 20 (Wed)             75 h     960.4, inside the band (no movement)
const week = series([
  [-2, 800],
  [8, 800],
  [10, 740],
  [22, 740],
  [26, 700],
  [32, 1000],
  [34, 980],
  [50, 980],
  [52, 960],
  [70, 960],
  [75, 960.4],
]);

describe('dailyUse', () => {
  it('gives use per UTC day, its mean and sample spread (hand computation)', () => {
    // Mon 60 + 40·2/4 = 80, Tue 40·2/4 + 20 = 40, Wed 20. Mean 140/3 = 46.667.
    // Deviations 33.333, −6.667, −26.667 → Σ² = 1866.667, /2 = 933.333 → sd = 30.5505.
    const result = dailyUse(week, { windowDays: 3, now: at(82), noiseL: 1 });
    expect(result.days).toBe(3);
    expect(result.totalUseL).toBeCloseTo(140, 9);
    expect(result.totalRefillL).toBeCloseTo(300, 9);
    expect(result.meanLPerDay).toBeCloseTo(46.666667, 5);
    expect(result.sdLPerDay).toBeCloseTo(30.550505, 5);
  });

  it('moves day boundaries with the farm offset from UTC (hand computation)', () => {
    // UTC+2: local days start at 22:00 UTC. Mon [−2, 22) h: 60; Tue [22, 46) h: 40 + 20 = 60;
    // Wed [46, 70) h: 20. Mean 46.667; deviations 13.333, 13.333, −26.667 → Σ² = 1066.667, /2 →
    // sd = 23.0940.
    const result = dailyUse(week, { windowDays: 3, now: at(82), noiseL: 1, utcOffsetMinutes: 120 });
    expect(result.days).toBe(3);
    expect(result.meanLPerDay).toBeCloseTo(46.666667, 5);
    expect(result.sdLPerDay).toBeCloseTo(23.094011, 5);
    expect(result.totalRefillL).toBeCloseTo(300, 9);
  });

  it('counts only whole days the readings span', () => {
    // Window Sat..Wed: the readings start Sunday 22:00, so Saturday and Sunday have no whole data.
    const result = dailyUse(week, { windowDays: 5, now: at(82), noiseL: 1 });
    expect(result.days).toBe(3);
    expect(result.meanLPerDay).toBeCloseTo(46.666667, 5);
  });

  it('leaves out the unfinished day of now', () => {
    // now = Wednesday 12:00: the window of 2 days is Mon and Tue only.
    const result = dailyUse(week, { windowDays: 2, now: at(60), noiseL: 1 });
    expect(result.days).toBe(2);
    expect(result.totalUseL).toBeCloseTo(120, 9);
  });

  it('returns zeros when no whole day has data', () => {
    expect(dailyUse(week, { windowDays: 3, now: at(0), noiseL: 1 })).toEqual({
      meanLPerDay: 0,
      sdLPerDay: 0,
      days: 0,
      totalUseL: 0,
      totalRefillL: 0,
    });
  });

  it.each([
    [{ windowDays: 0, now: T0, noiseL: 1 }, /windowDays/],
    [{ windowDays: 1.5, now: T0, noiseL: 1 }, /windowDays/],
    [{ windowDays: 3, now: Number.NaN, noiseL: 1 }, /now/],
    [{ windowDays: 3, now: T0, noiseL: 1, utcOffsetMinutes: 1440 }, /utcOffsetMinutes/],
  ])('throws a RangeError naming the field for %o', (options, field) => {
    expect(() => dailyUse(week, options)).toThrow(field);
  });
});

describe('daysOfCover', () => {
  it.each([
    [900, 45, 20],
    [0, 10, 0],
    [-5, 10, 0],
    [500, 0, Infinity],
    [0, 0, 0],
  ])('gives %s L at %s L/day → %s days', (usable, use, expected) => {
    expect(daysOfCover(usable, use)).toBe(expected);
  });

  it('throws a RangeError naming meanLPerDay when it is negative', () => {
    expect(() => daysOfCover(10, -1)).toThrow(/meanLPerDay/);
  });
});

describe('daysOfCoverSince', () => {
  // Hand computation: 900 L at the reading, 45 L/day, read 4 days ago → 900 − 4 × 45 = 720 L left → 16 days.
  it.each([
    [900, 45, 4, 16],
    [900, 45, 20, 0],
    [900, 45, 25, 0],
    [900, 0, 4, Infinity],
    [0, 10, 0, 0],
  ])('gives %s L at the reading, %s L/day, read %s days ago → %s days left', (usable, use, ago, expected) => {
    expect(daysOfCoverSince(usable, use, T0 - ago * DAY, T0)).toBe(expected);
  });

  it('counts no use for a reading stamped after now (a clock ahead)', () => {
    expect(daysOfCoverSince(900, 45, T0 + DAY, T0)).toBe(20);
  });
});

describe('projectedEmptyDate', () => {
  it('projects the empty date from the mean use (hand computation: 900 L / 45 L/day = 20 days)', () => {
    expect(projectedEmptyDate(T0, 900, 45)).toBe(T0 + 20 * DAY);
  });

  it('returns now when empty and null when there is no use', () => {
    expect(projectedEmptyDate(T0, 0, 5)).toBe(T0);
    expect(projectedEmptyDate(T0, 500, 0)).toBeNull();
  });
});

// Hourly logger, Monday 18:00 → Tuesday 07:00 UTC (hours from Monday 00:00).
const hourly = (levels: number[], startHour = 18) =>
  series(levels.map((volumeL, i) => [startHour + i, volumeL] as [number, number]));
const quiet = { quietHours: { startHour: 22, endHour: 5 }, thresholdLPerHour: 1.5, noiseL: 1 };

describe('detectLeak', () => {
  it('flags a steady night loss and ignores evening and morning irrigation (hand computation)', () => {
    // 18–21 h irrigation 500 → 400, then 2 L/h from 22:00 (400) to 05:00 (386), then irrigation.
    // Inside 22:00–05:00: seven falls of 2 L (each beyond ±1) = 14 L over 7 h = 2 L/h > 1.5.
    const readings = hourly([500, 450, 400, 400, 400, 398, 396, 394, 392, 390, 388, 386, 350, 300]);
    expect(detectLeak(readings, quiet)).toEqual([{ from: at(22), to: at(29), lossL: 14, rateLPerHour: 2 }]);
  });

  it('flags a single draw in the night as its average over the quiet hours (hand computation)', () => {
    // 30 L drawn between 01:00 and 02:00; over the 7 h of readings that is 30/7 = 4.2857 L/h.
    const readings = hourly([400, 400, 400, 400, 400, 400, 400, 400, 370, 370, 370, 370], 18);
    const [window] = detectLeak(readings, quiet);
    expect(window).toMatchObject({ from: at(22), to: at(29), lossL: 30 });
    expect(window.rateLPerHour).toBeCloseTo(30 / 7, 9);
  });

  it('does not let a float-valve refill hide the night loss (hand computation)', () => {
    // 22:00 400, 398, 396, refill to 450 at 01:00, then 448, 446, 444, 442 at 05:00:
    // falls 2 + 2 + 2 + 2 + 2 + 2 = 12 L over 7 h = 1.714 L/h, although the level rose by 42 L.
    const readings = hourly([400, 398, 396, 450, 448, 446, 444, 442], 22);
    const [window] = detectLeak(readings, quiet);
    expect(window.lossL).toBeCloseTo(12, 9);
    expect(window.rateLPerHour).toBeCloseTo(12 / 7, 9);
  });

  it('ignores jitter inside the noise band and a loss at exactly the threshold', () => {
    expect(detectLeak(hourly([400, 400.4, 399.6, 400.3, 399.7, 400.2, 399.8, 400], 22), quiet)).toEqual([]);
    // 1.5 L/h exactly: 3 falls of 3.5 L over 7 h = 10.5/7 = 1.5, not above the threshold.
    expect(detectLeak(hourly([400, 400, 396.5, 396.5, 393, 393, 389.5, 389.5], 22), quiet)).toEqual([]);
  });

  it('never blames a fall on quiet hours without two readings inside them', () => {
    // Manual sight-tube readings at 18:00 and 07:00 with 100 L gone between them.
    expect(detectLeak(series([[18, 900], [31, 800]]), quiet)).toEqual([]);
  });

  it('applies quiet hours in local time with the farm offset', () => {
    // UTC−3: local 22:00–05:00 is 01:00–08:00 UTC. Readings 01:00..08:00 UTC lose 3 L/h.
    const readings = hourly([400, 397, 394, 391, 388, 385, 382, 379], 25);
    const [window] = detectLeak(readings, { ...quiet, utcOffsetMinutes: -180 });
    expect(window).toMatchObject({ from: at(25), to: at(32), lossL: 21, rateLPerHour: 3 });
    // Without the offset only 01:00–05:00 UTC is quiet: 4 falls of 3 L over 4 h = 3 L/h.
    expect(detectLeak(readings, quiet)).toEqual([{ from: at(25), to: at(29), lossL: 12, rateLPerHour: 3 }]);
  });

  it('handles quiet hours that do not wrap midnight', () => {
    const readings = hourly([400, 396, 392, 388], 1); // 01:00–04:00, 4 L/h
    expect(detectLeak(readings, { ...quiet, quietHours: { startHour: 2, endHour: 4 } })).toEqual([
      { from: at(2), to: at(4), lossL: 8, rateLPerHour: 4 },
    ]);
  });

  it.each([
    [{ ...quiet, quietHours: { startHour: 5, endHour: 5 } }, /quietHours\.endHour/],
    [{ ...quiet, quietHours: { startHour: 25, endHour: 5 } }, /quietHours\.startHour/],
    [{ ...quiet, thresholdLPerHour: -1 }, /thresholdLPerHour/],
    [{ ...quiet, noiseL: Number.NaN }, /noiseL/],
  ])('throws a RangeError naming the field for bad options %#', (options, field) => {
    expect(() => detectLeak(week, options)).toThrow(field);
  });
});
