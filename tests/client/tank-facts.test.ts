import { describe, expect, it } from 'vitest';
import type { TankCalibrationVersion } from '@shared/schemas';
import { calibrationLabel, formatDateInZone, versionOfReading, zeroMarkText } from '@/components/tank/tankFacts';

describe('zeroMarkText', () => {
  it.each([
    [-30, 'metric', '30 mm below the floor'],
    [45, 'metric', '45 mm above the floor'],
    [0, 'metric', 'At the floor'],
    [0.3, 'metric', 'At the floor'],
    [-1_250, 'metric', '1,250 mm below the floor'],
    // 1 in = 25.4 mm exactly (NIST Handbook 44, Appendix C): −50.8 mm is 2 in below.
    [-50.8, 'us', '2.0 in below the floor'],
    [25.4, 'us', '1.0 in above the floor'],
  ] as const)('words an offset of %s mm (%s) as "%s"', (offset, system, words) => {
    expect(zeroMarkText(offset, system)).toBe(words);
  });

  it('never writes a minus sign or "above" for a mark below the floor', () => {
    const words = zeroMarkText(-30, 'metric');
    expect(words).not.toMatch(/-|−|above/);
  });
});

describe('calibrationLabel', () => {
  it('gives the version number and the day it was made on the farm’s clock', () => {
    // 23:30 UTC on 2 March is already 3 March in New Zealand (UTC+13 in March, daylight time).
    const made = '2026-03-02T23:30:00.000Z';
    expect(calibrationLabel({ number: 3, createdAt: made }, 'Pacific/Auckland')).toBe(`Version 3 · ${formatDateInZone(made, 'Pacific/Auckland')}`);
    const day = (iso: string) => new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeZone: 'UTC' }).format(new Date(iso));
    expect(formatDateInZone(made, 'Pacific/Auckland')).toBe(day('2026-03-03T12:00:00Z'));
    expect(formatDateInZone(made, 'Europe/Dublin')).toBe(day('2026-03-02T12:00:00Z'));
  });

  it('holds no hash-like text, only the number and the date', () => {
    const label = calibrationLabel({ number: 12, createdAt: '2026-01-15T08:00:00.000Z' }, 'UTC');
    expect(label).toMatch(/^Version 12 · /);
    expect(label).not.toMatch(/[0-9a-f]{8}/);
  });

  it('shows a dash for a date it cannot read', () => {
    expect(calibrationLabel({ number: 1, createdAt: 'not a date' }, 'UTC')).toBe('Version 1 · —');
  });

  it('falls back to the reader’s clock for an unknown time zone', () => {
    expect(calibrationLabel({ number: 2, createdAt: '2026-06-10T12:00:00.000Z' }, 'Mars/Olympus')).toMatch(/^Version 2 · .*2026/);
  });
});

describe('versionOfReading', () => {
  const versions: TankCalibrationVersion[] = [
    { number: 1, key: '0a1b2c3d', createdAt: '2026-01-01T00:00:00.000Z', current: false, geometry: { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1000 }, datumOffsetMm: 0 },
    { number: 2, key: '9f8e7d6c', createdAt: '2026-02-01T00:00:00.000Z', current: true, geometry: { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1000 }, datumOffsetMm: -30 },
  ];

  it('finds the version a reading was stored with by its key', () => {
    expect(versionOfReading(versions, '0a1b2c3d')?.number).toBe(1);
    expect(versionOfReading(versions, '9f8e7d6c')?.number).toBe(2);
  });

  it('gives null for a key the tank’s list lacks', () => {
    expect(versionOfReading(versions, 'ffffffff')).toBeNull();
  });
});
