import { formatNumberTrimmed } from '../units/index';
import type { TankGeometry } from './geometry';
import { tankModel } from './engine';

/** One row of a calibration table: level in mm above the lowest point, volume in litres. */
export interface CalibrationRow {
  levelMm: number;
  volumeL: number;
}

/** Most rows a table may have (a 30 m tank at a 0.3 mm step). */
export const MAX_TABLE_ROWS = 100_001;

/**
 * Rows from level 0 to the top inclusive every `stepMm` millimetres (the last row sits at the top even
 * when the step does not divide the height), volumes in litres from the shape's closed form.
 */
export function buildCalibrationTable(g: TankGeometry, stepMm: number): CalibrationRow[] {
  if (typeof stepMm !== 'number' || !Number.isFinite(stepMm) || stepMm <= 0) {
    throw new RangeError(`stepMm: must be a number greater than 0 (got ${String(stepMm)})`);
  }
  const model = tankModel(g);
  const top = model.heightMm;
  // Steps that land within a nanometre of the top count as reaching it, so no sliver row appears.
  const whole = Math.floor(top / stepMm + 1e-9);
  const lastStep = whole * stepMm;
  const rows = (top - lastStep > 1e-9 ? whole + 1 : whole) + 1;
  if (rows > MAX_TABLE_ROWS) {
    const least = top / (MAX_TABLE_ROWS - 1);
    throw new RangeError(
      `stepMm: ${formatNumberTrimmed(stepMm, 6)} mm would make ${formatNumberTrimmed(rows, 0)} rows for this ${formatNumberTrimmed(top, 3)} mm tank; use at least ${formatNumberTrimmed(Math.ceil(least * 1000) / 1000, 3)} mm`,
    );
  }
  const table: CalibrationRow[] = new Array(rows);
  for (let i = 0; i < rows - 1; i++) {
    // Multiplying, not accumulating, keeps row levels free of drift; rounding to 1e-9 mm keeps
    // 0.1 mm steps printing as 0.3, not 0.30000000000000004.
    const levelMm = Math.round(i * stepMm * 1e9) / 1e9;
    table[i] = { levelMm, volumeL: model.volumeL(levelMm) };
  }
  table[rows - 1] = { levelMm: top, volumeL: model.capacityL };
  return table;
}

/**
 * Volume in litres at `levelMm`, linear between the two rows around it (found by a proportional guess,
 * else binary search), as tank calibration standards interpolate; RangeError outside the table.
 * Rows must rise in level.
 */
export function lookupVolume(table: readonly CalibrationRow[], levelMm: number): number {
  const n = table.length;
  if (n === 0) throw new RangeError('The calibration table has no rows');
  if (!(levelMm >= table[0].levelMm - 1e-9 && levelMm <= table[n - 1].levelMm + 1e-9)) {
    throw new RangeError(
      `Level ${formatNumberTrimmed(levelMm, 3)} mm is outside the table (${formatNumberTrimmed(table[0].levelMm, 3)}–${formatNumberTrimmed(table[n - 1].levelMm, 3)} mm)`,
    );
  }
  if (n === 1) return table[0].volumeL;
  const first = table[0].levelMm;
  const span = table[n - 1].levelMm - first;
  // Tables are nearly always evenly spaced, so the row a proportional guess lands on usually brackets
  // the level already; binary search covers every other table.
  let lo = span > 0 ? Math.min(n - 2, Math.max(0, Math.floor(((levelMm - first) / span) * (n - 1)))) : 0;
  let hi = lo + 1;
  if (!(table[lo].levelMm <= levelMm && levelMm <= table[hi].levelMm)) {
    lo = 0;
    hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >>> 1;
      if (table[mid].levelMm <= levelMm) lo = mid;
      else hi = mid;
    }
  }
  const a = table[lo];
  const b = table[hi];
  const width = b.levelMm - a.levelMm;
  const t = width > 0 ? (levelMm - a.levelMm) / width : 0;
  // Inside the tolerance band the fraction may stray just past [0, 1]; clamping there is rounding, not data.
  const f = t < 0 ? 0 : t > 1 ? 1 : t;
  return a.volumeL + (b.volumeL - a.volumeL) * f;
}
