import { describe, expect, it } from 'vitest';
import { STALE_AFTER_MS, formatAge, isStale } from '@/utils/age';
import { gaugeMarks } from '@/utils/levelGauge';

const NOW = new Date('2026-03-02T12:00:00.000Z');
const ago = (ms: number) => new Date(NOW.getTime() - ms).toISOString();
const MIN = 60_000;
const HOUR = 60 * MIN;
const DAY = 24 * HOUR;

describe('formatAge', () => {
  it.each([
    [null, 'never'],
    [ago(20_000), 'just now'],
    [ago(-90_000), 'just now'],
    [ago(12 * MIN), '12 min ago'],
    [ago(3 * HOUR + 5 * MIN), '3 h ago'],
    [ago(DAY + HOUR), '1 day ago'],
    [ago(4 * DAY), '4 days ago'],
  ])('says %s is %j', (iso, text) => {
    expect(formatAge(iso, NOW)).toBe(text);
  });
});

describe('isStale', () => {
  it.each([
    [ago(STALE_AFTER_MS - MIN), false],
    [ago(STALE_AFTER_MS + MIN), true],
    [null, false],
  ])('flags %s as stale: %s', (iso, stale) => {
    expect(isStale(iso, NOW)).toBe(stale);
  });

  it('counts two days as the limit', () => {
    expect(STALE_AFTER_MS).toBe(2 * DAY);
  });
});

describe('gaugeMarks', () => {
  const tile = { capacityL: 10_000, lowStockL: 2_000, grossL: 5_000, usableL: 4_200, percentFull: 50 };

  it('raises the low-stock line by the volume below the outlet that a reading shows', () => {
    // Usable 4,200 L of 5,000 L gross: 800 L lie below the outlet, so usable stock is 2,000 L at 2,800 L gross.
    expect(gaugeMarks(tile)).toEqual({ fill: 0.5, lowLine: 0.28 });
  });

  it.each([
    ['no reading', { grossL: null, usableL: null, percentFull: null }, { fill: null, lowLine: 0.2 }],
    ['no low-stock level', { lowStockL: 0 }, { fill: 0.5, lowLine: null }],
    ['a level at the outlet', { grossL: 700, usableL: 0, percentFull: 7 }, { fill: 0.07, lowLine: 0.2 }],
    ['an overfilled tank', { grossL: 10_400, usableL: 9_600, percentFull: 104 }, { fill: 1, lowLine: 0.28 }],
    ['no capacity', { capacityL: 0 }, { fill: null, lowLine: null }],
  ])('draws %s', (_name, change, marks) => {
    expect(gaugeMarks({ ...tile, ...change })).toEqual(marks);
  });
});
