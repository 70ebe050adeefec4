import { finiteNumber, nonNegative, positive } from '../checks';
import { zForServiceLevel } from './normal';

/**
 * Economic order quantity √(2·D·S/H) in units, for annual demand D (units/year), order cost S
 * (money/order) and holding cost H (money/unit/year). Throws RangeError for H ≤ 0 or negative D or S.
 */
export function economicOrderQuantity(
  annualDemand: number,
  orderCost: number,
  holdingCostPerUnitPerYear: number,
): number {
  const d = nonNegative('annualDemand', annualDemand);
  const s = nonNegative('orderCost', orderCost);
  const h = positive('holdingCostPerUnitPerYear', holdingCostPerUnitPerYear);
  return Math.sqrt((2 * d * s) / h);
}

/** What safetyStock needs: demand spread per period, lead time in the same periods, cycle service level. */
export interface SafetyStockInput {
  /** Standard deviation of demand per period (units/period; a day, or any one period). */
  dailyDemandSd: number;
  /** Lead time in the same periods (days, or whatever period the demand is stated in). */
  leadTimeDays: number;
  /** Probability of no stock-out during a lead time, 0.5 ≤ p < 1. */
  serviceLevel: number;
}

/** What reorderPoint needs: SafetyStockInput plus mean demand per period. */
export interface ReorderPointInput extends SafetyStockInput {
  /** Mean demand per period (units/period). */
  dailyDemand: number;
}

function checkedServiceLevel(value: number): number {
  const p = finiteNumber('serviceLevel', value);
  // Below 50 % the formula gives negative safety stock, which no buyer means to plan for.
  if (p < 0.5 || p >= 1) throw new RangeError(`serviceLevel must be at least 0.5 and below 1 (got ${p})`);
  return p;
}

/** Safety stock z·σ_d·√L in units, z the standard normal quantile of the service level. */
export function safetyStock(input: SafetyStockInput): number {
  const sd = nonNegative('dailyDemandSd', input.dailyDemandSd);
  const lead = nonNegative('leadTimeDays', input.leadTimeDays);
  const p = checkedServiceLevel(input.serviceLevel);
  return zForServiceLevel(p) * sd * Math.sqrt(lead);
}

/** Reorder point d·L + z·σ_d·√L in units (mean lead-time demand plus safety stock). */
export function reorderPoint(input: ReorderPointInput): number {
  const d = nonNegative('dailyDemand', input.dailyDemand);
  const lead = nonNegative('leadTimeDays', input.leadTimeDays);
  return d * lead + safetyStock(input);
}
