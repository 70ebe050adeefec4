import type { z } from 'zod';
import { firstIssue, idSchema } from '@shared/schemas';
import { AppError } from './errors';

/** Parses input with a shared zod schema; a failure becomes a 400 naming the field. */
export function parse<S extends z.ZodType>(schema: S, data: unknown): z.output<S> {
  const result = schema.safeParse(data);
  if (result.success) return result.data;
  const { field, message } = firstIssue(result.error);
  throw new AppError(400, 'invalid_input', message, field);
}

/** A positive integer route parameter, or a 404 (a malformed id names nothing). */
export function idParam(value: unknown, what = 'Item'): number {
  const r = idSchema.safeParse(value);
  if (!r.success) throw new AppError(404, 'not_found', `${what} not found`);
  return r.data;
}
