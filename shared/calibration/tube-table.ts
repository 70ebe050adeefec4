// The calibration table as a worker uses it: by what the sight tube reads, with the level above the
// floor beside it. Tube reading = level − datum offset (the zero mark's height above the floor).
import { formatNumberTrimmed } from '../units/index';
import type { TankGeometry } from './geometry';
import { tankModel } from './engine';
import { MAX_TABLE_ROWS } from './table';

/** One row: what the tube reads (mm from its zero mark), the level it means (mm above the floor) and the volume (L). */
export interface TubeReadingRow {
  readingMm: number;
  levelMm: number;
  volumeL: number;
}

const round9 = (v: number) => Math.round(v * 1e9) / 1e9;

/**
 * Rows every `stepMm` of tube reading (whole multiples of the step), from the lowest reading the tube
 * can show inside the tank to the top, each with its level (mm) and volume (L). The first row is the
 * floor when the zero mark is at or below it (the zero mark when above), the last is the top, so the
 * table covers every reading the tube can give even when the step does not divide the range.
 */
export function buildTubeReadingTable(g: TankGeometry, datumOffsetMm: number, stepMm: number): TubeReadingRow[] {
  if (typeof stepMm !== 'number' || !Number.isFinite(stepMm) || stepMm <= 0) {
    throw new RangeError(`stepMm: must be a number greater than 0 (got ${String(stepMm)})`);
  }
  if (typeof datumOffsetMm !== 'number' || !Number.isFinite(datumOffsetMm)) {
    throw new RangeError(`datumOffsetMm: must be a finite number (got ${String(datumOffsetMm)})`);
  }
  const model = tankModel(g);
  const top = model.heightMm;
  // Below the zero mark the tube shows nothing; below the floor there is no liquid.
  const first = Math.max(0, -datumOffsetMm);
  const last = top - datumOffsetMm;
  if (last < first) {
    throw new RangeError(`datumOffsetMm: the tube's zero mark (${formatNumberTrimmed(datumOffsetMm, 1)} mm) is above the top of the tank (${formatNumberTrimmed(top, 1)} mm)`);
  }
  const readings: number[] = [first];
  // Steps within a nanometre of the first or last row count as that row, so no sliver rows appear.
  for (let i = Math.floor(first / stepMm + 1e-9) + 1; i * stepMm < last - 1e-9; i++) {
    const r = round9(i * stepMm);
    if (r > first + 1e-9) readings.push(r);
    if (readings.length > MAX_TABLE_ROWS) {
      throw new RangeError(`stepMm: ${formatNumberTrimmed(stepMm, 6)} mm would make more than ${formatNumberTrimmed(MAX_TABLE_ROWS, 0)} rows for this tank`);
    }
  }
  if (last - first > 1e-9) readings.push(round9(last));
  return readings.map((readingMm) => {
    const levelMm = Math.min(top, Math.max(0, round9(readingMm + datumOffsetMm)));
    return { readingMm, levelMm, volumeL: levelMm >= top ? model.capacityL : model.volumeL(levelMm) };
  });
}
