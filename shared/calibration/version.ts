import type { TankGeometry } from './geometry';
import { validateGeometry } from './schema';

// Canonical JSON: object keys sorted at every depth, so equal geometries always give equal text.
function canonical(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonical).join(',')}]`;
  if (value && typeof value === 'object') {
    const obj = value as Record<string, unknown>;
    return `{${Object.keys(obj)
      .sort()
      .filter((k) => obj[k] !== undefined)
      .map((k) => `${JSON.stringify(k)}:${canonical(obj[k])}`)
      .join(',')}}`;
  }
  if (typeof value === 'number') return JSON.stringify(Object.is(value, -0) ? 0 : value);
  return JSON.stringify(value);
}

/** 32-bit FNV-1a hash of a string's UTF-8 bytes (FNV offset basis 2166136261, prime 16777619). */
export function fnv1a32(text: string): number {
  let hash = 0x811c9dc5;
  const bytes = new TextEncoder().encode(text);
  for (let i = 0; i < bytes.length; i++) {
    hash ^= bytes[i];
    hash = Math.imul(hash, 0x01000193);
  }
  return hash >>> 0;
}

/**
 * A short stable id (8 hex digits) of a tank's calibration: FNV-1a over canonical JSON of the cleaned
 * geometry and the sight-tube datum offset in mm; it changes whenever either changes.
 */
export function calibrationVersion(g: TankGeometry, datumOffsetMm: number): string {
  const checked = validateGeometry(g);
  if (!checked.ok) throw new RangeError(`Invalid tank geometry: ${checked.message}`);
  if (typeof datumOffsetMm !== 'number' || !Number.isFinite(datumOffsetMm)) {
    throw new RangeError(`datumOffsetMm: must be a finite number (got ${String(datumOffsetMm)})`);
  }
  const text = canonical({ v: 1, geometry: checked.geometry, datumOffsetMm });
  return fnv1a32(text).toString(16).padStart(8, '0');
}
