import { describe, expect, it } from 'vitest';
import { finiteNumber, nonNegative, positive, wholeCount } from '@shared/checks';

describe('shared number checks', () => {
  it.each([
    ['finiteNumber', finiteNumber, [-2.5, 0, 7]],
    ['nonNegative', nonNegative, [0, 0.1, 40]],
    ['positive', positive, [0.001, 1, 1e6]],
    ['wholeCount', wholeCount, [1, 2, 365]],
  ] as const)('%s returns a value it accepts unchanged', (_name, check, values) => {
    for (const v of values) expect(check('volumeL', v)).toBe(v);
  });

  it.each([
    ['finiteNumber', finiteNumber, Number.NaN, 'volumeL must be a finite number (got NaN)'],
    ['finiteNumber', finiteNumber, Number.POSITIVE_INFINITY, 'volumeL must be a finite number (got Infinity)'],
    ['finiteNumber', finiteNumber, '12', 'volumeL must be a finite number (got 12)'],
    ['finiteNumber', finiteNumber, null, 'volumeL must be a finite number (got null)'],
    ['nonNegative', nonNegative, -0.5, 'volumeL must not be negative (got -0.5)'],
    ['positive', positive, 0, 'volumeL must be greater than zero (got 0)'],
    ['positive', positive, -3, 'volumeL must be greater than zero (got -3)'],
    ['wholeCount', wholeCount, 0, 'volumeL must be a whole number of at least 1 (got 0)'],
    ['wholeCount', wholeCount, 2.5, 'volumeL must be a whole number of at least 1 (got 2.5)'],
  ] as const)('%s refuses %s with a RangeError naming the field', (_name, check, value, message) => {
    expect(() => check('volumeL', value)).toThrow(new RangeError(message));
  });
});
