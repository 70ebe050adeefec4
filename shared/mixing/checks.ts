/** Throws a RangeError naming `field` unless `value` is a finite number; returns it (same unit). */
export function finiteNumber(field: string, value: unknown): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new RangeError(`${field} must be a finite number (got ${String(value)})`);
  }
  return value;
}

/** Throws a RangeError naming `field` unless `value` is a finite number > 0; returns it (same unit). */
export function positive(field: string, value: unknown): number {
  const n = finiteNumber(field, value);
  if (n <= 0) throw new RangeError(`${field} must be greater than zero (got ${n})`);
  return n;
}

/** Throws a RangeError naming `field` unless `value` is a finite number ≥ 0; returns it (same unit). */
export function nonNegative(field: string, value: unknown): number {
  const n = finiteNumber(field, value);
  if (n < 0) throw new RangeError(`${field} must not be negative (got ${n})`);
  return n;
}
