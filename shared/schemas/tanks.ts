import { z } from 'zod';
import { heightMm, tankGeometrySchema, type TankGeometry } from '../calibration/index';
import { idSchema, patchSchema, text } from './common';

/** What a tank can hold. */
export const TANK_CONTENTS = ['water', 'fertilizer', 'pest-solution', 'culture'] as const;
/** A kind of tank contents. */
export type TankContents = (typeof TANK_CONTENTS)[number];

const mmField = (label: string, min = 0) =>
  z.number({ error: `${label} must be a number` }).finite().min(min, `must be ${min} mm or more`).max(30_000, 'must be at most 30,000 mm');

/** The editable fields of a tank; sizes in mm, volumes in L. */
const tankFields = z.object({
  farmId: idSchema,
  name: text(80),
  code: z.string().trim().min(1, 'Required').max(12, 'At most 12 characters').regex(/^[A-Za-z0-9-]+$/, 'Letters, digits and - only'),
  contents: z.enum(TANK_CONTENTS),
  contentsNote: z.string().trim().max(120).default(''),
  geometry: tankGeometrySchema,
  /** Height of the sight tube's zero mark above the tank floor (negative when below it). */
  datumOffsetMm: z.number().finite().min(-5_000, 'must be -5,000 mm or more').max(30_000, 'must be at most 30,000 mm').default(0),
  outletHeightMm: mmField('Outlet height').default(0),
  safeFillLevelMm: mmField('Safe fill level').optional(),
  lowStockL: z.number().finite().min(0, 'must be 0 L or more').max(10_000_000).default(0),
  specificGravity: z.number().finite().min(0.5, 'must be at least 0.5').max(2.5, 'must be at most 2.5').default(1),
  /** Ultrasonic logger: height of the sensor face above the tank floor. */
  sensorHeightMm: mmField('Sensor height').nullable().default(null),
  walkOrder: z.number().int().min(0).max(10_000).default(0),
  /** Frost ahead flags this tank (its lines stand outdoors); left out on a new tank, water and fertilizer are, the rest not. */
  exposedToFrost: z.boolean({ error: 'must be true or false' }).optional(),
});

function checkHeights(t: { geometry?: TankGeometry; outletHeightMm?: number; safeFillLevelMm?: number; sensorHeightMm?: number | null }, ctx: z.RefinementCtx) {
  // zod runs this even when the geometry itself failed; that failure is reported already.
  if (!t.geometry || !tankGeometrySchema.safeParse(t.geometry).success) return;
  const top = heightMm(t.geometry);
  if (t.outletHeightMm !== undefined && t.outletHeightMm >= top) ctx.addIssue({ code: 'custom', path: ['outletHeightMm'], message: `must be below the top of the tank (${Math.round(top)} mm)` });
  if (t.safeFillLevelMm !== undefined && t.safeFillLevelMm > top) ctx.addIssue({ code: 'custom', path: ['safeFillLevelMm'], message: `must be at or below the top of the tank (${Math.round(top)} mm)` });
  if (t.safeFillLevelMm !== undefined && t.outletHeightMm !== undefined && t.safeFillLevelMm <= t.outletHeightMm) ctx.addIssue({ code: 'custom', path: ['safeFillLevelMm'], message: 'must be above the outlet height' });
}

/** Body of POST /api/tanks. The safe fill level defaults to the top of the tank. */
export const tankCreateSchema = tankFields.superRefine(checkHeights);
export type TankCreateInput = z.infer<typeof tankCreateSchema>;

/** Body of PATCH /api/tanks/:id (farm cannot change; archived archives or restores). */
export const tankUpdateSchema = patchSchema(tankFields.omit({ farmId: true })).extend({ archived: z.boolean().optional() });
export type TankUpdateInput = z.infer<typeof tankUpdateSchema>;

/** A tank as the API returns it, with its derived sizes. */
export interface Tank {
  id: number;
  farmId: number;
  name: string;
  code: string;
  contents: TankContents;
  contentsNote: string;
  geometry: TankGeometry;
  datumOffsetMm: number;
  outletHeightMm: number;
  safeFillLevelMm: number;
  lowStockL: number;
  specificGravity: number;
  sensorHeightMm: number | null;
  walkOrder: number;
  exposedToFrost: boolean;
  calibrationVersion: string;
  heightMm: number;
  capacityL: number;
  archivedAt: string | null;
}

/** One period of a tank's contents. */
export interface TankContentsPeriod {
  contents: TankContents;
  contentsNote: string;
  specificGravity: number;
  from: string;
  to: string | null;
  changedBy: string;
}

/** Query of GET /api/tanks/:id/calibration. */
export const calibrationQuerySchema = z.object({
  step: z.coerce.number().positive('step must be greater than 0').max(10_000).default(10),
  unit: z.enum(['metric', 'us']).default('metric'),
  format: z.enum(['json', 'csv']).default('json'),
});

/**
 * One calibration a tank has had (GET /api/tanks/:id/calibrations): numbered 1, 2, 3… per tank in
 * the order they were made. Every reading is stored against the calibration current at its time.
 */
export interface TankCalibrationVersion {
  /** 1 for the tank's first calibration, then one more for each new one. */
  number: number;
  /** The key a reading's calibrationVersion holds: for matching readings, never for showing. */
  key: string;
  /** When this calibration was first made (ISO). */
  createdAt: string;
  /** True for the calibration new readings are stored with. */
  current: boolean;
  geometry: TankGeometry;
  /** Height of the tube's zero mark above the floor under this calibration, mm (negative below). */
  datumOffsetMm: number;
}

/** A calibration table by tube reading (GET /api/tanks/:id/calibration), lengths and volumes in the units named. */
export interface CalibrationTableDto {
  tankId: number;
  /** The number of the tank's current calibration, and when it was made (ISO). */
  number: number;
  calibratedAt: string;
  lengthUnit: 'mm' | 'in';
  volumeUnit: 'L' | 'usgal';
  /** Height of the tube's zero mark above the floor: level = tube reading + datumOffset. */
  datumOffset: number;
  /** Rows by what the tube reads, each with the level above the floor it means and the volume there. */
  rows: { reading: number; level: number; volume: number }[];
}
