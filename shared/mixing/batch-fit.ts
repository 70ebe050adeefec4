// Whether a brew's batch fits its vessel, and whether the farm holds the inputs it takes.
//
// Free space is the vessel's volume at its safe fill line minus what its latest reading says it
// holds (the tank's own calibration, as every stock figure is worked out). A batch larger than the
// free space is refused; one that takes more than the last 10 % of it is warned about (the
// customer's rule, issue #14: common practice, no published source).
import { tankModel, type TankGeometry } from '../calibration/index';
import { formatNumberTrimmed } from '../units/index';
import { nonNegative } from '../checks';

/** Share of the free space (0–1) that a batch may leave unused before the fit check warns. */
export const BATCH_FIT_WARN_SHARE = 0.1;

/** How many of an input's unit make one litre, for inputs counted by volume (keys lower case). */
export const INPUT_UNITS_PER_LITRE: Readonly<Record<string, number>> = { l: 1, litre: 1, liter: 1, litres: 1, liters: 1, ml: 1000 };

/** Litres per one of `unit` (L, litre, ml…), or null for a unit that is not a volume (kg, bag). */
export function litresPerInputUnit(unit: string): number | null {
  const perL = INPUT_UNITS_PER_LITRE[unit.trim().toLowerCase()];
  return perL === undefined ? null : 1 / perL;
}

/** A brew's batch volume in L: the water plus every input counted by volume; inputs counted by weight or piece add no volume here. */
export function batchVolumeL(waterL: number, inputs: readonly { quantity: number; unit: string }[]): number {
  let total = nonNegative('waterL', waterL);
  for (const [i, line] of inputs.entries()) {
    const perUnit = litresPerInputUnit(line.unit);
    if (perUnit !== null) total += nonNegative(`inputs.${i}.quantity`, line.quantity) * perUnit;
  }
  return total;
}

/** The vessel and what it holds, as the fit check needs them (mm above the floor, L, ISO instants). */
export interface BatchFitInput {
  geometry: TankGeometry;
  safeFillLevelMm: number;
  /** The tank's latest reading, or null when it has none. */
  latest: { grossL: number; takenAt: string } | null;
  /** When the brew starts (ISO instant). */
  startedAt: string;
  /** The batch: water plus concentrate, L. */
  batchL: number;
}

/** The figures behind a fit verdict, L. */
export interface BatchFitFigures {
  batchL: number;
  /** Volume at the safe fill line. */
  safeFillL: number;
  /** What the tank holds by its latest reading. */
  heldL: number;
  /** Safe fill volume minus what it holds; 0 when filled past the line. */
  freeL: number;
  /** Free space left after the batch; 0 when the batch does not fit. */
  leftL: number;
  /** The batch as a percentage of the free space; null when there is none. */
  percentOfFree: number | null;
}

/**
 * Whether the batch fits: 'fits'; 'tight' when it takes more than 90 % of the free space; 'over' when it
 * is larger than the free space (with the litres over); 'unknown' when there is no reading before the
 * start to measure from (a reading taken after the start may already hold the batch).
 */
export type BatchFit =
  | ({ verdict: 'fits' | 'tight' } & BatchFitFigures)
  | ({ verdict: 'over'; overL: number } & BatchFitFigures)
  | { verdict: 'unknown'; reason: 'no-reading' | 'reading-after-start'; batchL: number };

/** The fit verdict of a batch in its vessel, with the figures in L; throws RangeError for a negative batch or a bad geometry. */
export function batchFit(input: BatchFitInput): BatchFit {
  const batchL = nonNegative('batchL', input.batchL);
  if (!input.latest) return { verdict: 'unknown', reason: 'no-reading', batchL };
  if (Date.parse(input.latest.takenAt) > Date.parse(input.startedAt)) return { verdict: 'unknown', reason: 'reading-after-start', batchL };
  const model = tankModel(input.geometry);
  const lineMm = Math.min(model.heightMm, Math.max(0, input.safeFillLevelMm));
  const safeFillL = model.volumeL(lineMm);
  const heldL = input.latest.grossL;
  const freeL = Math.max(0, safeFillL - heldL);
  const figures = { batchL, safeFillL, heldL, freeL, leftL: Math.max(0, freeL - batchL), percentOfFree: freeL > 0 ? (batchL / freeL) * 100 : null };
  // A hair of float noise must not refuse a batch worked out to fill exactly to the line.
  const slackL = 1e-9 * Math.max(1, safeFillL);
  if (batchL > freeL + slackL) return { verdict: 'over', overL: batchL - freeL, ...figures };
  if (batchL > freeL * (1 - BATCH_FIT_WARN_SHARE)) return { verdict: 'tight', ...figures };
  return { verdict: 'fits', ...figures };
}

const litres = (v: number) => `${formatNumberTrimmed(v, 1)} L`;

/** The sentence the server refuses an over-full batch with (litres); the form words it in the reader's units. */
export function batchOverText(fit: Extract<BatchFit, { verdict: 'over' }>): string {
  return `the batch of ${litres(fit.batchL)} is ${litres(fit.overL)} more than the tank's free space: it holds ${litres(fit.heldL)} and ${litres(fit.safeFillL)} reaches its safe fill line, leaving ${litres(fit.freeL)}`;
}

/** One input a brew takes more of than the farm holds, in the input's own unit. */
export interface InputShortfall {
  inputId: number;
  /** Every line of the brew that takes this input (0-based). */
  lines: number[];
  wanted: number;
  onHand: number;
  missing: number;
}

/**
 * The inputs a brew's lines take more of than is on hand (lines of one input added up), in each
 * input's unit; inputs not in `onHand` are left to the server to refuse.
 */
export function inputShortfalls(lines: readonly { inputId: number; quantity: number }[], onHand: ReadonlyMap<number, number>): InputShortfall[] {
  const wanted = new Map<number, { total: number; lines: number[] }>();
  for (const [i, line] of lines.entries()) {
    const entry = wanted.get(line.inputId) ?? { total: 0, lines: [] };
    entry.total += nonNegative(`inputs.${i}.quantity`, line.quantity);
    entry.lines.push(i);
    wanted.set(line.inputId, entry);
  }
  const out: InputShortfall[] = [];
  for (const [inputId, { total, lines: at }] of wanted) {
    const held = onHand.get(inputId);
    if (held === undefined) continue;
    const available = Math.max(0, held);
    // The same tolerance the server's stock check allows, so the form and the server agree.
    if (total - available > 1e-9) out.push({ inputId, lines: at, wanted: total, onHand: available, missing: total - available });
  }
  return out;
}
