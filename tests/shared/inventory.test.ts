import { describe, expect, it } from 'vitest';
// @ts-expect-error jstat 1.9.6 ships no type declarations; its shape is pinned just below.
import jStatUntyped from 'jstat';
import {
  demandFromMovements,
  economicOrderQuantity,
  orderByDate,
  reorderPoint,
  roundUpToPack,
  safetyStock,
  stockOnHand,
  suggestOrder,
  zForServiceLevel,
  type StockMovement,
} from '@shared/inventory';

/** The part of jStat's default export these tests use (jStat.normal, mean and sd as arguments). */
const jStat = jStatUntyped as { normal: { inv(p: number, mean: number, sd: number): number } };

const DAY = 86_400_000;
const T0 = Date.UTC(2025, 3, 7); // Monday 7 April 2025, an invented scenario

describe('economicOrderQuantity', () => {
  // Worked examples of Q* = √(2DS/H); [source, D units/year, S money/order, H money/unit/year, Q*, digits].
  it.each([
    // Heizer & Render, Operations Management, ch. 12 "Inventory Management", Example 3 (Sharp, Inc.,
    // hypodermic needles): D = 1,000, S = $10, H = $0.50 → Q* = √40,000 = 200. Problem text and answer
    // as reproduced from the book online (holooly.com, "Q. 12.EX.3"); edition and page not re-checked.
    ['Heizer & Render, Operations Management, ch. 12 Example 3', 1000, 10, 0.5, 200, 9],
    // Same example, its Learning Exercise: D rises to 1,200 → Q* = 219 units (book rounds 219.09).
    ['Heizer & Render, ch. 12 Example 3, Learning Exercise', 1200, 10, 0.5, 219, 0],
    // Stevenson, Operations Management, ch. "Inventory Management", tire distributor example:
    // 9,600 tires/year, carrying cost $16/tire/year, ordering cost $75 → Q0 = √90,000 = 300 tires.
    // Recalled from memory of the book (the problem and answer 300 also appear in online answer sites);
    // edition and page not re-checked.
    ['Stevenson, Operations Management, tire distributor EOQ (recalled from memory)', 9600, 75, 16, 300, 9],
    // Chopra & Meindl, Supply Chain Management, ch. "Managing Economies of Scale in a Supply Chain",
    // Best Buy Deskpro example: 1,000 units/month (D = 12,000/year), S = $4,000, h = 20 % of C = $500
    // (H = $100) → Q* = 980 (√960,000 = 979.8). Recalled from memory, not re-checked.
    ['Chopra & Meindl, Supply Chain Management, Best Buy EOQ (recalled from memory)', 12000, 4000, 100, 980, 0],
  ])('matches %s', (_source, d, s, h, expected, digits) => {
    const q = economicOrderQuantity(d, s, h);
    if (digits === 0) expect(Math.round(q)).toBe(expected);
    else expect(q).toBeCloseTo(expected, digits);
  });

  it('returns 0 units when there is no demand or no order cost', () => {
    expect(economicOrderQuantity(0, 10, 1)).toBe(0);
    expect(economicOrderQuantity(100, 0, 1)).toBe(0);
  });

  it.each([
    [1000, 10, 0, /holdingCostPerUnitPerYear/],
    [1000, 10, -1, /holdingCostPerUnitPerYear/],
    [-1, 10, 1, /annualDemand/],
    [1000, -5, 1, /orderCost/],
    [Number.NaN, 10, 1, /annualDemand/],
  ])('throws a RangeError naming the field when D=%s S=%s H=%s', (d, s, h, field) => {
    expect(() => economicOrderQuantity(d, s, h)).toThrow(RangeError);
    expect(() => economicOrderQuantity(d, s, h)).toThrow(field);
  });
});

describe('reorderPoint', () => {
  it.each([
    // Heizer & Render, Operations Management, ch. 12 Example 7 (iPhones): D = 8,000/year over a
    // 250-day working year → d = 32/day, L = 3 days, ROP = 96 units (no safety stock). As reproduced
    // online (holooly.com, "Q. 12.EX.7"); edition and page not re-checked.
    ['Heizer & Render, ch. 12 Example 7', 8000 / 250, 3, 96],
    // Same example, Learning Exercise: 200 working days → d = 40/day, ROP = 120 units.
    ['Heizer & Render, ch. 12 Example 7, Learning Exercise', 8000 / 200, 3, 120],
  ])('matches %s with steady demand', (_source, d, lead, expected) => {
    expect(reorderPoint({ dailyDemand: d, dailyDemandSd: 0, leadTimeDays: lead, serviceLevel: 0.95 })).toBeCloseTo(expected, 9);
  });

  // Stevenson, Operations Management, ch. "Inventory Management", construction supply house (sand):
  // lead-time demand normal with mean 50 tons and σ 5 tons, stock-out risk 3 % → z = 1.88 (table),
  // safety stock 9.40 tons, ROP 59.40 tons. Problem and solution as reproduced online (studymode.com
  // "ROP POM"), which quotes the book's Appendix B Table B; edition and page not re-checked. The
  // lead-time figures are taken as one period (L = 1), which the formula allows: any consistent unit.
  it('matches Stevenson, sand supply example, to the table z of 1.88', () => {
    const input = { dailyDemand: 50, dailyDemandSd: 5, leadTimeDays: 1, serviceLevel: 0.97 };
    // Table z is rounded to 1.88; ours is 1.8808, so 0.005 tons of slack covers the rounding.
    expect(safetyStock(input)).toBeCloseTo(9.4, 2);
    expect(reorderPoint(input)).toBeCloseTo(59.4, 2);
  });

  // Stevenson, Operations Management, restaurant special sauce: 50 jars/week, σ = 3 jars/week,
  // lead time 2 weeks, 10 % stock-out risk → z = 1.28, ROP = 100 + 1.28·3·√2 = 105.43 jars.
  // Recalled from memory of the book (problem text seen reproduced online), not re-checked.
  it('matches Stevenson, special sauce example, in weeks', () => {
    const rop = reorderPoint({ dailyDemand: 50, dailyDemandSd: 3, leadTimeDays: 2, serviceLevel: 0.9 });
    // Book's z = 1.28 gives 105.43; exact z = 1.28155 gives 105.437.
    expect(Math.abs(rop - 105.43)).toBeLessThan(0.01);
  });

  it('adds z·σ·√L to d·L when demand varies (hand computation)', () => {
    // d = 12 L/day, σ = 4 L/day, L = 9 days, z(0.95) = 1.6448536: 108 + 1.6448536 × 4 × 3 = 127.738243.
    expect(reorderPoint({ dailyDemand: 12, dailyDemandSd: 4, leadTimeDays: 9, serviceLevel: 0.95 })).toBeCloseTo(127.738243, 5);
  });

  it.each([
    [{ dailyDemand: -1, dailyDemandSd: 1, leadTimeDays: 2, serviceLevel: 0.9 }, /dailyDemand/],
    [{ dailyDemand: 1, dailyDemandSd: -1, leadTimeDays: 2, serviceLevel: 0.9 }, /dailyDemandSd/],
    [{ dailyDemand: 1, dailyDemandSd: 1, leadTimeDays: -2, serviceLevel: 0.9 }, /leadTimeDays/],
    [{ dailyDemand: 1, dailyDemandSd: 1, leadTimeDays: 2, serviceLevel: 0.4 }, /serviceLevel/],
    [{ dailyDemand: 1, dailyDemandSd: 1, leadTimeDays: 2, serviceLevel: 1 }, /serviceLevel/],
  ])('throws a RangeError naming the field for %o', (input, field) => {
    expect(() => reorderPoint(input)).toThrow(field);
  });
});

describe('zForServiceLevel', () => {
  // Standard normal table values (any standard normal table, e.g. the one in each book above).
  it.each([
    [0.95, 1.644854],
    [0.975, 1.959964],
    [0.99, 2.326348],
    [0.9, 1.281552],
    [0.5, 0],
    [0.05, -1.644854],
  ])('gives the table value z(%s) = %s', (p, z) => {
    expect(Math.abs(zForServiceLevel(p) - z)).toBeLessThan(5e-7);
  });

  it('agrees with jStat.normal.inv to 1e-6 across p from 1e-10 to 1 − 1e-10', () => {
    const ps: number[] = [];
    for (let i = 1; i < 2000; i++) ps.push(i / 2000);
    for (let e = 3; e <= 10; e++) ps.push(10 ** -e, 1 - 10 ** -e, 2.5 * 10 ** -e, 7 * 10 ** -e);
    ps.push(0.02425, 0.97575, 0.075, 0.925); // region edges of common approximations
    for (const p of ps) {
      expect(Math.abs(zForServiceLevel(p) - jStat.normal.inv(p, 0, 1)), `p = ${p}`).toBeLessThan(1e-6);
    }
  });

  it.each([0, 1, -0.1, 1.5, Number.NaN])('throws a RangeError for p = %s', (p) => {
    expect(() => zForServiceLevel(p)).toThrow(RangeError);
    expect(() => zForServiceLevel(p)).toThrow(/serviceLevel/);
  });
});

describe('stockOnHand', () => {
  it('adds receipts, subtracts use and lets a count set the level (hand computation)', () => {
    const movements: StockMovement[] = [
      // Out of order on purpose: the function sorts by time.
      { kind: 'use', quantity: 30, at: T0 + 2 * DAY },
      { kind: 'receipt', quantity: 200, at: T0 },
      { kind: 'count', quantity: 150, at: T0 + 3 * DAY },
      { kind: 'adjustment', quantity: -5, at: T0 + 4 * DAY },
      { kind: 'use', quantity: 12, at: T0 + DAY },
      { kind: 'count', quantity: 150, at: T0 + 5 * DAY },
    ];
    // 200 − 12 − 30 = 158 expected at the first count, 150 counted (−8 unrecorded); then −5 → 145
    // expected at the second count, 150 counted (+5).
    const result = stockOnHand(movements);
    expect(result.onHand).toBe(150);
    expect(result.countDifferences).toEqual([
      { at: T0 + 3 * DAY, expected: 158, counted: 150, difference: -8 },
      { at: T0 + 5 * DAY, expected: 145, counted: 150, difference: 5 },
    ]);
  });

  it('applies a count after the other movements of the same instant', () => {
    const result = stockOnHand([
      { kind: 'count', quantity: 40, at: T0 },
      { kind: 'receipt', quantity: 100, at: T0 },
    ]);
    expect(result.onHand).toBe(40);
    expect(result.countDifferences[0]).toMatchObject({ expected: 100, difference: -60 });
  });

  it('returns 0 on hand for no movements', () => {
    expect(stockOnHand([])).toEqual({ onHand: 0, countDifferences: [] });
  });

  it.each([
    [{ kind: 'use', quantity: -1, at: T0 }, /movements\[0\]\.quantity/],
    [{ kind: 'sale', quantity: 1, at: T0 }, /movements\[0\]\.kind/],
    [{ kind: 'receipt', quantity: 1, at: Number.NaN }, /movements\[0\]\.at/],
  ])('throws a RangeError naming the field for %o', (movement, field) => {
    expect(() => stockOnHand([movement as StockMovement])).toThrow(field);
  });
});

describe('demandFromMovements', () => {
  it('averages use per day with empty days as 0 (hand computation)', () => {
    const now = T0 + 4 * DAY;
    const movements: StockMovement[] = [
      { kind: 'use', quantity: 6, at: now - 1 * 3_600_000 }, // period 0
      { kind: 'use', quantity: 4, at: now - 20 * 3_600_000 }, // period 0
      { kind: 'use', quantity: 2, at: now - DAY - 1 }, // period 1
      { kind: 'receipt', quantity: 500, at: now - 2 * 3_600_000 }, // not demand
      { kind: 'use', quantity: 8, at: now - 3 * DAY - 5 }, // period 3
      { kind: 'use', quantity: 99, at: now - 4 * DAY - 5 }, // outside a 4-day window
    ];
    // Per day [10, 2, 0, 8]: mean 5; deviations 5, −3, −5, 3 → Σ² = 68, /3 → sd = √(68/3) = 4.760952.
    const result = demandFromMovements(movements, { windowDays: 4, now });
    expect(result.dailyMean).toBeCloseTo(5, 12);
    expect(result.dailySd).toBeCloseTo(4.760952, 6);
  });

  it('gives sd 0 for a one-day window', () => {
    expect(demandFromMovements([{ kind: 'use', quantity: 3, at: T0 }], { windowDays: 1, now: T0 })).toEqual({
      dailyMean: 3,
      dailySd: 0,
    });
  });

  it('throws a RangeError naming windowDays when it is not a whole number ≥ 1', () => {
    expect(() => demandFromMovements([], { windowDays: 0, now: T0 })).toThrow(/windowDays/);
    expect(() => demandFromMovements([], { windowDays: 2.5, now: T0 })).toThrow(/windowDays/);
  });
});

// Rounding the EOQ (or the shortfall) up to whole packs and to the supplier's minimum order:
// common practice, no published source. The EOQ itself stays the computation checked above.
describe('roundUpToPack', () => {
  it.each([
    [37, 10, 0, 40],
    [40, 10, 0, 40],
    [12, 20, 50, 60], // minimum 50 rounded up to whole 20-unit packs
    [1.1, 0.1, 0, 1.1],
    [0, 25, 100, 0],
    [-3, 25, 100, 0],
  ])('turns %s units with packs of %s and minimum %s into %s', (q, pack, minimum, expected) => {
    expect(roundUpToPack(q, pack, minimum)).toBeCloseTo(expected, 9);
  });

  it('throws a RangeError naming packSize when it is not positive', () => {
    expect(() => roundUpToPack(10, 0, 0)).toThrow(/packSize/);
  });
});

describe('orderByDate', () => {
  it('projects the day stock reaches the reorder point (hand computation)', () => {
    // (500 − 140) / 24 = 15 days.
    expect(orderByDate({ now: T0, onHand: 500, dailyDemand: 24, reorderPoint: 140 })).toBe(T0 + 15 * DAY);
  });

  it('returns now when stock is already at or below the reorder point', () => {
    expect(orderByDate({ now: T0, onHand: 140, dailyDemand: 24, reorderPoint: 140 })).toBe(T0);
  });

  it('returns null when there is no demand', () => {
    expect(orderByDate({ now: T0, onHand: 500, dailyDemand: 0, reorderPoint: 140 })).toBeNull();
  });
});

describe('suggestOrder', () => {
  const base = {
    now: T0,
    onHand: 300,
    dailyDemand: 10,
    dailyDemandSd: 3,
    leadTimeDays: 4,
    serviceLevel: 0.95,
    orderCost: 25,
    holdingCostPerUnitPerYear: 1.46,
    packSize: 20,
    minimumOrder: 100,
  };

  it('combines reorder point, EOQ, packs and dates (hand computation)', () => {
    // ROP = 10 × 4 + 1.6448536 × 3 × 2 = 49.869122; EOQ = √(2 × 3650 × 25 / 1.46) = √125,000 = 353.553;
    // rounded up to 20-unit packs = 360; order-by = (300 − 49.869122) / 10 = 25.0130878 days from now.
    const s = suggestOrder(base);
    expect(s.reorderPoint).toBeCloseTo(49.869122, 5);
    expect(s.safetyStock).toBeCloseTo(9.869122, 5);
    expect(s.eoq).toBeCloseTo(353.553391, 5);
    expect(s.suggestedQuantity).toBe(360);
    expect(s.orderBy! - T0).toBeCloseTo(25.0130878 * DAY, -1);
    expect(s.daysOfCover).toBe(30);
    expect(s.due).toBe(false);
  });

  it('orders at least back up to the reorder point when stock is far below it', () => {
    // EOQ 3.53 is tiny next to a reorder point of 1,000 + 1.6448536 × 3 × 10 = 1,049.35 with L = 100 days;
    // on hand 50 + on order 100 → need 899.35 → 900 in 20-unit packs.
    const s = suggestOrder({ ...base, onHand: 50, onOrder: 100, leadTimeDays: 100, orderCost: 0.0025 });
    expect(s.due).toBe(true);
    expect(s.orderBy).toBe(T0);
    expect(s.suggestedQuantity).toBe(900);
  });

  it('suggests nothing and no date when there is no demand and stock is above the reorder point', () => {
    const s = suggestOrder({ ...base, dailyDemand: 0, dailyDemandSd: 0 });
    expect(s).toMatchObject({ eoq: 0, suggestedQuantity: 0, orderBy: null, daysOfCover: Infinity, due: false });
  });
});
