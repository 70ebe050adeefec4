// The number checks every shared computation starts with: a value that is not what the formula needs
// is refused with a RangeError naming the field, never worked through into a wrong figure.

/** Throws a RangeError naming `field` unless `value` is a finite number; returns the value (same unit). */
export function finiteNumber(field: string, value: unknown): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new RangeError(`${field} must be a finite number (got ${String(value)})`);
  }
  return value;
}

/** Throws a RangeError naming `field` unless `value` is a finite number ≥ 0; returns the value (same unit). */
export function nonNegative(field: string, value: unknown): number {
  const n = finiteNumber(field, value);
  if (n < 0) throw new RangeError(`${field} must not be negative (got ${n})`);
  return n;
}

/** Throws a RangeError naming `field` unless `value` is a finite number > 0; returns the value (same unit). */
export function positive(field: string, value: unknown): number {
  const n = finiteNumber(field, value);
  if (n <= 0) throw new RangeError(`${field} must be greater than zero (got ${n})`);
  return n;
}

/** Throws a RangeError naming `field` unless `value` is a whole number ≥ 1; returns the value (a count). */
export function wholeCount(field: string, value: unknown): number {
  const n = finiteNumber(field, value);
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`${field} must be a whole number of at least 1 (got ${n})`);
  return n;
}
