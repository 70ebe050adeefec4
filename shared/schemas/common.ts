import { z } from 'zod';

/** The four roles of an organisation, most powerful first. */
export const ROLES = ['owner', 'manager', 'worker', 'buyer'] as const;
/** A role name. */
export type Role = (typeof ROLES)[number];

/** Unit systems a user may choose for display; storage stays SI. */
export const UNIT_SYSTEMS = ['metric', 'us'] as const;
/** A unit system name. */
export type UnitSystem = (typeof UNIT_SYSTEMS)[number];

/**
 * Positive integer id from a route parameter or body: a number, or its digits as text ("12"). Nothing
 * else is turned into a number, so true, [1] or "1e3" are refused rather than read as ids 1 and 1000.
 */
export const idSchema = z.preprocess(
  (v) => (typeof v === 'string' && /^\s*\d+\s*$/.test(v) ? Number(v) : v),
  z.number({ error: 'must be a whole number id' }).int('must be a whole number id').positive('must be a whole number id above 0'),
);

/** Trimmed, non-empty text of at most `max` characters. */
export const text = (max: number) => z.string().trim().min(1, 'Required').max(max, `At most ${max} characters`);

/** The JSON error body every API failure returns. */
export interface ApiErrorBody {
  error: { code: string; message: string; field?: string };
}

/** The first problem of a failed parse as `{ field, message }`, field a dotted path ("points.3.levelMm"). */
export function firstIssue(error: z.ZodError): { field?: string; message: string } {
  const issue = error.issues[0];
  if (!issue) return { message: 'Invalid input' };
  const field = issue.path.length ? issue.path.join('.') : undefined;
  return { field, message: field ? `${field}: ${issue.message}` : issue.message };
}

/** Every problem of a failed parse, keyed by dotted field path (first message per field). */
export function fieldErrors(error: z.ZodError): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.join('.') || '_';
    if (!(key in out)) out[key] = issue.message;
  }
  return out;
}

type Undefaulted<T> = T extends z.ZodDefault<infer Inner> ? Inner : T;

/**
 * The PATCH form of a create schema: every field optional and no defaults filled in (zod 4 applies
 * a field's default even inside .partial(), which would reset fields the request never named).
 */
export function patchSchema<T extends z.ZodRawShape>(schema: z.ZodObject<T>) {
  const shape = Object.fromEntries(Object.entries(schema.shape).map(([key, field]) => [key, ((field instanceof z.ZodDefault ? field.removeDefault() : field) as z.ZodType).optional()]));
  return z.object(shape) as unknown as z.ZodObject<{ [K in keyof T]: z.ZodOptional<Undefaulted<T[K]>> }>;
}
