import { finiteNumber, nonNegative, positive } from '../checks';

/**
 * Volume of concentrate V1 = C2·V2 / C1 (unit of finalVolume) that makes finalVolume at
 * finalStrength from stock at stockStrength (both strengths in one unit: %, g/L, ppm).
 * Throws RangeError for non-positive values or a final strength above the stock's.
 */
export function concentrateVolume(stockStrength: number, finalStrength: number, finalVolume: number): number {
  const c1 = positive('stockStrength', stockStrength);
  const c2 = positive('finalStrength', finalStrength);
  const v2 = positive('finalVolume', finalVolume);
  if (c2 > c1) {
    throw new RangeError(`finalStrength (${c2}) cannot be above stockStrength (${c1}): dilution only weakens`);
  }
  return (c2 * v2) / c1;
}

/** The two ways a dilution ratio "1 : n" is read. */
export const RATIO_CONVENTIONS = ['parts-water', 'parts-total'] as const;
/**
 * 'parts-water': 1 part concentrate to n parts water (n + 1 parts in all);
 * 'parts-total': 1 part concentrate in n parts of finished mix.
 */
export type RatioConvention = (typeof RATIO_CONVENTIONS)[number];

/** Split of a finished mix into concentrate and water (both in the unit of the total volume). */
export interface MixSplit {
  concentrate: number;
  water: number;
}

/**
 * Concentrate and water (unit of totalVolume) for totalVolume of a "1 : n" mix read by `convention`:
 * 'parts-water' gives concentrate = total/(n + 1), 'parts-total' gives concentrate = total/n.
 */
export function mixFromRatio(totalVolume: number, n: number, convention: RatioConvention): MixSplit {
  const total = nonNegative('totalVolume', totalVolume);
  const parts = finiteNumber('n', n);
  let concentrate: number;
  if (convention === 'parts-water') {
    if (parts < 0) throw new RangeError(`n must not be negative for 1 part to n parts water (got ${parts})`);
    concentrate = total / (parts + 1);
  } else if (convention === 'parts-total') {
    if (parts < 1) throw new RangeError(`n must be at least 1 for 1 part in n parts total (got ${parts})`);
    concentrate = total / parts;
  } else {
    throw new RangeError(`convention must be one of ${RATIO_CONVENTIONS.join(', ')} (got ${String(convention)})`);
  }
  return { concentrate, water: total - concentrate };
}

/** Both readings of one ratio number, for a form to show side by side. */
export interface RatioReadings {
  /** Reading "1 part to n parts water", with the total it makes. */
  partsWater: string;
  /** Reading "1 part in n total", with the water it needs; null when n < 1 (no such mix). */
  partsTotal: string | null;
}

function formatParts(x: number): string {
  return String(Number(x.toFixed(3)));
}

function partsOfWater(x: number): string {
  return x === 1 ? '1 part water' : `${formatParts(x)} parts water`;
}

/**
 * Both plain-language readings of "1 : n" (text), e.g. for n = 100: "1 part to 100 parts water =
 * 1 in 101 total" and "1 part in 100 total = 1 part to 99 parts water".
 */
export function describeRatio(n: number): RatioReadings {
  const parts = positive('n', n);
  const partsWater = `1 part to ${partsOfWater(parts)} = 1 in ${formatParts(parts + 1)} total`;
  const partsTotal =
    parts < 1
      ? null
      : parts === 1
        ? '1 part in 1 total = concentrate only, no water'
        : `1 part in ${formatParts(parts)} total = 1 part to ${partsOfWater(parts - 1)}`;
  return { partsWater, partsTotal };
}
