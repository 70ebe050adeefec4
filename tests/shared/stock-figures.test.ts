// The figures every screen shows for a tank's stock: usable litres first, litres in the tank second,
// and a percentage of the usable capacity (outlet to safe fill line).
import { describe, expect, it } from 'vitest';
import type { TankGeometry } from '@shared/calibration/index';
import { readingToVolumes, stockFigures, usableCapacityL } from '@shared/readings/index';

const M3 = 1000;

describe('usableCapacityL', () => {
  // gravel-calculator.com, "Vertical Cylinder Tank Volume Calculator", Example 1 and Example 2: radius 5 m,
  // height 10 m holds ≈ 785.4 m³ full and ≈ 314.16 m³ filled to 4 m. With the outlet at 4 m and the
  // safe fill line at the brim, the room between them is the difference: 785.4 − 314.16 = 471.24 m³.
  const g: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 10_000, heightMm: 10_000 };

  it('is the volume between the outlet and the safe fill line (gravel-calculator.com, Vertical Cylinder Tank, Examples 1 and 2: 785.4 − 314.16 m³)', () => {
    expect(Math.abs(usableCapacityL(g, { outletHeightMm: 4000, safeFillLevelMm: 10_000 }) - 471.24 * M3)).toBeLessThan(0.05 * M3);
  });

  it('is the whole capacity for an outlet at the floor and the fill line at the brim (same source, Example 1: 785.4 m³)', () => {
    expect(Math.abs(usableCapacityL(g, { outletHeightMm: 0, safeFillLevelMm: 10_000 }) - 785.4 * M3)).toBeLessThan(0.05 * M3);
  });

  it('is 0 when the safe fill line is not above the outlet', () => {
    expect(usableCapacityL(g, { outletHeightMm: 5000, safeFillLevelMm: 4000 })).toBe(0);
  });
});

describe('stockFigures', () => {
  const g: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 10_000, heightMm: 10_000 };
  const levels = { outletHeightMm: 4000, safeFillLevelMm: 10_000 };

  it('gives usable litres as the main figure and its share of the usable capacity, not of the brim-full tank', () => {
    // Level 7 m: 3 m above the outlet of the 6 m between outlet and fill line, so exactly half of the usable
    // capacity (an upright cylinder holds the same litres per metre at every height), whereas 7 m is 70 % of the brim.
    const v = readingToVolumes({ geometry: g, datumOffsetMm: 0, specificGravity: 1, ...levels }, { kind: 'level', levelMm: 7000 });
    if (!v.ok) throw new Error(v.reason);
    const f = stockFigures(v, usableCapacityL(g, levels));
    expect(f.usableL).toBeCloseTo(v.usableL, 9);
    expect(f.totalL).toBeCloseTo(v.grossL, 9);
    expect(f.percentOfUsableCapacity).toBeCloseTo(50, 9);
    expect(v.percentFull).toBeCloseTo(70, 9);
  });

  it('reads 27,157 L usable of a 52,203 L usable capacity as 52 %, whatever lies under the outlet', () => {
    const f = stockFigures({ grossL: 29_900, usableL: 27_157 }, 52_203);
    expect(Math.round(f.percentOfUsableCapacity!)).toBe(52);
    expect(f).toMatchObject({ usableL: 27_157, totalL: 29_900, usableCapacityL: 52_203 });
  });

  it('goes over 100 % past the safe fill line and has no percentage without a usable capacity', () => {
    expect(stockFigures({ grossL: 1100, usableL: 1050 }, 1000).percentOfUsableCapacity).toBeCloseTo(105, 9);
    expect(stockFigures({ grossL: 10, usableL: 0 }, 0).percentOfUsableCapacity).toBeNull();
  });
});
