import { finiteNumber, nonNegative, positive } from '../checks';
import { MS_PER_DAY } from '../forecast';
import { economicOrderQuantity, reorderPoint, safetyStock } from './policy';

/**
 * Order quantity in units: `quantity` raised to `minimumOrder` and then up to whole packs of
 * `packSize`; 0 when nothing is needed (quantity ≤ 0), since a minimum order only applies to an order.
 * Rounding up to whole packs is common practice, no published source.
 */
export function roundUpToPack(quantity: number, packSize: number, minimumOrder = 0): number {
  const q = finiteNumber('quantity', quantity);
  const pack = positive('packSize', packSize);
  const minimum = nonNegative('minimumOrder', minimumOrder);
  if (q <= 0) return 0;
  // The relative allowance keeps 1.1 L in 0.1 L packs at 11 packs although 1.1 / 0.1 = 11.000000000000002.
  const packs = Math.max(1, Math.ceil((Math.max(q, minimum) / pack) * (1 - 1e-12)));
  return packs * pack;
}

/** What orderByDate needs; quantities in units, demand in units/day. */
export interface OrderByInput {
  /** Current time (epoch ms). */
  now: number;
  /** Stock counted against the reorder point (units): on hand, or on hand plus on order. */
  onHand: number;
  /** Mean demand (units/day). */
  dailyDemand: number;
  /** Reorder point (units). */
  reorderPoint: number;
}

/**
 * When projected stock falls to the reorder point (epoch ms): `now` if it already has, null if
 * demand is 0 (it never will).
 */
export function orderByDate(input: OrderByInput): number | null {
  const now = finiteNumber('now', input.now);
  const onHand = finiteNumber('onHand', input.onHand);
  const demand = nonNegative('dailyDemand', input.dailyDemand);
  const rop = finiteNumber('reorderPoint', input.reorderPoint);
  if (onHand <= rop) return now;
  if (demand === 0) return null;
  return now + ((onHand - rop) / demand) * MS_PER_DAY;
}

/** Everything suggestOrder weighs for one purchased input. */
export interface SuggestOrderInput {
  /** Current time (epoch ms). */
  now: number;
  /** Units on hand now. */
  onHand: number;
  /** Units ordered and not yet received (default 0); counted with onHand against the reorder point. */
  onOrder?: number;
  /** Mean demand (units/day). */
  dailyDemand: number;
  /** Standard deviation of daily demand (units/day). */
  dailyDemandSd: number;
  /** Supplier lead time (days). */
  leadTimeDays: number;
  /** Cycle service level, 0.5 ≤ p < 1. */
  serviceLevel: number;
  /** Cost of placing one order (money/order). */
  orderCost: number;
  /** Cost of holding one unit for a year (money/unit/year), > 0. */
  holdingCostPerUnitPerYear: number;
  /** Units per pack the supplier sells, > 0. */
  packSize: number;
  /** Smallest order the supplier accepts (units, default 0). */
  minimumOrder?: number;
  /** Days per year used to turn daily demand into annual demand for the EOQ (default 365). */
  daysPerYear?: number;
}

/** Result of suggestOrder. */
export interface OrderSuggestion {
  /** Reorder point (units). */
  reorderPoint: number;
  /** Safety stock inside the reorder point (units). */
  safetyStock: number;
  /** Economic order quantity before pack rounding (units). */
  eoq: number;
  /** Units to order (whole packs, at least the minimum order), or 0 when nothing is needed. */
  suggestedQuantity: number;
  /** When stock on hand plus on order reaches the reorder point (epoch ms), or null with no demand. */
  orderBy: number | null;
  /** Days the stock on hand lasts at mean demand (days; Infinity with no demand, 0 when none on hand). */
  daysOfCover: number;
  /** True when stock on hand plus on order is at or below the reorder point. */
  due: boolean;
}

/**
 * Reorder advice for one input (units, days, epoch ms). The suggested quantity is the larger of the
 * EOQ and what lifts stock on hand plus on order back to the reorder point, rounded up to whole packs
 * and to at least the minimum order; it is 0 only when both are 0 (no demand and stock above the
 * reorder point).
 */
export function suggestOrder(input: SuggestOrderInput): OrderSuggestion {
  const onHand = finiteNumber('onHand', input.onHand);
  const onOrder = nonNegative('onOrder', input.onOrder ?? 0);
  const dailyDemand = nonNegative('dailyDemand', input.dailyDemand);
  const daysPerYear = positive('daysPerYear', input.daysPerYear ?? 365);
  const policy = {
    dailyDemand,
    dailyDemandSd: input.dailyDemandSd,
    leadTimeDays: input.leadTimeDays,
    serviceLevel: input.serviceLevel,
  };
  const rop = reorderPoint(policy);
  const ss = safetyStock(policy);
  const eoq = economicOrderQuantity(dailyDemand * daysPerYear, input.orderCost, input.holdingCostPerUnitPerYear);
  const position = onHand + onOrder;
  const suggestedQuantity = roundUpToPack(Math.max(eoq, rop - position), input.packSize, input.minimumOrder ?? 0);
  const orderBy = orderByDate({ now: input.now, onHand: position, dailyDemand, reorderPoint: rop });
  const daysOfCover = onHand <= 0 ? 0 : dailyDemand === 0 ? Infinity : onHand / dailyDemand;
  return { reorderPoint: rop, safetyStock: ss, eoq, suggestedQuantity, orderBy, daysOfCover, due: position <= rop };
}
