import { describe, expect, it } from 'vitest';
import { STALE_AFTER_MS, formatAge, isStale } from '@/utils/age';

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
