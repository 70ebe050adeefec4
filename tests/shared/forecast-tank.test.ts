import { describe, expect, it } from 'vitest';
import { noiseBandL, tankForecast } from '@shared/forecast';
import { utcOffsetMinutes } from '@shared/time';
import type { TankGeometry } from '@shared/calibration';

const CYL: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 2000 };
const DAY = 86_400_000;

describe('noiseBandL', () => {
  it('is the volume of ±3 mm of a 1 m cylinder: π/4 · 1 m² · 3 mm = 2.356 L (hand derivation)', () => {
    expect(noiseBandL(CYL, 1000)).toBeCloseTo((Math.PI / 4) * 3, 9);
  });
});

describe('utcOffsetMinutes', () => {
  it.each([
    // IANA tz database rules (recalled from memory, not re-checked): Dublin is UTC+1 in summer, UTC+0 in winter.
    ['Europe/Dublin', Date.UTC(2026, 6, 1), 60],
    ['Europe/Dublin', Date.UTC(2026, 0, 15), 0],
    ['Asia/Kolkata', Date.UTC(2026, 0, 15), 330],
    ['America/Chicago', Date.UTC(2026, 0, 15), -360],
  ])('gives %s at %d as %d minutes', (tz, at, want) => {
    expect(utcOffsetMinutes(tz, at)).toBe(want);
  });
});

describe('tankForecast', () => {
  it('finds 50 L/day and the days of cover of a steady draw (hand derivation)', () => {
    const now = Date.UTC(2026, 0, 20, 12);
    // Midnight-to-midnight readings falling 50 L a day for 16 days, in a UTC+0 zone.
    const series = Array.from({ length: 17 }, (_, i) => ({ takenAt: Date.UTC(2026, 0, 4 + i), volumeL: 1500 - 50 * i }));
    const f = tankForecast(series, { geometry: CYL, usableL: 700, levelMm: 900, now, timeZone: 'UTC' });
    expect(f.meanLPerDay).toBeCloseTo(50, 6);
    expect(f.sdLPerDay).toBeCloseTo(0, 6);
    expect(f.daysOfCover).toBeCloseTo(14, 6);
    expect(f.projectedEmptyAt).toBeCloseTo(now + 14 * DAY, -3);
  });

  it('gives no days of cover when nothing is used', () => {
    const series = [0, 1, 2, 3].map((d) => ({ takenAt: Date.UTC(2026, 0, 1 + d), volumeL: 800 }));
    const f = tankForecast(series, { geometry: CYL, usableL: 800, levelMm: 1000, now: Date.UTC(2026, 0, 5, 6), timeZone: 'UTC' });
    expect(f.meanLPerDay).toBe(0);
    expect(f.daysOfCover).toBeNull();
    expect(f.projectedEmptyAt).toBeNull();
  });
});
