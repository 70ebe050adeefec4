// Calibration tables: layout of the rows, linear lookup between them, and the error of a 1 mm and a
// 10 mm table against the closed form.
//
// Stated bound (hand derivation). Between rows a and b the table is the chord of V(h). The slope of
// V is the liquid surface area A(h); if A stays within [Amin, Amax] on [a, b], the chord is never
// more than (b − a)(Amax − Amin)/4 from the curve. A changes fastest next to a flat end (floor or
// top) or the cone's rim, which gives, for a table step s:
//   vertical cylinder, box                 0 (V is linear: the table is exact)
//   horizontal cylinder, length L          (L/2)·√(2R)·s^1.5 + k·π·R·s²/2
//                                          (k = 0 flat, 1 hemispherical, 1/2 for 2:1 heads)
//   sphere                                 π·R·s²/2
//   cone bottom                            π·R²·s²/(2·Hc)
import { describe, expect, it } from 'vitest';
import {
  MAX_TABLE_ROWS,
  buildCalibrationTable,
  capacityL,
  heightMm,
  lookupVolume,
  volumeAtLevel,
  type CalibrationRow,
  type TankGeometry,
} from '@shared/calibration/index';

/** Largest |table lookup − closed form| in litres, sampled at `perRow` points inside every row interval. */
function maxTableErrorL(g: TankGeometry, table: CalibrationRow[], perRow: number): number {
  let worst = 0;
  for (let i = 0; i < table.length - 1; i++) {
    const a = table[i].levelMm;
    const b = table[i + 1].levelMm;
    for (let k = 1; k < perRow; k++) {
      const h = a + ((b - a) * k) / perRow;
      worst = Math.max(worst, Math.abs(lookupVolume(table, h) - volumeAtLevel(g, h)));
    }
  }
  return worst;
}

// 2,000 L tanks. Vertical: D 1,200 mm, so H = 2e9 mm³ / (π · 600²).
const R = 600;
const shellForL = (litres: number, headsMm3: number) => (litres * 1e6 - headsMm3) / (Math.PI * R * R);
const upright: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 2 * R, heightMm: shellForL(2000, 0) };
const lying = (ends: 'flat' | 'hemispherical' | 'ellipsoidal-2to1'): TankGeometry => {
  const k = ends === 'hemispherical' ? 1 : ends === 'ellipsoidal-2to1' ? 0.5 : 0;
  return { shape: 'horizontal-cylinder', diameterMm: 2 * R, lengthMm: shellForL(2000, k * (4 / 3) * Math.PI * R ** 3), ends };
};
const horizontalBoundL = (g: TankGeometry & { shape: 'horizontal-cylinder' }, s: number) => {
  const r = g.diameterMm / 2;
  const k = g.ends === 'hemispherical' ? 1 : g.ends === 'ellipsoidal-2to1' ? 0.5 : 0;
  return ((g.lengthMm / 2) * Math.sqrt(2 * r) * s ** 1.5 + (k * Math.PI * r * s * s) / 2) / 1e6;
};

describe('buildCalibrationTable', () => {
  it('puts the last row at the top when the step does not divide the height', () => {
    const table = buildCalibrationTable({ shape: 'box', lengthMm: 1200, widthMm: 1000, heightMm: 1005 }, 10);
    expect(table.length).toBe(102);
    expect(table.at(-2)).toEqual({ levelMm: 1000, volumeL: 1200 });
    expect(table.at(-1)).toEqual({ levelMm: 1005, volumeL: 1206 });
  });

  it('adds no sliver row when the step divides the height', () => {
    const table = buildCalibrationTable({ shape: 'box', lengthMm: 1000, widthMm: 1000, heightMm: 1000 }, 0.1);
    expect(table.length).toBe(10_001);
    expect(table[3].levelMm).toBe(0.3);
    expect(table.at(-1)?.levelMm).toBe(1000);
  });

  it('starts at level 0 with the volume the points give there when a fill-and-mark tank has one', () => {
    const table = buildCalibrationTable({ shape: 'points', points: [{ levelMm: 0, volumeL: 12 }, { levelMm: 500, volumeL: 400 }] }, 100);
    expect(table[0]).toEqual({ levelMm: 0, volumeL: 12 });
    expect(table.at(-1)).toEqual({ levelMm: 500, volumeL: 400 });
  });

  it.each([0, -1, Number.NaN, Number.POSITIVE_INFINITY])('throws a RangeError naming stepMm when the step is %s', (step) => {
    expect(() => buildCalibrationTable(upright, step)).toThrow(/^stepMm: must be a number greater than 0/);
  });

  it('throws a RangeError with the smallest usable step when the table would be too long', () => {
    const tall: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 3000 };
    expect(() => buildCalibrationTable(tall, 0.001)).toThrow(
      'stepMm: 0.001 mm would make 3,000,001 rows for this 3,000 mm tank; use at least 0.03 mm',
    );
    expect(buildCalibrationTable(tall, 0.03)).toHaveLength(MAX_TABLE_ROWS);
  });

  it('throws a RangeError naming the field when the geometry is invalid', () => {
    expect(() => buildCalibrationTable({ shape: 'box', lengthMm: 1000, widthMm: 0, heightMm: 900 }, 10)).toThrow(
      'Invalid tank geometry: widthMm: must be greater than 0',
    );
  });
});

describe('lookupVolume', () => {
  const table: CalibrationRow[] = [
    { levelMm: 0, volumeL: 0 },
    { levelMm: 100, volumeL: 40 },
    { levelMm: 250, volumeL: 130 },
    { levelMm: 300, volumeL: 170 },
  ];

  it('returns the row volume exactly at a row', () => {
    expect(lookupVolume(table, 100)).toBe(40);
    expect(lookupVolume(table, 300)).toBe(170);
  });

  it('interpolates linearly between rows of an uneven table (hand derivation: 40 + (175 − 100)/150 · 90 = 85)', () => {
    expect(lookupVolume(table, 175)).toBeCloseTo(85, 12);
    expect(lookupVolume(table, 275)).toBeCloseTo(150, 12);
  });

  it('throws a RangeError when the level is outside the table', () => {
    expect(() => lookupVolume(table, 300.5)).toThrow('Level 300.5 mm is outside the table (0–300 mm)');
    expect(() => lookupVolume(table, -1)).toThrow(RangeError);
    expect(() => lookupVolume(table, Number.NaN)).toThrow(RangeError);
  });

  it('throws a RangeError when the table is empty', () => {
    expect(() => lookupVolume([], 0)).toThrow('The calibration table has no rows');
  });

  it('returns the only row of a one-row table at its level', () => {
    expect(lookupVolume([{ levelMm: 0, volumeL: 5 }], 0)).toBe(5);
  });
});

describe('calibration table error against the closed form', () => {
  it('is exact for a 2,000 L vertical cylinder at 10 mm and 1 mm (bound 0: V is linear in h)', () => {
    expect(capacityL(upright)).toBeCloseTo(2000, 9);
    for (const step of [10, 1]) {
      expect(maxTableErrorL(upright, buildCalibrationTable(upright, step), 7)).toBeLessThanOrEqual(1e-9);
    }
  });

  it.each(['flat', 'hemispherical', 'ellipsoidal-2to1'] as const)(
    'stays within the stated bound and ±0.2 %% of capacity for a 2,000 L horizontal cylinder with %s ends',
    (ends) => {
      const g = lying(ends) as TankGeometry & { shape: 'horizontal-cylinder' };
      expect(capacityL(g)).toBeCloseTo(2000, 9);
      for (const step of [10, 1]) {
        const bound = horizontalBoundL(g, step);
        const err = maxTableErrorL(g, buildCalibrationTable(g, step), step === 10 ? 40 : 8);
        expect(err).toBeLessThanOrEqual(bound);
        // The bound is of the right size, not merely safe: the worst error is at least a quarter of it.
        expect(err).toBeGreaterThanOrEqual(bound / 4);
      }
      // 10 mm: bound ≈ 0.97 L for flat ends, 0.048 % of 2,000 L.
      expect(horizontalBoundL(g, 10)).toBeLessThanOrEqual(0.002 * 2000);
      expect(maxTableErrorL(g, buildCalibrationTable(g, 10), 40)).toBeLessThanOrEqual(0.002 * capacityL(g));
    },
  );

  it('gives about 0.97 L at 10 mm and 0.031 L at 1 mm for the flat-ended 2,000 L tank (stated bound, hand arithmetic)', () => {
    const g = lying('flat') as TankGeometry & { shape: 'horizontal-cylinder' };
    expect(horizontalBoundL(g, 10)).toBeCloseTo(0.9686, 3);
    expect(horizontalBoundL(g, 1)).toBeCloseTo(0.0306, 3);
  });

  it('stays within π·R·s²/2 for a 2,000 L sphere at 10 mm and 1 mm', () => {
    const r = Math.cbrt((3 * 2e9) / (4 * Math.PI));
    const g: TankGeometry = { shape: 'sphere', diameterMm: 2 * r };
    for (const step of [10, 1]) {
      const err = maxTableErrorL(g, buildCalibrationTable(g, step), step === 10 ? 20 : 6);
      expect(err).toBeLessThanOrEqual((Math.PI * r * step * step) / 2 / 1e6);
    }
  });

  it('stays within π·R²·s²/(2·Hc) for a 2,000 L cone-bottom tank at 10 mm and 1 mm', () => {
    const g: TankGeometry = { shape: 'cone-bottom', diameterMm: 1200, straightHeightMm: 1568.388, coneHeightMm: 600 };
    expect(capacityL(g)).toBeCloseTo(2000, 2);
    for (const step of [10, 1]) {
      const err = maxTableErrorL(g, buildCalibrationTable(g, step), step === 10 ? 20 : 6);
      expect(err).toBeLessThanOrEqual((Math.PI * R * R * step * step) / (2 * 600) / 1e6);
      expect(err).toBeLessThanOrEqual(0.002 * capacityL(g));
    }
    expect(heightMm(g)).toBeCloseTo(2168.388, 9);
  });
});
