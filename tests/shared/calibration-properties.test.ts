// Properties of the calibration engine on random geometries of every shape (fast-check), and the
// closed forms checked against an independent numerical integration of the liquid surface area.
//
// No published worked example covers a cone-bottom or frustum tank filled part-way up, a 2:1
// ellipsoidal head filled part-way, or arbitrary sizes of any shape, so those are checked here
// against numeric.dopri (the `numeric` package's Dormand–Prince integrator) driven over the
// cross-section area A(y). The areas below are written from each solid's plane section, not
// from the engine's volume formulas, so the check is independent of them.
import { createRequire } from 'node:module';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  buildCalibrationTable,
  capacityL,
  heightMm,
  levelAtVolume,
  lookupVolume,
  volumeAtLevel,
  type TankGeometry,
} from '@shared/calibration/index';

interface Dopri {
  y: number[][];
}
interface NumericLib {
  dopri(x0: number, x1: number, y0: number[], f: (x: number, y: number[]) => number[], tol?: number, maxit?: number): Dopri;
}
// `numeric` ships no type declarations; require() keeps it out of the type checker's way.
const numeric = createRequire(import.meta.url)('numeric') as NumericLib;

/** Area in mm² of the liquid surface at height y mm: the tank's horizontal plane section. */
function sectionAreaMm2(g: TankGeometry, y: number): number {
  switch (g.shape) {
    case 'vertical-cylinder':
      return (Math.PI * g.diameterMm ** 2) / 4;
    case 'box':
      return g.lengthMm * g.widthMm;
    case 'cone-bottom': {
      // A cone's section at height y above its apex is a disc of radius R·y/Hc.
      const r = g.diameterMm / 2;
      const rr = y < g.coneHeightMm ? (r * y) / g.coneHeightMm : r;
      return Math.PI * rr * rr;
    }
    case 'frustum': {
      const r = g.bottomDiameterMm / 2 + ((g.topDiameterMm - g.bottomDiameterMm) / 2) * (y / g.heightMm);
      return Math.PI * r * r;
    }
    case 'sphere': {
      // Disc of radius √(y(D − y)) by Pythagoras on the sphere's radius.
      return Math.PI * Math.max(0, y * (g.diameterMm - y));
    }
    case 'horizontal-cylinder': {
      const q = Math.max(0, y * (g.diameterMm - y));
      // Shell: a rectangle, chord 2√(y(D − y)) wide, L long. Two hemispheres: a sphere's disc π q.
      // Two 2:1 heads: an ellipsoid with semi-axes R, R and R/2 whose section is an ellipse with
      // semi-axes √q and √q/2, area π q / 2.
      const heads = g.ends === 'hemispherical' ? Math.PI * q : g.ends === 'ellipsoidal-2to1' ? (Math.PI * q) / 2 : 0;
      return 2 * g.lengthMm * Math.sqrt(q) + heads;
    }
    case 'points':
      throw new Error('no plane section for a fill-and-mark tank');
  }
}

/** Largest section area in mm² over the height (the section peaks mid-height for sphere and horizontal). */
function maxSectionMm2(g: TankGeometry): number {
  const h = heightMm(g);
  return Math.max(sectionAreaMm2(g, 0), sectionAreaMm2(g, h), sectionAreaMm2(g, h / 2));
}

/** Volume in litres up to level h by integrating the section area with numeric.dopri, scaled to [0, 1]. */
function integratedVolumeL(g: TankGeometry, h: number): number {
  const top = heightMm(g);
  const aMax = maxSectionMm2(g);
  // The cone's section has a corner where the cone meets the shell; integrating across a corner costs
  // the integrator accuracy, so each smooth piece is integrated on its own.
  const breaks = g.shape === 'cone-bottom' && g.coneHeightMm < h ? [0, g.coneHeightMm, h] : [0, h];
  let total = 0;
  for (let i = 1; i < breaks.length; i++) {
    const u0 = breaks[i - 1] / top;
    const u1 = breaks[i] / top;
    // Below 1e-9 of the height the integrator's step control breaks down; the volume there is
    // below every tolerance used here.
    if (u1 - u0 < 1e-9) continue;
    const sol = numeric.dopri(u0, u1, [0], (u) => [sectionAreaMm2(g, u * top) / aMax], 1e-12, 1_000_000);
    total += sol.y[sol.y.length - 1][0];
  }
  return (total * top * aMax) / 1e6;
}

const size = (min = 1) => fc.double({ min, max: 30_000, noNaN: true });

const closedShapes: fc.Arbitrary<TankGeometry> = fc.oneof(
  fc.record({ shape: fc.constant('vertical-cylinder' as const), diameterMm: size(), heightMm: size() }),
  fc.record({ shape: fc.constant('cone-bottom' as const), diameterMm: size(), straightHeightMm: size(), coneHeightMm: size() }),
  fc.record({
    shape: fc.constant('horizontal-cylinder' as const),
    diameterMm: size(),
    lengthMm: size(),
    ends: fc.constantFrom('flat' as const, 'hemispherical' as const, 'ellipsoidal-2to1' as const),
  }),
  fc.record({ shape: fc.constant('box' as const), lengthMm: size(), widthMm: size(), heightMm: size() }),
  fc.record({ shape: fc.constant('frustum' as const), bottomDiameterMm: size(), topDiameterMm: size(), heightMm: size() }),
  fc.record({ shape: fc.constant('sphere' as const), diameterMm: size() }),
);

/** Random fill-and-mark marks: strictly rising, sometimes starting at level 0 with a volume there. */
const pointsShape: fc.Arbitrary<TankGeometry> = fc
  .record({
    startAtZero: fc.boolean(),
    volumeAtZero: fc.double({ min: 0, max: 200, noNaN: true }),
    steps: fc.array(
      fc.record({ dl: fc.double({ min: 0.5, max: 1500, noNaN: true }), dv: fc.double({ min: 0.01, max: 4000, noNaN: true }) }),
      { minLength: 1, maxLength: 25 },
    ),
  })
  .map(({ startAtZero, volumeAtZero, steps }) => {
    const points = startAtZero ? [{ levelMm: 0, volumeL: volumeAtZero }] : [];
    let level = 0;
    let volume = startAtZero ? volumeAtZero : 0;
    for (const { dl, dv } of steps) {
      level += dl;
      volume += dv;
      points.push({ levelMm: level, volumeL: volume });
    }
    return { shape: 'points' as const, points };
  });

const anyShape = fc.oneof(closedShapes, pointsShape);
const fraction = fc.double({ min: 0, max: 1, noNaN: true });

describe('volumeAtLevel on random tanks', () => {
  it('never falls as the level rises, for every shape', () => {
    fc.assert(
      fc.property(anyShape, fc.array(fraction, { minLength: 2, maxLength: 40 }), (g, fs) => {
        const top = heightMm(g);
        const cap = capacityL(g);
        const levels = fs.map((f) => f * top).sort((a, b) => a - b);
        for (let i = 1; i < levels.length; i++) {
          expect(volumeAtLevel(g, levels[i])).toBeGreaterThanOrEqual(volumeAtLevel(g, levels[i - 1]) - 1e-12 * cap);
        }
      }),
      { numRuns: 400 },
    );
  });

  it('is 0 at level 0 and the capacity at the top, for every closed shape', () => {
    fc.assert(
      fc.property(closedShapes, (g) => {
        expect(volumeAtLevel(g, 0)).toBe(0);
        expect(volumeAtLevel(g, heightMm(g))).toBe(capacityL(g));
        expect(capacityL(g)).toBeGreaterThan(0);
      }),
      { numRuns: 400 },
    );
  });

  it('agrees with numerical integration of the section area to 1e-8 of H·Amax, for every closed shape', () => {
    fc.assert(
      fc.property(closedShapes, fraction, (g, f) => {
        const h = f * heightMm(g);
        const scaleL = (heightMm(g) * maxSectionMm2(g)) / 1e6;
        expect(Math.abs(volumeAtLevel(g, h) - integratedVolumeL(g, h))).toBeLessThanOrEqual(1e-8 * scaleL);
      }),
      { numRuns: 300 },
    );
  });

  it.each<[string, TankGeometry]>([
    ['cone bottom, level inside the cone', { shape: 'cone-bottom', diameterMm: 1100, straightHeightMm: 900, coneHeightMm: 450 }],
    ['frustum wider at the top', { shape: 'frustum', bottomDiameterMm: 700, topDiameterMm: 1300, heightMm: 1200 }],
    ['frustum wider at the bottom', { shape: 'frustum', bottomDiameterMm: 1300, topDiameterMm: 700, heightMm: 1200 }],
    ['horizontal cylinder with 2:1 heads', { shape: 'horizontal-cylinder', diameterMm: 1250, lengthMm: 2400, ends: 'ellipsoidal-2to1' }],
  ])('matches numerical integration at every 50 mm of a %s (no published partial-fill example found)', (_label, g) => {
    for (let h = 0; h <= heightMm(g); h += 50) {
      expect(Math.abs(volumeAtLevel(g, h) - integratedVolumeL(g, h))).toBeLessThanOrEqual(1e-9 * capacityL(g));
    }
  });
});

describe('levelAtVolume on random tanks', () => {
  it('returns the level a volume came from, for every shape', () => {
    fc.assert(
      fc.property(anyShape, fraction, (g, f) => {
        const h = f * heightMm(g);
        const v = volumeAtLevel(g, h);
        const back = levelAtVolume(g, v);
        // Within 1e-6 mm, unless the curve is so flat there (a sphere near its top, say) that the two
        // levels hold the same volume to double precision; then both are right answers.
        const sameVolume = Math.abs(volumeAtLevel(g, back) - v) <= 1e-12 * capacityL(g);
        expect(Math.abs(back - h) <= 1e-6 || sameVolume, `level ${h} → ${v} L → ${back}`).toBe(true);
      }),
      { numRuns: 2000 },
    );
  });

  it('returns a level holding the volume asked for, for every shape', () => {
    fc.assert(
      fc.property(anyShape, fraction, (g, f) => {
        const cap = capacityL(g);
        const v0 = volumeAtLevel(g, 0);
        const v = v0 + f * (cap - v0);
        expect(Math.abs(volumeAtLevel(g, levelAtVolume(g, v)) - v)).toBeLessThanOrEqual(1e-9 * cap);
      }),
      { numRuns: 2000 },
    );
  });
});

describe('buildCalibrationTable on random tanks', () => {
  it('runs from 0 to the top with rows on the step and the closed-form volume in each row', () => {
    fc.assert(
      fc.property(anyShape, fc.double({ min: 0.5, max: 250, noNaN: true }), (g, step) => {
        const top = heightMm(g);
        fc.pre(top / step < 50_000);
        const table = buildCalibrationTable(g, step);
        expect(table[0].levelMm).toBe(0);
        expect(table[table.length - 1].levelMm).toBe(top);
        expect(top - table[table.length - 2].levelMm).toBeLessThanOrEqual(step + 1e-9);
        // One expect per table, not per row: a 30,000-row table would otherwise dominate the run time.
        const offStep = table.slice(1, -1).filter((row, i) => Math.abs(row.levelMm - (i + 1) * step) > 1e-6);
        const offCurve = table.filter((row) => row.volumeL !== volumeAtLevel(g, row.levelMm));
        expect(offStep).toEqual([]);
        expect(offCurve).toEqual([]);
      }),
      { numRuns: 150 },
    );
  });

  // Stated bound: on a row interval [a, b] the cross-section area A (the slope of V) stays within
  // [Amin, Amax], and a chord of a curve whose slope stays in that band is never more than
  // (b − a)(Amax − Amin)/4 away from it. A is monotone between rows except where a sphere or a
  // horizontal cylinder is widest, at mid-height, so Amax/Amin come from the two ends and that peak.
  it('keeps every lookup within (b − a)·(Amax − Amin)/4 of the closed form, for every closed shape', () => {
    fc.assert(
      fc.property(closedShapes, fc.constantFrom(1, 10, 25), fc.array(fraction, { minLength: 20, maxLength: 20 }), (g, step, fs) => {
        const top = heightMm(g);
        fc.pre(top / step < 50_000);
        const table = buildCalibrationTable(g, step);
        for (const f of fs) {
          const h = f * top;
          const v = lookupVolume(table, h);
          const i = Math.min(table.length - 2, Math.floor(h / step));
          const a = table[i].levelMm;
          const b = table[i + 1].levelMm;
          const ends = [sectionAreaMm2(g, a), sectionAreaMm2(g, b)];
          const peak = a < top / 2 && top / 2 < b ? [sectionAreaMm2(g, top / 2)] : [];
          const spread = Math.max(...ends, ...peak) - Math.min(...ends);
          const boundL = ((b - a) * spread) / 4 / 1e6;
          expect(Math.abs(v - volumeAtLevel(g, h))).toBeLessThanOrEqual(boundL + 1e-9 * capacityL(g));
        }
      }),
      { numRuns: 300 },
    );
  });
});
