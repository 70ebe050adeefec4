// Reading the shared zod schemas for the boundary tests: each body field as a path with what it is
// (kind, bounds, nullable, coerced), the boundary values it gets, and helpers to set and find values.
import { z } from 'zod';

export type Path = (string | number)[];

export const SQL = "'; DROP TABLE readings; --";
export const UNICODE = 'Cuve 🚰 خزان المياه ‏נ׳ Ω̃ 水槽';
export const HUGE = 'x'.repeat(100_000);

// ---- Reading the shared schemas -------------------------------------------------------------

export interface FieldInfo {
  kind: 'number' | 'string' | 'enum' | 'boolean' | 'array' | 'object' | 'other';
  format?: string;
  nullable: boolean;
  coerced: boolean;
  int: boolean;
  min?: number;
  max?: number;
  maxLength?: number;
  options?: string[];
  element?: z.ZodType;
  inner: z.ZodType;
}

const defOf = (s: z.ZodType) => (s as unknown as { _zod: { def: Record<string, unknown> & { type: string } } })._zod.def;

/** What a field schema is once optional, default, nullable and pipes are looked through. */
export function describeField(schema: z.ZodType): FieldInfo {
  let s = schema;
  let nullable = false;
  let preprocessed = false;
  for (;;) {
    const def = defOf(s);
    if (def.type === 'optional' || def.type === 'default' || def.type === 'prefault') s = def.innerType as z.ZodType;
    else if (def.type === 'nullable') {
      nullable = true;
      s = def.innerType as z.ZodType;
    } else if (def.type === 'pipe') {
      // A preprocess (a transform piped into the real schema, as idSchema is) is read by what it pipes into.
      const viaTransform = defOf(def.in as z.ZodType).type === 'transform';
      if (viaTransform) preprocessed = true;
      s = (viaTransform ? def.out : def.in) as z.ZodType;
    } else break;
  }
  const def = defOf(s);
  const info: FieldInfo = { kind: 'other', nullable, coerced: Boolean(def.coerce) || preprocessed, int: false, inner: s };
  if (s instanceof z.ZodNumber) return { ...info, kind: 'number', int: Boolean(s.isInt), min: s.minValue ?? undefined, max: s.maxValue ?? undefined };
  if (def.type === 'string') {
    const str = s as unknown as { maxLength: number | null; format: string | null };
    return { ...info, kind: 'string', maxLength: str.maxLength ?? undefined, format: str.format ?? undefined };
  }
  if (s instanceof z.ZodEnum) return { ...info, kind: 'enum', options: s.options as string[] };
  if (def.type === 'boolean') return { ...info, kind: 'boolean' };
  if (s instanceof z.ZodArray) return { ...info, kind: 'array', element: s.element as z.ZodType };
  if (s instanceof z.ZodObject) return { ...info, kind: 'object' };
  return info;
}

export const shapeOf = (s: z.ZodType): Record<string, z.ZodType> | null => {
  const inner = describeField(s).inner;
  return inner instanceof z.ZodObject ? (inner.shape as Record<string, z.ZodType>) : null;
};

/** Every field of a body schema as a path, with what it is; list items are reached through index 0 of the base body. */
export function fieldsOf(schema: z.ZodType, base: unknown, prefix: Path = []): { path: Path; info: FieldInfo }[] {
  const shape = shapeOf(schema);
  if (!shape) return [];
  const out: { path: Path; info: FieldInfo }[] = [];
  for (const [key, field] of Object.entries(shape)) {
    const info = describeField(field);
    const path = [...prefix, key];
    out.push({ path, info });
    const here = (base as Record<string, unknown> | undefined)?.[key];
    if (info.kind === 'array' && info.element && Array.isArray(here) && here.length && typeof here[0] === 'object') out.push(...fieldsOf(info.element, here[0], [...path, 0]));
    if (info.kind === 'object' && here && typeof here === 'object') out.push(...fieldsOf(info.inner, here, path));
  }
  return out;
}

/** The boundary values a field gets, each with whether accepting it would be nonsense. */
export function valuesFor(info: FieldInfo): { value: unknown; nonsense: boolean }[] {
  const bad = (value: unknown) => ({ value, nonsense: true });
  const maybe = (value: unknown) => ({ value, nonsense: false });
  const nul = info.nullable ? maybe(null) : bad(null);
  switch (info.kind) {
    case 'number': {
      const v = [maybe(-1), maybe(0), bad('NaN'), bad('Infinity'), bad(1e308), maybe(1.5), nul, bad([1]), bad(true), bad({})];
      // A numeric string is what a route parameter looks like; only coerced id fields may take one.
      v.push(info.coerced ? maybe('7') : bad('7'));
      if (info.min !== undefined && Number.isFinite(info.min) && info.min !== 0) v.push(maybe(info.min), maybe(info.min - 1));
      // No lower bound in the schema: the most negative number is still nonsense for every quantity here.
      if (info.min === undefined || !Number.isFinite(info.min)) v.push(bad(-1e308));
      if (info.max !== undefined && Number.isFinite(info.max) && info.max < 2 ** 53) v.push(maybe(info.max), maybe(info.max + 1));
      return v;
    }
    case 'string': {
      const v = [maybe(''), maybe(HUGE), maybe(SQL), maybe(UNICODE), maybe('a\u0000b'), bad(42), nul, bad([]), bad({})];
      if (info.format === 'datetime') v.push(maybe('2025-13-01T00:00:00Z'), maybe('9999-12-31T23:59:59Z'), bad(1e308));
      if (info.maxLength !== undefined && info.maxLength < 1000) v.push(maybe('é'.repeat(info.maxLength)), maybe('é'.repeat(info.maxLength + 1)));
      return v;
    }
    case 'enum':
      return [maybe('nope'), maybe(SQL), maybe((info.options?.[0] ?? '').toUpperCase()), bad(1), nul, bad([]), bad({})];
    case 'boolean':
      return [bad('true'), bad(1), bad('false'), nul, bad({})];
    case 'array':
      return [nul, bad({}), bad('x'), maybe([]), maybe([null]), maybe(Array.from({ length: 5_000 }, (_, i) => i + 1))];
    case 'object':
      return [nul, bad([]), bad('x'), bad(7), maybe({})];
    default:
      return [nul, bad(SQL), bad([]), bad({}), maybe(-1)];
  }
}

export const setAt = (body: Record<string, unknown>, path: Path, value: unknown) => {
  const copy = structuredClone(body);
  let at: Record<string | number, unknown> = copy;
  for (const k of path.slice(0, -1)) {
    at[k] ??= typeof k === 'number' ? [] : {};
    at = at[k] as Record<string | number, unknown>;
  }
  at[path[path.length - 1]] = value;
  return copy;
};

/** Every value found under `key` anywhere in a JSON answer. */
export function valuesUnder(body: unknown, key: string, out: unknown[] = []): unknown[] {
  if (Array.isArray(body)) for (const v of body) valuesUnder(v, key, out);
  else if (body && typeof body === 'object') {
    for (const [k, v] of Object.entries(body)) {
      if (k === key) out.push(v);
      valuesUnder(v, key, out);
    }
  }
  return out;
}

// ---- The test world -------------------------------------------------------------------------
