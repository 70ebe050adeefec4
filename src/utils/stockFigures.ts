// The words and numbers around a tank's stock figures (shared/readings stockFigures), the same on the
// round, the stock board, the farm page and the tank page.
import type { StockFigures } from '@shared/readings';
import { formatNumber, formatVolume, type UnitSystem } from '@shared/units';

/** What the main figure is called. */
export const USABLE_NAME = 'usable';
/** What the secondary figure is called. */
export const TOTAL_NAME = 'in the tank';
/** What the percentage is of, and what that means. */
export const USABLE_CAPACITY_NAME = 'usable capacity';
export const USABLE_CAPACITY_MEANING = 'Usable capacity: the litres between the outlet and the safe fill line. Usable: the litres above the outlet, the ones that can be drawn off.';

/** The figures as text in the user's units: "27,157 L", "29,900 L", "52 %" (null without a usable capacity), "52,203 L". */
export function stockTexts(f: StockFigures, system: UnitSystem): { usable: string; total: string; percent: string | null; capacity: string } {
  return {
    usable: formatVolume(f.usableL, system),
    total: formatVolume(f.totalL, system),
    percent: f.percentOfUsableCapacity === null ? null : `${formatNumber(f.percentOfUsableCapacity, 0)} %`,
    capacity: formatVolume(f.usableCapacityL, system),
  };
}

/** One sentence for screen readers: "27,157 L usable, 52 % of the 52,203 L usable capacity; 29,900 L in the tank". */
export function stockSentence(f: StockFigures, system: UnitSystem): string {
  const t = stockTexts(f, system);
  const share = t.percent === null ? '' : `, ${t.percent} of the ${t.capacity} ${USABLE_CAPACITY_NAME}`;
  return `${t.usable} ${USABLE_NAME}${share}; ${t.total} ${TOTAL_NAME}`;
}
