import { describe, expect, it } from 'vitest';
import { SHORT_COVER_DAYS, coverText, formatSmallVolume, formatUseRate, isShortCover } from '@/components/board/boardCover';

describe('coverText', () => {
  // Rounding rule is our own: one decimal under two days, whole days from two on.
  it.each([
    [9.4, '≈ 9 days left'],
    [9.5, '≈ 10 days left'],
    [2, '≈ 2 days left'],
    [1.96, '≈ 2.0 days left'],
    [1.44, '≈ 1.4 days left'],
    [0.3, '≈ 0.3 days left'],
    [0.02, '≈ under 0.1 days left'],
    [0, 'Nothing usable left'],
    [1_234, '≈ over a year left'],
    [null, 'No use seen'],
  ])('gives %s days as "%s"', (days, text) => {
    expect(coverText(days)).toBe(text);
  });

  it.each([
    [0, 0, 'Nothing usable left'],
    [0, 486, 'Likely run down by now'],
    [1.4, 486, '≈ 1.4 days left'],
    [null, 486, 'No use seen'],
  ])('gives %s days from a reading of %s usable litres as "%s"', (days, usableL, text) => {
    expect(coverText(days, usableL)).toBe(text);
  });
});

describe('isShortCover', () => {
  it.each([
    [0, true],
    [2.99, true],
    [SHORT_COVER_DAYS, false],
    [12, false],
    [null, false],
  ])('does %s days count as short: %s', (days, short) => {
    expect(isShortCover(days)).toBe(short);
  });
});

describe('formatUseRate', () => {
  it.each([
    ['metric', 938.3, '938 L/day'],
    ['metric', 3.44, '3.4 L/day'],
    ['metric', 0, '0 L/day'],
    // US gallon = 3.785411784 L (NIST Handbook 44, Appendix C): 600 L = 158.5 gal, 12 L = 3.17 gal.
    ['us', 600, '159 gal/day'],
    ['us', 12, '3.2 gal/day'],
  ] as const)('shows a %s rate of %s L/day as "%s"', (system, lPerDay, text) => {
    expect(formatUseRate(lPerDay, system)).toBe(text);
  });

  it('keeps one decimal only while the shown figure is under 10', () => {
    expect(formatSmallVolume(9.94, 'metric')).toBe('9.9 L');
    expect(formatSmallVolume(9.96, 'metric')).toBe('10 L');
  });
});
