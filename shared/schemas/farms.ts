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

/** Body of POST /api/farms. */
export const farmCreateSchema = z.object({
  name: text(120),
  timeZone: z.string().trim().refine(isTimeZone, 'Unknown time zone'),
  location: z.string().trim().max(200).default(''),
  /** Flag rules: days without a reading before a tank is stale. */
  staleAfterDays: z.number({ error: 'must be a number' }).finite().min(0.5, 'must be at least half a day').max(60, 'must be at most 60 days').default(3),
  /** Flag rules: culture tanks under this are too cold (°C; 18 is common practice, no published source). */
  coldCultureC: z.number({ error: 'must be a number' }).finite().min(0, 'must be 0 °C or more').max(45, 'must be 45 °C or less').default(18),
  /** Flag rules: at or under this, frost risk (°C). */
  frostRiskC: z.number({ error: 'must be a number' }).finite().min(-10, 'must be -10 °C or more').max(10, 'must be 10 °C or less').default(2),
});
export type FarmCreateInput = z.infer<typeof farmCreateSchema>;

/** Body of PATCH /api/farms/:id (archived: true archives, false restores). */
export const farmUpdateSchema = patchSchema(farmCreateSchema).extend({ archived: z.boolean().optional() });
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
}
