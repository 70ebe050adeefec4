// Readings → level → volumes. Pressure head uses ρ = SG × 1000 kg/m³ and g = 9.80665 m/s², the basis
// of the conventional metre of water (1 mH₂O = 9.80665 kPa, NIST SP 811 Appendix B.8; recalled from
// memory, not re-checked). Other expected values are hand derivations: the upright tank from V = π r² h,
// the horizontal one from the circular segment (tests/support/hand-tanks.ts gives the source).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { TankGeometry } from '@shared/calibration/index';
import {
  levelFromPressure,
  levelFromSightTube,
  levelFromUltrasonic,
  readingToVolumes,
  tankVolumes,
  type ReadingInput,
  type TankSetup,
} from '@shared/readings/index';
import { circularSegmentMm2 } from '../support/hand-tanks';

// A 1,790 mm tall upright tank, 1,000 mm across: 785.398 L per metre of level.
const upright: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1790 };
const perMmL = (Math.PI * 500 * 500) / 1e6;
const setup = (over: Partial<TankSetup> = {}): TankSetup => ({
  geometry: upright,
  datumOffsetMm: 0,
  outletHeightMm: 100,
  safeFillLevelMm: 1700,
  specificGravity: 1,
  ...over,
});

describe('levelFromSightTube', () => {
  it('adds the zero mark height above the floor to the reading', () => {
    expect(levelFromSightTube(600, 35)).toBe(635);
  });

  it('subtracts the depth of a zero mark below the floor (negative datum)', () => {
    expect(levelFromSightTube(600, -40)).toBe(560);
  });
});

describe('levelFromUltrasonic', () => {
  it('returns the sensor height less the measured distance', () => {
    expect(levelFromUltrasonic(450, 2000)).toBe(1550);
  });
});

describe('levelFromPressure', () => {
  it('gives exactly 1,000 mm for 9.80665 kPa of water at SG 1 (definition of the conventional metre of water)', () => {
    expect(levelFromPressure(9.80665, 1)).toBe(1000);
  });

  it('gives 1,000/1.2 mm for the same pressure at SG 1.2 (hand derivation: head ∝ 1/ρ)', () => {
    expect(levelFromPressure(9.80665, 1.2)).toBeCloseTo(1000 / 1.2, 9);
  });

  it('gives about 2.31 ft of water per psi (common practice rule of thumb, no published source; derived 0.703070 m)', () => {
    const psiKPa = (0.45359237 * 9.80665) / 0.0254 ** 2 / 1000;
    expect(levelFromPressure(psiKPa, 1)).toBeCloseTo(703.0696, 3);
    expect(levelFromPressure(psiKPa, 1) / 304.8).toBeCloseTo(2.31, 2);
  });

  it('adds the height of the sensor above the floor', () => {
    expect(levelFromPressure(9.80665, 1, 45)).toBe(1045);
  });
});

describe('tankVolumes', () => {
  it('splits gross into usable and ullage at the outlet and safe fill line (hand derivation for a vertical cylinder)', () => {
    const v = tankVolumes(upright, 600, { outletHeightMm: 100, safeFillLevelMm: 1700 });
    expect(v.grossL).toBeCloseTo(600 * perMmL, 9);
    expect(v.usableL).toBeCloseTo(500 * perMmL, 9);
    expect(v.ullageL).toBeCloseTo(1100 * perMmL, 9);
    expect(v.percentFull).toBeCloseTo((600 / 1790) * 100, 9);
  });

  it('gives 0 usable when the level is below the outlet', () => {
    expect(tankVolumes(upright, 60, { outletHeightMm: 100, safeFillLevelMm: 1700 }).usableL).toBe(0);
  });

  it('gives 0 ullage at the safe fill line and a negative one when overfilled past it', () => {
    expect(tankVolumes(upright, 1700, { outletHeightMm: 100, safeFillLevelMm: 1700 }).ullageL).toBe(0);
    expect(tankVolumes(upright, 1750, { outletHeightMm: 100, safeFillLevelMm: 1700 }).ullageL).toBeCloseTo(-50 * perMmL, 9);
  });

  it('uses the shape curve, not a straight line, for a horizontal tank (hand derivation from the circular segment)', () => {
    const drum: TankGeometry = { shape: 'horizontal-cylinder', diameterMm: 1200, lengthMm: 2000, ends: 'flat' };
    const v = tankVolumes(drum, 300, { outletHeightMm: 50, safeFillLevelMm: 1150 });
    // h = r/2 = 300 mm: segment = r² acos(1/2) − (r/2) √(3r²/4) = 360,000 · π/3 − 300 · √270,000 = 221,106.55 mm²; × 2 m = 442.2131 L.
    expect(v.grossL).toBeCloseTo(442.213091, 5);
    expect(v.grossL).toBeCloseTo((2000 * circularSegmentMm2(600, 300)) / 1e6, 9);
    // Below the 50 mm outlet: segment(50) × 2 m = 32.2485 L, so 409.9646 L are usable.
    expect(v.usableL).toBeCloseTo(409.964564, 5);
    expect(v.usableL).toBeCloseTo((2000 * (circularSegmentMm2(600, 300) - circularSegmentMm2(600, 50))) / 1e6, 9);
    // 442.2131 L of the 2,261.9467 L (π · 0.6² m² · 2 m) the drum holds.
    expect(v.percentFull).toBeCloseTo(19.550111, 5);
  });

  it('throws a RangeError naming the field when a level is outside the tank', () => {
    expect(() => tankVolumes(upright, 1800, { outletHeightMm: 100, safeFillLevelMm: 1700 })).toThrow(/^levelMm: 1,800 mm is outside the tank/);
    expect(() => tankVolumes(upright, 500, { outletHeightMm: 100, safeFillLevelMm: 1900 })).toThrow(/^safeFillLevelMm/);
  });
});

describe('readingToVolumes', () => {
  it('turns a sight-tube reading with a negative datum into level and volumes', () => {
    const r = readingToVolumes(setup({ datumOffsetMm: -40 }), { kind: 'sight-tube', readingMm: 640 });
    expect(r).toMatchObject({ ok: true, levelMm: 600 });
    if (r.ok) {
      expect(r.grossL).toBeCloseTo(600 * perMmL, 9);
      expect(r.usableL).toBeCloseTo(500 * perMmL, 9);
      expect(r.ullageL).toBeCloseTo(1100 * perMmL, 9);
    }
  });

  it('gives the same volumes as tankVolumes at the same level', () => {
    const r = readingToVolumes(setup({ datumOffsetMm: 35 }), { kind: 'sight-tube', readingMm: 900 });
    expect(r).toEqual({ ok: true, levelMm: 935, ...tankVolumes(upright, 935, { outletHeightMm: 100, safeFillLevelMm: 1700 }) });
  });

  it('refuses a reading above the top and says by how much', () => {
    expect(readingToVolumes(setup(), { kind: 'sight-tube', readingMm: 1830 })).toMatchObject({
      ok: false,
      reason: 'Reading 1,830 mm puts the level 40 mm above the top of the tank (1,790 mm)',
    });
  });

  it('gives the level too when the datum moves it', () => {
    expect(readingToVolumes(setup({ datumOffsetMm: 20 }), { kind: 'sight-tube', readingMm: 1800 })).toMatchObject({
      ok: false,
      reason: 'Reading 1,800 mm puts the level at 1,820 mm, 30 mm above the top of the tank (1,790 mm)',
    });
  });

  it("refuses a reading below the tube's zero mark", () => {
    expect(readingToVolumes(setup(), { kind: 'sight-tube', readingMm: -5 })).toMatchObject({
      ok: false,
      reason: "Reading -5 mm is below the tube's zero mark",
    });
  });

  it('refuses a reading that puts the level below the tank floor (zero mark below the floor)', () => {
    expect(readingToVolumes(setup({ datumOffsetMm: -60 }), { kind: 'sight-tube', readingMm: 25 })).toMatchObject({
      ok: false,
      reason: 'Reading 25 mm puts the level at -35 mm, 35 mm below the tank floor',
    });
  });

  it('accepts a level typed directly and refuses one outside the tank', () => {
    expect(readingToVolumes(setup(), { kind: 'level', levelMm: 0 })).toMatchObject({ ok: true, grossL: 0, usableL: 0 });
    expect(readingToVolumes(setup(), { kind: 'level', levelMm: 1790 })).toMatchObject({ ok: true, percentFull: 100 });
    expect(readingToVolumes(setup(), { kind: 'level', levelMm: -3 })).toMatchObject({ ok: false, reason: 'Level -3 mm is 3 mm below the tank floor' });
  });

  it('turns an ultrasonic distance into a level below the sensor', () => {
    const r = readingToVolumes(setup({ sensorHeightMm: 1900 }), { kind: 'ultrasonic', distanceMm: 700 });
    expect(r).toMatchObject({ ok: true, levelMm: 1200 });
  });

  it('refuses an ultrasonic distance longer than the sensor height, and one that needs a sensor height', () => {
    expect(readingToVolumes(setup({ sensorHeightMm: 1900 }), { kind: 'ultrasonic', distanceMm: 1950 })).toMatchObject({
      ok: false,
      reason: "Distance 1,950 mm is more than the sensor's height above the floor (1,900 mm): the level would be 50 mm below the tank floor",
    });
    expect(readingToVolumes(setup(), { kind: 'ultrasonic', distanceMm: 100 })).toMatchObject({ ok: false, reason: expect.stringMatching(/sensorHeightMm/) });
    expect(readingToVolumes(setup({ sensorHeightMm: 1900 }), { kind: 'ultrasonic', distanceMm: 50 })).toMatchObject({
      ok: false,
      reason: 'Distance 50 mm puts the level 60 mm above the top of the tank (1,790 mm)',
    });
  });

  it('turns gauge pressure into level with SG 1.0 and SG 1.2', () => {
    expect(readingToVolumes(setup(), { kind: 'pressure', pressureKPa: 9.80665 })).toMatchObject({ ok: true, levelMm: 1000 });
    const dense = readingToVolumes(setup({ specificGravity: 1.2 }), { kind: 'pressure', pressureKPa: 9.80665 });
    expect(dense.ok && dense.levelMm).toBeCloseTo(1000 / 1.2, 9);
  });

  it('adds a raised pressure sensor height, and refuses 0 kPa there because the level is unknown', () => {
    expect(readingToVolumes(setup({ sensorHeightMm: 50 }), { kind: 'pressure', pressureKPa: 9.80665 })).toMatchObject({ ok: true, levelMm: 1050 });
    expect(readingToVolumes(setup({ sensorHeightMm: 50 }), { kind: 'pressure', pressureKPa: 0 })).toMatchObject({
      ok: false,
      reason: expect.stringMatching(/at or below the sensor/),
    });
    expect(readingToVolumes(setup(), { kind: 'pressure', pressureKPa: -0.2 })).toMatchObject({ ok: false, reason: expect.stringMatching(/below zero gauge/) });
  });

  it.each<[string, ReadingInput]>([
    ['sight-tube NaN', { kind: 'sight-tube', readingMm: Number.NaN }],
    ['level Infinity', { kind: 'level', levelMm: Number.POSITIVE_INFINITY }],
    ['ultrasonic NaN', { kind: 'ultrasonic', distanceMm: Number.NaN }],
    ['pressure NaN', { kind: 'pressure', pressureKPa: Number.NaN }],
    ['a string reading', { kind: 'sight-tube', readingMm: '600' as unknown as number }],
    ['an unknown kind', { kind: 'dipstick', readingMm: 5 } as unknown as ReadingInput],
  ])('answers with a reason, not a throw, for %s', (_label, input) => {
    const r = readingToVolumes(setup({ sensorHeightMm: 1900 }), input);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason.length).toBeGreaterThan(10);
  });

  it.each<[string, Partial<TankSetup>, RegExp]>([
    ['a bad geometry', { geometry: { shape: 'sphere', diameterMm: 0 } }, /^Tank geometry: diameterMm: must be greater than 0$/],
    ['an outlet above the top', { outletHeightMm: 1800 }, /^Tank setup: outletHeightMm/],
    ['a safe fill line at or below the outlet', { safeFillLevelMm: 100 }, /^Tank setup: safeFillLevelMm: 100 mm must be above the outlet/],
    ['a zero specific gravity', { specificGravity: 0 }, /^Tank setup: specificGravity/],
    ['a datum that is not a number', { datumOffsetMm: Number.NaN }, /^Tank setup: datumOffsetMm/],
  ])('names the setup field for %s', (_label, over, reason) => {
    const r = readingToVolumes(setup(over), { kind: 'sight-tube', readingMm: 500 });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(reason);
  });

  it('never throws and never clamps: any accepted reading lies inside the tank', () => {
    const anyNumber = fc.oneof(fc.double(), fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY, -0, 0));
    const input: fc.Arbitrary<ReadingInput> = fc.oneof(
      anyNumber.map((readingMm) => ({ kind: 'sight-tube' as const, readingMm })),
      anyNumber.map((levelMm) => ({ kind: 'level' as const, levelMm })),
      anyNumber.map((distanceMm) => ({ kind: 'ultrasonic' as const, distanceMm })),
      anyNumber.map((pressureKPa) => ({ kind: 'pressure' as const, pressureKPa })),
    );
    fc.assert(
      fc.property(input, anyNumber, anyNumber, (reading, datum, sg) => {
        const tank = setup({ datumOffsetMm: datum, specificGravity: sg, sensorHeightMm: 1900 });
        const r = readingToVolumes(tank, reading);
        if (r.ok) {
          expect(r.levelMm).toBeGreaterThanOrEqual(0);
          expect(r.levelMm).toBeLessThanOrEqual(1790);
          expect(r.grossL).toBeLessThanOrEqual(1790 * perMmL * (1 + 1e-12));
          expect(Number.isFinite(r.usableL + r.ullageL + r.percentFull)).toBe(true);
        } else {
          expect(typeof r.reason).toBe('string');
        }
      }),
      { numRuns: 3000 },
    );
  });
});
