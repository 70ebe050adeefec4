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
}
