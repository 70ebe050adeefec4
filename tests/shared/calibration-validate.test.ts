// Geometry validation (validateGeometry and the zod schema the API reuses) and calibration versions.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  HORIZONTAL_ENDS,
  TANK_SHAPES,
  TANK_SHAPE_FIELDS,
  calibrationVersion,
  tankGeometrySchema,
  validateGeometry,
  type HorizontalCylinderGeometry,
  type TankGeometry,
} from '@shared/calibration/index';
import { fnv1a32 } from '@shared/calibration/version';

const good: Record<(typeof TANK_SHAPES)[number], TankGeometry> = {
  'vertical-cylinder': { shape: 'vertical-cylinder', diameterMm: 1100, heightMm: 1790 },
  'cone-bottom': { shape: 'cone-bottom', diameterMm: 900, straightHeightMm: 1000, coneHeightMm: 350 },
  'horizontal-cylinder': { shape: 'horizontal-cylinder', diameterMm: 1200, lengthMm: 2400, ends: 'ellipsoidal-2to1' },
  box: { shape: 'box', lengthMm: 1200, widthMm: 1000, heightMm: 1160 },
  frustum: { shape: 'frustum', bottomDiameterMm: 1500, topDiameterMm: 1100, heightMm: 1300 },
  sphere: { shape: 'sphere', diameterMm: 2000 },
  points: { shape: 'points', points: [{ levelMm: 100, volumeL: 80 }, { levelMm: 800, volumeL: 700 }] },
};

/** Every size field of every shape, for the per-field tables below. */
const sizeFields = TANK_SHAPES.flatMap((shape) =>
  TANK_SHAPE_FIELDS[shape].filter((f) => f !== 'ends' && f !== 'points').map((field) => ({ shape, field })),
);

const withField = (shape: (typeof TANK_SHAPES)[number], field: string, value: unknown) => ({ ...good[shape], [field]: value });

describe('validateGeometry', () => {
  it.each(TANK_SHAPES)('accepts a sound %s and returns it', (shape) => {
    expect(validateGeometry(good[shape])).toEqual({ ok: true, geometry: good[shape] });
  });

  it('drops keys that are not part of the shape', () => {
    const r = validateGeometry({ ...good.sphere, colour: 'blue', heightMm: 5 });
    expect(r).toEqual({ ok: true, geometry: { shape: 'sphere', diameterMm: 2000 } });
  });

  it.each(sizeFields)('names $field of a $shape when it is 0', ({ shape, field }) => {
    expect(validateGeometry(withField(shape, field, 0))).toMatchObject({ ok: false, field, message: `${field}: must be greater than 0` });
  });

  it.each(sizeFields)('names $field of a $shape when it is negative', ({ shape, field }) => {
    expect(validateGeometry(withField(shape, field, -12))).toMatchObject({ ok: false, message: `${field}: must be greater than 0` });
  });

  it.each(sizeFields)('names $field of a $shape when it is above 30 m', ({ shape, field }) => {
    expect(validateGeometry(withField(shape, field, 30_000.5))).toMatchObject({
      ok: false,
      message: `${field}: must be at most 30,000 mm (30 m)`,
    });
    expect(validateGeometry(withField(shape, field, 30_000)).ok).toBe(true);
  });

  it.each(sizeFields.flatMap((f) => [Number.NaN, Number.POSITIVE_INFINITY, '900'].map((value) => ({ ...f, value }))))(
    'names $field of a $shape when it is $value',
    ({ shape, field, value }) => {
      expect(validateGeometry(withField(shape, field, value))).toMatchObject({ ok: false, message: `${field}: must be a finite number` });
    },
  );

  it.each(sizeFields)('names $field of a $shape when it is missing', ({ shape, field }) => {
    expect(validateGeometry(withField(shape, field, undefined))).toMatchObject({ ok: false, message: `${field}: is required` });
  });

  it('names ends when it is not a known end type', () => {
    expect(validateGeometry({ ...good['horizontal-cylinder'], ends: 'domed' })).toMatchObject({
      ok: false,
      field: 'ends',
      message: `ends: must be one of ${HORIZONTAL_ENDS.join(', ')}`,
    });
  });

  it.each([{ shape: 'cube', diameterMm: 5 }, { diameterMm: 5 }, null, 42, 'sphere'])('names shape when given %j', (input) => {
    expect(validateGeometry(input)).toMatchObject({ ok: false, field: 'shape', message: `shape: must be one of ${TANK_SHAPES.join(', ')}` });
  });

  it('lists every bad field in issues', () => {
    const r = validateGeometry({ shape: 'box', lengthMm: -1, widthMm: 'wide' });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.issues).toEqual([
        { field: 'lengthMm', message: 'lengthMm: must be greater than 0', problem: { code: 'geometry.positive', params: {} } },
        { field: 'widthMm', message: 'widthMm: must be a finite number', problem: { code: 'geometry.notNumber', params: {} } },
        { field: 'heightMm', message: 'heightMm: is required', problem: { code: 'geometry.required', params: {} } },
      ]);
    }
  });

  it('never throws, whatever it is given', () => {
    fc.assert(
      fc.property(fc.anything(), (input) => {
        const r = validateGeometry(input);
        expect(typeof r.ok).toBe('boolean');
      }),
      { numRuns: 500 },
    );
  });
});

describe('tankGeometrySchema', () => {
  // Values that exercise every rule: sound, zero, negative, too big, not a number, missing.
  const anyValue = fc.oneof(
    fc.double({ min: 1, max: 30_000, noNaN: true }),
    fc.constantFrom(0, -5, 30_001, Number.NaN, Number.POSITIVE_INFINITY, '12', undefined, null),
  );
  const candidate = fc.oneof(
    fc.record({
      shape: fc.constantFrom(...TANK_SHAPES, 'cube'),
      diameterMm: anyValue,
      heightMm: anyValue,
      straightHeightMm: anyValue,
      coneHeightMm: anyValue,
      lengthMm: anyValue,
      widthMm: anyValue,
      bottomDiameterMm: anyValue,
      topDiameterMm: anyValue,
      ends: fc.constantFrom(...HORIZONTAL_ENDS, 'domed', undefined),
    }),
    fc.record({
      shape: fc.constant('points'),
      points: fc.array(fc.record({ levelMm: anyValue, volumeL: anyValue }), { maxLength: 6 }),
    }),
  );

  it('agrees with validateGeometry on every field and message, joined as "path: message"', () => {
    fc.assert(
      fc.property(candidate, (input) => {
        const parsed = tankGeometrySchema.safeParse(input);
        const checked = validateGeometry(input);
        expect(parsed.success).toBe(checked.ok);
        if (!parsed.success && !checked.ok) {
          const fromZod = parsed.error.issues.map((i) => `${i.path.length ? i.path.join('.') : 'shape'}: ${i.message}`);
          expect(fromZod).toEqual(checked.issues.map((i) => i.message));
        }
        if (parsed.success && checked.ok) expect(parsed.data).toEqual(checked.geometry);
      }),
      { numRuns: 1000 },
    );
  });

  it('parses a sound geometry to the geometry without unknown keys', () => {
    expect(tankGeometrySchema.parse({ ...good.box, note: 'IBC tote' })).toEqual(good.box);
  });

  it('reports the field in the issue path with a plain message', () => {
    const r = tankGeometrySchema.safeParse({ shape: 'sphere', diameterMm: 0 });
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues[0]).toMatchObject({ path: ['diameterMm'], message: 'must be greater than 0' });
  });
});

describe('calibrationVersion', () => {
  it('returns 8 lowercase hex digits', () => {
    expect(calibrationVersion(good.box, 0)).toMatch(/^[0-9a-f]{8}$/);
  });

  it('returns the same version for the same geometry whatever the key order, extra keys or −0', () => {
    const reordered = { heightMm: 1160, widthMm: 1000, lengthMm: 1200, shape: 'box', label: 'tote 3' } as unknown as TankGeometry;
    expect(calibrationVersion(reordered, -0)).toBe(calibrationVersion(good.box, 0));
  });

  it.each(TANK_SHAPES)('changes when any size of a %s changes by 1 mm', (shape) => {
    const base = calibrationVersion(good[shape], 25);
    for (const field of TANK_SHAPE_FIELDS[shape]) {
      if (field === 'ends' || field === 'points') continue;
      const changed = withField(shape, field, (good[shape] as unknown as Record<string, number>)[field] + 1) as TankGeometry;
      expect(calibrationVersion(changed, 25)).not.toBe(base);
    }
  });

  it('changes when the datum offset, the ends or a mark changes', () => {
    const h = good['horizontal-cylinder'] as HorizontalCylinderGeometry;
    expect(calibrationVersion(h, 25)).not.toBe(calibrationVersion(h, 26));
    expect(calibrationVersion(h, 25)).not.toBe(calibrationVersion({ ...h, ends: 'flat' }, 25));
    const p = good.points as TankGeometry & { shape: 'points' };
    const moved = { shape: 'points' as const, points: [p.points[0], { levelMm: 800, volumeL: 701 }] };
    expect(calibrationVersion(p, 0)).not.toBe(calibrationVersion(moved, 0));
  });

  it('gives different versions to random different tanks', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 30_000 }), fc.integer({ min: 1, max: 30_000 }), fc.integer({ min: -500, max: 500 }), (d, h, datum) => {
        const a = calibrationVersion({ shape: 'vertical-cylinder', diameterMm: d, heightMm: h }, datum);
        const b = calibrationVersion({ shape: 'vertical-cylinder', diameterMm: d, heightMm: h }, datum + 1);
        expect(a).not.toBe(b);
      }),
      { numRuns: 300 },
    );
  });

  it('throws a RangeError naming the field when the geometry or datum is bad', () => {
    expect(() => calibrationVersion({ shape: 'sphere', diameterMm: -1 }, 0)).toThrow('Invalid tank geometry: diameterMm: must be greater than 0');
    expect(() => calibrationVersion(good.sphere, Number.NaN)).toThrow(/^datumOffsetMm: must be a finite number/);
  });
});

describe('fnv1a32', () => {
  // FNV-1a 32-bit test vectors from the FNV reference test suite (L. C. Noll, "FNV hash" pages);
  // values recalled from memory, not re-checked.
  it.each([
    ['', 0x811c9dc5],
    ['a', 0xe40c292c],
    ['foobar', 0xbf9cf968],
  ])('hashes %j to the published value', (text, expected) => {
    expect(fnv1a32(text)).toBe(expected);
  });
});
