import { describe, expect, it } from 'vitest';
import type { TankGeometry } from '@shared/calibration';
import { BATCH_FIT_WARN_SHARE, batchFit, batchOverText, batchVolumeL, inputShortfalls, litresPerInputUnit, type BatchFit } from '@shared/mixing';

// Sources:
// [GC] gravel-calculator.com, "Vertical Cylinder Tank Volume Calculator", Example 2: radius 5 m,
//   filled to 4 m → ≈ 314.16 m³ (the volume at a 4 m safe fill line of a 10 m × 10 m tank).
// [SI] BIPM, "The International System of Units (SI)", 9th edition (2019), Table 8: the litre,
//   1 L = 1 dm³ = 10⁻³ m³ (so 1 ml = 10⁻³ L; recalled from memory).
// The 10 % warning band is the customer's rule (issue #14): common practice, no published source.
const M3 = 1000;
const BIG: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 10_000, heightMm: 10_000 };
// Hand derivation, π R² h: a 1 m × 1 m cylinder holds π/8 m³ = 392.699 L up to a line at 500 mm.
const SMALL: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1000 };
const SMALL_LINE_L = (Math.PI / 8) * M3;
const START = '2026-05-04T08:00:00.000Z';
const BEFORE = '2026-05-04T07:30:00.000Z';

const fitOf = (geometry: TankGeometry, safeFillLevelMm: number, heldL: number, batchL: number): BatchFit =>
  batchFit({ geometry, safeFillLevelMm, latest: { grossL: heldL, takenAt: BEFORE }, startedAt: START, batchL });

describe('batchFit', () => {
  it('measures the free space as the volume at the safe fill line less what the tank holds ([GC] Example 2: 314.16 m³ to 4 m)', () => {
    const fit = fitOf(BIG, 4000, 14_160, 250_000);
    expect(fit.verdict).toBe('fits');
    if (fit.verdict === 'unknown') return;
    expect(Math.abs(fit.safeFillL - 314.16 * M3)).toBeLessThanOrEqual(0.005 * M3);
    expect(Math.abs(fit.freeL - 300_000)).toBeLessThanOrEqual(0.005 * M3);
    expect(fit.heldL).toBe(14_160);
    expect(Math.abs(fit.leftL - 50_000)).toBeLessThanOrEqual(0.005 * M3);
    expect(fit.percentOfFree).toBeCloseTo((250_000 / fit.freeL) * 100, 9);
  });

  it('refuses a batch larger than the free space and says by how much ([GC] Example 2)', () => {
    const fit = fitOf(BIG, 4000, 14_160, 320_000);
    expect(fit.verdict).toBe('over');
    if (fit.verdict !== 'over') return;
    expect(Math.abs(fit.overL - 20_000)).toBeLessThanOrEqual(0.005 * M3);
  });

  it('warns when the batch takes more than the last 10 % of the free space ([GC] Example 2)', () => {
    expect(fitOf(BIG, 4000, 14_160, 290_000).verdict).toBe('tight');
  });

  it.each([
    ['exactly 90 % of the free space', 0.9, 'fits'],
    ['a hair over 90 %', 0.9 + 1e-6, 'tight'],
    ['the whole free space, to the line', 1, 'tight'],
    ['a hair over the free space', 1 + 1e-6, 'over'],
  ])('gives the right verdict at the band edges (hand derivation, π/8 m³ to 500 mm): %s', (_name, share, verdict) => {
    expect(BATCH_FIT_WARN_SHARE).toBe(0.1);
    expect(fitOf(SMALL, 500, 0, SMALL_LINE_L * share).verdict).toBe(verdict);
  });

  it('leaves no free space in a tank filled past its safe fill line, so any batch but an empty one is over', () => {
    const fit = fitOf(SMALL, 500, SMALL_LINE_L + 50, 1);
    expect(fit).toMatchObject({ verdict: 'over', freeL: 0, batchL: 1, overL: 1, leftL: 0, percentOfFree: null });
    expect(fitOf(SMALL, 500, SMALL_LINE_L + 50, 0).verdict).toBe('fits');
  });

  it('cannot judge without a reading, or from a reading taken after the brew started', () => {
    expect(batchFit({ geometry: SMALL, safeFillLevelMm: 500, latest: null, startedAt: START, batchL: 10 })).toEqual({ verdict: 'unknown', reason: 'no-reading', batchL: 10 });
    expect(batchFit({ geometry: SMALL, safeFillLevelMm: 500, latest: { grossL: 0, takenAt: '2026-05-04T09:00:00.000Z' }, startedAt: START, batchL: 10 })).toEqual({ verdict: 'unknown', reason: 'reading-after-start', batchL: 10 });
  });

  it('throws a RangeError naming batchL for a negative batch', () => {
    expect(() => fitOf(SMALL, 500, 0, -1)).toThrow(/batchL/);
  });
});

describe('batchOverText', () => {
  it('names the batch, the litres over, what the tank holds and its free space', () => {
    const fit = fitOf(SMALL, 500, 300, 100);
    if (fit.verdict !== 'over') throw new Error(`expected over, got ${fit.verdict}`);
    // 392.699 − 300 = 92.699 L free; 100 − 92.699 = 7.301 L over.
    expect(batchOverText(fit)).toBe("the batch of 100 L is 7.3 L more than the tank's free space: it holds 300 L and 392.7 L reaches its safe fill line, leaving 92.7 L");
  });
});

describe('batchVolumeL', () => {
  it('adds inputs counted by volume to the water ([SI] 1 ml = 10⁻³ L) and leaves weights out', () => {
    expect(batchVolumeL(100, [{ quantity: 500, unit: 'ml' }, { quantity: 2, unit: 'L' }, { quantity: 3, unit: 'kg' }, { quantity: 1, unit: ' Litres ' }])).toBeCloseTo(103.5, 12);
    expect(litresPerInputUnit('ML')).toBe(0.001);
    expect(litresPerInputUnit('bag')).toBeNull();
  });

  it('throws a RangeError naming the line of a negative quantity', () => {
    expect(() => batchVolumeL(10, [{ quantity: 1, unit: 'L' }, { quantity: -2, unit: 'L' }])).toThrow(/inputs\.1\.quantity/);
  });
});

describe('inputShortfalls', () => {
  const onHand = new Map([
    [1, 4],
    [2, 10],
    [3, -1],
  ]);

  it('adds up the lines of one input and gives the amount missing (hand arithmetic)', () => {
    const short = inputShortfalls([{ inputId: 1, quantity: 3 }, { inputId: 2, quantity: 10 }, { inputId: 1, quantity: 2.5 }], onHand);
    expect(short).toEqual([{ inputId: 1, lines: [0, 2], wanted: 5.5, onHand: 4, missing: 1.5 }]);
  });

  it('counts stock below zero as none on hand and skips inputs it does not know', () => {
    expect(inputShortfalls([{ inputId: 3, quantity: 2 }, { inputId: 9, quantity: 100 }], onHand)).toEqual([{ inputId: 3, lines: [0], wanted: 2, onHand: 0, missing: 2 }]);
  });

  it('finds nothing short when every line is covered, to the last unit', () => {
    expect(inputShortfalls([{ inputId: 2, quantity: 10 }, { inputId: 1, quantity: 4 }], onHand)).toEqual([]);
  });
});
