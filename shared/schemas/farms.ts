import { z } from 'zod';
import { patchSchema, text } from './common';

/** True when `tz` is an IANA time zone this runtime knows. */
export function isTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat('en', { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}

/** The editable fields of a farm. */
const farmFields = z.object({
  name: text(120),
  timeZone: z.string().trim().refine(isTimeZone, 'Unknown time zone'),
  location: z.string().trim().max(200).default(''),
  /** Flag rules: days without a reading before a tank is stale. */
  staleAfterDays: z.number({ error: 'must be a number' }).finite().min(0.5, 'must be at least half a day').max(60, 'must be at most 60 days').default(3),
  /** Flag rules: culture tanks under this are too cold (°C; 18 is common practice, no published source). */
  coldCultureC: z.number({ error: 'must be a number' }).finite().min(0, 'must be 0 °C or more').max(45, 'must be 45 °C or less').default(18),
  /** Flag rules: at or under this, frost risk (°C). */
  frostRiskC: z.number({ error: 'must be a number' }).finite().min(-10, 'must be -10 °C or more').max(10, 'must be 10 °C or less').default(2),
  /** Where the farm's forecast is fetched for (decimal degrees, WGS 84; null: no forecast). */
  latitude: z.number({ error: 'must be a number' }).finite().min(-90, 'must be -90° or more').max(90, 'must be 90° or less').nullable().default(null),
  longitude: z.number({ error: 'must be a number' }).finite().min(-180, 'must be -180° or more').max(180, 'must be 180° or less').nullable().default(null),
  /** Frost ahead: forecast air temperature under which exposed tanks are flagged (°C; default 2, see shared/flags FROST_AHEAD_C). */
  frostAheadC: z.number({ error: 'must be a number' }).finite().min(-10, 'must be -10 °C or more').max(10, 'must be 10 °C or less').default(2),
});

// One without the other places the farm nowhere, so both are set or cleared together.
function bothOrNeither(f: { latitude?: number | null; longitude?: number | null }, ctx: z.RefinementCtx) {
  if ((f.latitude ?? null) === null && (f.longitude ?? null) === null) return;
  if ((f.latitude ?? null) === null) ctx.addIssue({ code: 'custom', path: ['latitude'], message: 'give the latitude with the longitude' });
  else if ((f.longitude ?? null) === null) ctx.addIssue({ code: 'custom', path: ['longitude'], message: 'give the longitude with the latitude' });
}

/** Body of POST /api/farms. */
export const farmCreateSchema = farmFields.superRefine(bothOrNeither);
export type FarmCreateInput = z.infer<typeof farmCreateSchema>;

/** Body of PATCH /api/farms/:id (archived: true archives, false restores). */
export const farmUpdateSchema = patchSchema(farmFields).extend({ archived: z.boolean().optional() }).superRefine((f, ctx) => {
  if (f.latitude !== undefined || f.longitude !== undefined) bothOrNeither(f, ctx);
});
export type FarmUpdateInput = z.infer<typeof farmUpdateSchema>;

/** A farm as the API returns it. */
export interface Farm {
  id: number;
  name: string;
  timeZone: string;
  location: string;
  archivedAt: string | null;
  staleAfterDays: number;
  coldCultureC: number;
  frostRiskC: number;
  latitude: number | null;
  longitude: number | null;
  frostAheadC: number;
}
