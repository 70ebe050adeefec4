import { z } from 'zod';
import { formatNumber, formatNumberTrimmed } from '../units/index';
import { checkProblem, figure, type CheckParam, type CheckProblem } from '../check-problems';
import {
  HORIZONTAL_ENDS,
  MAX_POINT_VOLUME_L,
  MAX_POINTS,
  MAX_SIZE_MM,
  TANK_SHAPES,
  type CalibrationPoint,
  type TankGeometry,
} from './geometry';

// Messages carry no field name: the issue path names the field, and validateGeometry (like the
// API's firstIssue helper) joins them as "diameterMm: must be greater than 0".
const MSG = {
  required: 'is required',
  notNumber: 'must be a finite number',
  positive: 'must be greater than 0',
  notNegative: 'must be 0 or more',
  maxSize: `must be at most ${formatNumber(MAX_SIZE_MM)} mm (${MAX_SIZE_MM / 1000} m)`,
  maxVolume: `must be at most ${formatNumber(MAX_POINT_VOLUME_L)} L`,
  shape: `must be one of ${TANK_SHAPES.join(', ')}`,
  ends: `must be one of ${HORIZONTAL_ENDS.join(', ')}`,
  pointsList: 'must be a list of { levelMm, volumeL } points',
  point: 'must be an object with levelMm and volumeL',
  tooFewPoints: 'must list at least 1 point',
  tooManyPoints: `must list at most ${MAX_POINTS} points`,
} as const;

// Each message's code in area `checks` (geometry.<key>) with its figures, for screens in other languages.
const MSG_PARAMS: Partial<Record<keyof typeof MSG, Record<string, CheckParam>>> = {
  maxSize: { max: figure(MAX_SIZE_MM, 0), maxM: figure(MAX_SIZE_MM / 1000, 3) },
  maxVolume: { max: figure(MAX_POINT_VOLUME_L, 0) },
  shape: { list: TANK_SHAPES.join(', ') },
  ends: { list: HORIZONTAL_ENDS.join(', ') },
  tooManyPoints: { max: figure(MAX_POINTS, 0) },
};
const MSG_CODES = new Map<string, keyof typeof MSG>(Object.entries(MSG).map(([key, message]) => [message, key as keyof typeof MSG]));

const numberError = (iss: { input?: unknown }) => (iss.input === undefined ? MSG.required : MSG.notNumber);

const sizeMm = () => z.number({ error: numberError }).positive(MSG.positive).max(MAX_SIZE_MM, MSG.maxSize);

const pointSchema = z.object(
  {
    levelMm: z.number({ error: numberError }).min(0, MSG.notNegative).max(MAX_SIZE_MM, MSG.maxSize),
    volumeL: z.number({ error: numberError }).min(0, MSG.notNegative).max(MAX_POINT_VOLUME_L, MSG.maxVolume),
  },
  { error: MSG.point },
);

function pointIsSound(p: unknown): p is CalibrationPoint {
  if (typeof p !== 'object' || p === null) return false;
  const { levelMm, volumeL } = p as Record<string, unknown>;
  return (
    typeof levelMm === 'number' &&
    typeof volumeL === 'number' &&
    Number.isFinite(levelMm) &&
    Number.isFinite(volumeL) &&
    levelMm >= 0 &&
    levelMm <= MAX_SIZE_MM &&
    volumeL >= 0 &&
    volumeL <= MAX_POINT_VOLUME_L
  );
}

const mm = (v: number) => formatNumberTrimmed(v, 3);
const litres = mm;

const pointsSchema = z
  .array(pointSchema, { error: (iss) => (iss.input === undefined ? MSG.required : MSG.pointsList) })
  .min(1, MSG.tooFewPoints)
  .max(MAX_POINTS, MSG.tooManyPoints)
  .superRefine((points, ctx) => {
    // Order only means something once every point is a sound pair of numbers; zod runs this
    // refinement even when an element failed, so check that first.
    if (points.length === 0 || !points.every(pointIsSound)) return;
    const first = points[0];
    if (first.levelMm > 0 && first.volumeL <= 0) {
      ctx.addIssue({
        code: 'custom',
        path: [0],
        message: `volume ${litres(first.volumeL)} L at level ${mm(first.levelMm)} mm must be above 0 L, the volume taken at level 0 mm; add a point at level 0 mm to give the tank a volume there`,
        params: { check: 'firstVolume', volume: figure(first.volumeL, 3), level: figure(first.levelMm, 3) },
      });
    }
    for (let i = 1; i < points.length; i++) {
      const prev = points[i - 1];
      const p = points[i];
      if (!(p.levelMm > prev.levelMm)) {
        ctx.addIssue({
          code: 'custom',
          path: [i],
          message: `level ${mm(p.levelMm)} mm is not above the previous point's ${mm(prev.levelMm)} mm`,
          params: { check: 'levelNotAbove', level: figure(p.levelMm, 3), previous: figure(prev.levelMm, 3) },
        });
      } else if (!(p.volumeL > prev.volumeL)) {
        ctx.addIssue({
          code: 'custom',
          path: [i],
          message: `volume ${litres(p.volumeL)} L is not above the previous point's ${litres(prev.volumeL)} L`,
          params: { check: 'volumeNotAbove', volume: figure(p.volumeL, 3), previous: figure(prev.volumeL, 3) },
        });
      }
    }
    if (points.length === 1 && first.levelMm === 0) {
      ctx.addIssue({ code: 'custom', path: [], message: 'must include a point above level 0 mm', params: { check: 'pointAboveZero' } });
    }
  });

const enumError = (message: string) => (iss: { input?: unknown }) => (iss.input === undefined ? MSG.required : message);

const members = [
  z.object({ shape: z.literal('vertical-cylinder'), diameterMm: sizeMm(), heightMm: sizeMm() }),
  z.object({ shape: z.literal('cone-bottom'), diameterMm: sizeMm(), straightHeightMm: sizeMm(), coneHeightMm: sizeMm() }),
  z.object({
    shape: z.literal('horizontal-cylinder'),
    diameterMm: sizeMm(),
    lengthMm: sizeMm(),
    ends: z.enum(HORIZONTAL_ENDS, { error: enumError(MSG.ends) }),
  }),
  z.object({ shape: z.literal('box'), lengthMm: sizeMm(), widthMm: sizeMm(), heightMm: sizeMm() }),
  z.object({ shape: z.literal('frustum'), bottomDiameterMm: sizeMm(), topDiameterMm: sizeMm(), heightMm: sizeMm() }),
  z.object({ shape: z.literal('sphere'), diameterMm: sizeMm() }),
  z.object({ shape: z.literal('points'), points: pointsSchema }),
] as const;

/**
 * Zod schema of a tank geometry (sizes in mm, volumes in L); parses to a TankGeometry without unknown keys.
 * Issue messages are plain ("must be greater than 0"); the issue path names the field.
 */
export const tankGeometrySchema: z.ZodType<TankGeometry> = z.discriminatedUnion('shape', members, {
  error: () => MSG.shape,
});

/**
 * One problem with a geometry: the dotted field path, a message that starts with it, and the message after
 * the field as a code of area `checks` ("geometry.positive") with its figures, for screens in other languages.
 */
export interface GeometryIssue {
  field: string;
  message: string;
  problem: CheckProblem;
}

/** The code and figures of a zod issue of the geometry schema: its own check, one of MSG, else the English as it is. */
function problemOf(issue: { code: string; message: string; params?: Record<string, unknown> }): CheckProblem {
  if (issue.code === 'custom' && issue.params && typeof issue.params.check === 'string') {
    const { check, ...params } = issue.params;
    return checkProblem(`geometry.${check}`, params as Record<string, CheckParam>);
  }
  const key = MSG_CODES.get(issue.message);
  return key ? checkProblem(`geometry.${key}`, MSG_PARAMS[key] ?? {}) : checkProblem('geometry.other', { detail: issue.message });
}

/**
 * Result of validateGeometry: the cleaned geometry, or the first problem (field and message naming it)
 * plus every problem found in `issues`.
 */
export type GeometryValidation =
  | { ok: true; geometry: TankGeometry }
  | { ok: false; field: string; message: string; issues: GeometryIssue[] };

/** Checks an untrusted geometry (sizes in mm): `{ ok: true, geometry }` or the problems, each naming its field. */
export function validateGeometry(g: unknown): GeometryValidation {
  const parsed = tankGeometrySchema.safeParse(g);
  if (parsed.success) return { ok: true, geometry: parsed.data };
  const issues = parsed.error.issues.map((issue) => {
    // A missing or non-object geometry fails on its discriminator, so report it against `shape`.
    const field = issue.path.length ? issue.path.join('.') : 'shape';
    return { field, message: `${field}: ${issue.message}`, problem: problemOf(issue) };
  });
  return { ok: false, field: issues[0].field, message: issues[0].message, issues };
}
