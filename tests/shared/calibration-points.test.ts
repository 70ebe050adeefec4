// Fill-and-mark tanks: monotone interpolation through measured marks, and the checks on the marks.
// No published worked example of a fill-and-mark calibration was found, so the interpolant is
// checked by its defining properties (passes through every mark, never falls, never overshoots)
// and against shapes whose true curve is known.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  capacityL,
  heightMm,
  levelAtVolume,
  validateGeometry,
  volumeAtLevel,
  type CalibrationPoint,
  type TankGeometry,
} from '@shared/calibration/index';

const marks: CalibrationPoint[] = [
  { levelMm: 60, volumeL: 25 },
  { levelMm: 180, volumeL: 100 },
  { levelMm: 310, volumeL: 200 },
  { levelMm: 420, volumeL: 300 },
  { levelMm: 700, volumeL: 600 },
  { levelMm: 720, volumeL: 900 }, // a sharp bend: a wide shoulder poured full
  { levelMm: 1100, volumeL: 950 },
];
const tank: TankGeometry = { shape: 'points', points: marks };

describe('fill-and-mark volumeAtLevel', () => {
  it.each(marks)('passes through the mark at $levelMm mm ($volumeL L)', ({ levelMm, volumeL }) => {
    expect(volumeAtLevel(tank, levelMm)).toBe(volumeL);
  });

  it('takes 0 L at level 0 when the first mark is above 0 (documented rule: {0 mm, 0 L} is implied)', () => {
    expect(volumeAtLevel(tank, 0)).toBe(0);
    const v = volumeAtLevel(tank, 30);
    expect(v).toBeGreaterThan(0);
    expect(v).toBeLessThan(25);
  });

  it('keeps a volume given at level 0 (a sump below the lowest mark)', () => {
    const sump: TankGeometry = { shape: 'points', points: [{ levelMm: 0, volumeL: 40 }, ...marks.slice(1)] };
    expect(volumeAtLevel(sump, 0)).toBe(40);
    expect(() => levelAtVolume(sump, 10)).toThrow('Volume 10 L is below the 40 L the tank holds at level 0 mm');
  });

  it('never falls and never overshoots a mark between marks, even across a sharp bend', () => {
    const pts = [{ levelMm: 0, volumeL: 0 }, ...marks];
    let previous = 0;
    for (let h = 0; h <= 1100; h += 0.25) {
      const v = volumeAtLevel(tank, h);
      expect(v).toBeGreaterThanOrEqual(previous);
      const i = pts.findIndex((p) => p.levelMm >= h);
      if (i > 0) {
        expect(v).toBeGreaterThanOrEqual(pts[i - 1].volumeL);
        expect(v).toBeLessThanOrEqual(pts[i].volumeL);
      }
      previous = v;
    }
  });

  it('reproduces straight-line marks exactly (hand derivation: Steffen slopes of collinear data equal the common secant)', () => {
    const line: TankGeometry = {
      shape: 'points',
      points: [100, 250, 400, 800, 1000].map((levelMm) => ({ levelMm, volumeL: 0.75 * levelMm })),
    };
    for (const h of [0, 37, 100, 333.3, 640, 999]) expect(volumeAtLevel(line, h)).toBeCloseTo(0.75 * h, 9);
  });

  it('follows a horizontal cylinder marked every 100 mm to within 0.5 % of capacity (accuracy check against the closed form)', () => {
    const drum: TankGeometry = { shape: 'horizontal-cylinder', diameterMm: 1200, lengthMm: 2000, ends: 'flat' };
    const marked: TankGeometry = {
      shape: 'points',
      points: Array.from({ length: 12 }, (_, k) => ({ levelMm: 100 * (k + 1), volumeL: volumeAtLevel(drum, 100 * (k + 1)) })),
    };
    for (let h = 0; h <= 1200; h += 5) {
      expect(Math.abs(volumeAtLevel(marked, h) - volumeAtLevel(drum, h))).toBeLessThanOrEqual(0.005 * capacityL(drum));
    }
  });

  it('takes the last mark as the top and its volume as the capacity', () => {
    expect(heightMm(tank)).toBe(1100);
    expect(capacityL(tank)).toBe(950);
    expect(() => volumeAtLevel(tank, 1101)).toThrow('Level 1,101 mm is above the top of the tank (1,100 mm)');
  });

  it('passes through every mark and never falls for random marks', () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ dl: fc.double({ min: 0.1, max: 800, noNaN: true }), dv: fc.double({ min: 0.001, max: 3000, noNaN: true }) }), {
          minLength: 1,
          maxLength: 40,
        }),
        (steps) => {
          let level = 0;
          let volume = 0;
          const points = steps.map(({ dl, dv }) => ({ levelMm: (level += dl), volumeL: (volume += dv) }));
          const g: TankGeometry = { shape: 'points', points };
          expect(points.filter((p) => volumeAtLevel(g, p.levelMm) !== p.volumeL)).toEqual([]);
          const curve = Array.from({ length: 401 }, (_, k) => volumeAtLevel(g, (level * k) / 400));
          expect(curve.findIndex((v, k) => k > 0 && v < curve[k - 1])).toBe(-1);
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe('fill-and-mark levelAtVolume', () => {
  it.each(marks)('returns the marked level $levelMm mm for its volume $volumeL L', ({ levelMm, volumeL }) => {
    expect(levelAtVolume(tank, volumeL)).toBe(levelMm);
  });

  it('inverts volumes between marks to 1e-6 mm', () => {
    for (let v = 0; v <= 950; v += 7.3) {
      expect(volumeAtLevel(tank, levelAtVolume(tank, v))).toBeCloseTo(v, 6);
    }
  });
});

describe('fill-and-mark validation', () => {
  const check = (points: unknown) => validateGeometry({ shape: 'points', points });

  it('names the point whose level does not rise (points.3)', () => {
    const r = check([
      { levelMm: 0, volumeL: 0 },
      { levelMm: 200, volumeL: 150 },
      { levelMm: 420, volumeL: 320 },
      { levelMm: 400, volumeL: 400 },
    ]);
    expect(r).toMatchObject({ ok: false, field: 'points.3', message: "points.3: level 400 mm is not above the previous point's 420 mm" });
  });

  it('names the point whose level repeats', () => {
    const r = check([
      { levelMm: 100, volumeL: 50 },
      { levelMm: 100, volumeL: 60 },
    ]);
    expect(r).toMatchObject({ ok: false, message: "points.1: level 100 mm is not above the previous point's 100 mm" });
  });

  it('names the point whose volume does not rise', () => {
    const r = check([
      { levelMm: 100, volumeL: 50 },
      { levelMm: 250, volumeL: 120.5 },
      { levelMm: 300, volumeL: 120.5 },
    ]);
    expect(r).toMatchObject({ ok: false, field: 'points.2', message: "points.2: volume 120.5 L is not above the previous point's 120.5 L" });
  });

  it('lists every bad point, not only the first', () => {
    const r = check([
      { levelMm: 100, volumeL: 50 },
      { levelMm: 90, volumeL: 60 },
      { levelMm: 300, volumeL: 10 },
    ]);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.issues.map((i) => i.field)).toEqual(['points.1', 'points.2']);
  });

  it('refuses a first mark above level 0 with no volume, since 0 L is already implied at level 0', () => {
    expect(check([{ levelMm: 50, volumeL: 0 }, { levelMm: 300, volumeL: 90 }])).toMatchObject({ ok: false, field: 'points.0' });
  });

  it('refuses a list with no mark above level 0', () => {
    expect(check([{ levelMm: 0, volumeL: 10 }])).toMatchObject({ ok: false, message: 'points: must include a point above level 0 mm' });
  });

  it.each<[string, unknown, string]>([
    ['an empty list', [], 'points: must list at least 1 point'],
    ['no list', undefined, 'points: is required'],
    ['not a list', 'lots', 'points: must be a list of { levelMm, volumeL } points'],
    ['a negative level', [{ levelMm: -5, volumeL: 1 }], 'points.0.levelMm: must be 0 or more'],
    ['a level above 30 m', [{ levelMm: 30_001, volumeL: 1 }], 'points.0.levelMm: must be at most 30,000 mm (30 m)'],
    ['a volume that is not a number', [{ levelMm: 5, volumeL: Number.NaN }], 'points.0.volumeL: must be a finite number'],
    ['a point that is not an object', [7], 'points.0: must be an object with levelMm and volumeL'],
    ['too many points', Array.from({ length: 501 }, (_, i) => ({ levelMm: i + 1, volumeL: i + 1 })), 'points: must list at most 500 points'],
  ])('refuses %s with a message naming the field', (_label, points, message) => {
    expect(check(points)).toMatchObject({ ok: false, message });
  });

  it('accepts rising marks and returns them unchanged', () => {
    expect(check(marks)).toEqual({ ok: true, geometry: { shape: 'points', points: marks } });
  });
});
