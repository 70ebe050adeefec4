import { finiteNumber, nonNegative, wholeCount } from '../checks';
import { MS_PER_DAY } from '../forecast';

/** The kinds of stock movement a buyer or worker records. */
export const STOCK_MOVEMENT_KINDS = ['receipt', 'use', 'count', 'adjustment'] as const;
/** One kind of stock movement. */
export type StockMovementKind = (typeof STOCK_MOVEMENT_KINDS)[number];

/** One recorded movement of a purchased input. */
export interface StockMovement {
  /** receipt adds, use subtracts, adjustment adds its signed quantity, count sets the level. */
  kind: StockMovementKind;
  /** Units of the input (any one unit per input: L, kg, bags). Only adjustments may be negative. */
  quantity: number;
  /** When it happened (epoch ms). */
  at: number;
}

/** A stock count compared with the level the records predicted just before it. */
export interface CountDifference {
  /** When the count was taken (epoch ms). */
  at: number;
  /** Level the movements predicted (units). */
  expected: number;
  /** Level counted (units). */
  counted: number;
  /** counted − expected (units): negative means unrecorded use or loss. */
  difference: number;
}

/** Result of stockOnHand. */
export interface StockOnHand {
  /** Units on hand after the last movement; negative when more use was recorded than stock. */
  onHand: number;
  /** One entry per count, in time order. */
  countDifferences: CountDifference[];
}

function checkedMovements(movements: readonly StockMovement[]): StockMovement[] {
  if (!Array.isArray(movements)) throw new RangeError('movements must be an array');
  return movements.map((m, i) => {
    const field = `movements[${i}]`;
    if (!m || !STOCK_MOVEMENT_KINDS.includes(m.kind)) {
      throw new RangeError(`${field}.kind must be one of ${STOCK_MOVEMENT_KINDS.join(', ')} (got ${String(m?.kind)})`);
    }
    const quantity =
      m.kind === 'adjustment' ? finiteNumber(`${field}.quantity`, m.quantity) : nonNegative(`${field}.quantity`, m.quantity);
    return { kind: m.kind, quantity, at: finiteNumber(`${field}.at`, m.at) };
  });
}

/**
 * Units on hand from movements taken in time order (starting from 0), and the difference found at
 * each count. At equal times, counts come after the other movements, since a count states the level
 * once everything at that moment is done; otherwise input order is kept.
 */
export function stockOnHand(movements: readonly StockMovement[]): StockOnHand {
  const ordered = checkedMovements(movements)
    .map((m, index) => ({ m, index }))
    .sort((a, b) => a.m.at - b.m.at || Number(a.m.kind === 'count') - Number(b.m.kind === 'count') || a.index - b.index);
  let onHand = 0;
  const countDifferences: CountDifference[] = [];
  for (const { m } of ordered) {
    switch (m.kind) {
      case 'receipt':
      case 'adjustment':
        onHand += m.quantity;
        break;
      case 'use':
        onHand -= m.quantity;
        break;
      case 'count':
        countDifferences.push({ at: m.at, expected: onHand, counted: m.quantity, difference: m.quantity - onHand });
        onHand = m.quantity;
        break;
    }
  }
  return { onHand, countDifferences };
}

/** Window for demandFromMovements. */
export interface DemandWindow {
  /** Number of 24-hour periods ending at `now` (a whole number ≥ 1). */
  windowDays: number;
  /** End of the window (epoch ms). */
  now: number;
}

/** Result of demandFromMovements. */
export interface DemandEstimate {
  /** Mean use per day over the window (units/day). */
  dailyMean: number;
  /** Sample standard deviation of use per day over the window (units/day); 0 for a one-day window. */
  dailySd: number;
}

/**
 * Mean and sample standard deviation of use per day (units/day) over the `windowDays` 24-hour
 * periods ending at `now`; days without use count as 0. Periods are (now − (k+1)·24 h, now − k·24 h],
 * so a use recorded exactly at `now` counts. Only `use` movements are demand: receipts, adjustments
 * and count differences are not.
 */
export function demandFromMovements(movements: readonly StockMovement[], window: DemandWindow): DemandEstimate {
  const days = wholeCount('windowDays', window?.windowDays);
  const now = finiteNumber('now', window?.now);
  const perDay = new Array<number>(days).fill(0);
  for (const m of checkedMovements(movements)) {
    if (m.kind !== 'use' || m.at > now) continue;
    const bin = Math.floor((now - m.at) / MS_PER_DAY);
    if (bin < days) perDay[bin] += m.quantity;
  }
  const dailyMean = perDay.reduce((sum, q) => sum + q, 0) / days;
  const dailySd =
    days < 2 ? 0 : Math.sqrt(perDay.reduce((sum, q) => sum + (q - dailyMean) ** 2, 0) / (days - 1));
  return { dailyMean, dailySd };
}
