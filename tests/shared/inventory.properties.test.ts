import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
// @ts-expect-error jstat 1.9.6 ships no type declarations; its shape is pinned just below.
import jStatUntyped from 'jstat';
import {
  demandFromMovements,
  economicOrderQuantity,
  reorderPoint,
  roundUpToPack,
  safetyStock,
  stockOnHand,
  suggestOrder,
  zForServiceLevel,
  type StockMovement,
} from '@shared/inventory';

const jStat = jStatUntyped as { normal: { inv(p: number, mean: number, sd: number): number } };

const DAY = 86_400_000;
const T0 = Date.UTC(2025, 3, 7);
const amount = fc.double({ min: 0.01, max: 1e6, noNaN: true });

function relClose(a: number, b: number, tol = 1e-12): boolean {
  return Math.abs(a - b) <= tol * Math.max(1, Math.abs(a), Math.abs(b));
}

describe('economicOrderQuantity properties', () => {
  it('scales with the square root of annual demand', () => {
    fc.assert(
      fc.property(amount, amount, amount, fc.double({ min: 0.01, max: 1e4, noNaN: true }), (d, s, h, k) => {
        expect(relClose(economicOrderQuantity(k * d, s, h), Math.sqrt(k) * economicOrderQuantity(d, s, h))).toBe(true);
      }),
    );
  });

  it('shrinks with the square root of the holding cost', () => {
    fc.assert(
      fc.property(amount, amount, amount, fc.double({ min: 0.01, max: 1e4, noNaN: true }), (d, s, h, k) => {
        expect(relClose(economicOrderQuantity(d, s, k * h), economicOrderQuantity(d, s, h) / Math.sqrt(k))).toBe(true);
      }),
    );
  });

  it('balances yearly ordering and holding cost at the optimum (D/Q·S = Q/2·H)', () => {
    fc.assert(
      fc.property(amount, amount, amount, (d, s, h) => {
        const q = economicOrderQuantity(d, s, h);
        expect(relClose((d / q) * s, (q / 2) * h, 1e-9)).toBe(true);
      }),
    );
  });
});

describe('zForServiceLevel properties', () => {
  it('agrees with jStat.normal.inv to 1e-6 for random p', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-10, max: 1 - 1e-10, noNaN: true }), (p) => {
        expect(Math.abs(zForServiceLevel(p) - jStat.normal.inv(p, 0, 1))).toBeLessThan(1e-6);
      }),
      { numRuns: 2000 },
    );
  });

  it('is odd about p = 0.5 and never decreasing', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 0.5, noNaN: true }), fc.double({ min: 1e-6, max: 0.5, noNaN: true }), (p, q) => {
        expect(Math.abs(zForServiceLevel(p) + zForServiceLevel(1 - p))).toBeLessThan(1e-8);
        if (p < q) expect(zForServiceLevel(p)).toBeLessThanOrEqual(zForServiceLevel(q));
      }),
    );
  });
});

describe('safetyStock and reorderPoint properties', () => {
  const policy = fc.record({
    dailyDemand: fc.double({ min: 0, max: 1e4, noNaN: true }),
    dailyDemandSd: fc.double({ min: 0, max: 1e3, noNaN: true }),
    leadTimeDays: fc.double({ min: 0, max: 365, noNaN: true }),
    serviceLevel: fc.double({ min: 0.5, max: 0.9999, noNaN: true }),
  });

  it('doubles the safety stock when the lead time is four times as long', () => {
    fc.assert(
      fc.property(policy, (p) => {
        expect(relClose(safetyStock({ ...p, leadTimeDays: 4 * p.leadTimeDays }), 2 * safetyStock(p), 1e-9)).toBe(true);
      }),
    );
  });

  it('never lowers the reorder point when the service level rises', () => {
    fc.assert(
      fc.property(policy, fc.double({ min: 0, max: 0.0999, noNaN: true }), (p, extra) => {
        const higher = Math.min(0.9999, p.serviceLevel + extra);
        expect(reorderPoint({ ...p, serviceLevel: higher })).toBeGreaterThanOrEqual(reorderPoint(p) - 1e-9);
      }),
    );
  });
});

const movementArb = fc.record({
  kind: fc.constantFrom('receipt', 'use', 'count', 'adjustment') as fc.Arbitrary<StockMovement['kind']>,
  quantity: fc.integer({ min: 0, max: 1000 }),
  at: fc.integer({ min: T0, max: T0 + 30 * DAY }),
  sign: fc.boolean(),
}).map(({ kind, quantity, at, sign }): StockMovement => ({ kind, at, quantity: kind === 'adjustment' && sign ? -quantity : quantity }));

describe('stockOnHand properties', () => {
  it('ends at recorded movements plus all count differences, whatever the input order', () => {
    // Distinct instants: two counts at one instant would make input order matter by design.
    const distinctMovements = fc.uniqueArray(movementArb, { maxLength: 40, selector: (m) => m.at });
    const withShuffle = distinctMovements.chain((ms) =>
      fc.tuple(fc.constant(ms), fc.shuffledSubarray(ms, { minLength: ms.length, maxLength: ms.length })),
    );
    fc.assert(
      fc.property(withShuffle, ([movements, shuffled]) => {
        const result = stockOnHand(movements);
        const recorded = movements.reduce(
          (sum, m) => sum + (m.kind === 'receipt' || m.kind === 'adjustment' ? m.quantity : m.kind === 'use' ? -m.quantity : 0),
          0,
        );
        const found = result.countDifferences.reduce((sum, c) => sum + c.difference, 0);
        expect(result.onHand).toBe(recorded + found);
        expect(stockOnHand(shuffled)).toEqual(result);
      }),
    );
  });

  it('equals the last count plus what was recorded after it', () => {
    fc.assert(
      fc.property(fc.array(movementArb, { maxLength: 40 }), (movements) => {
        const counts = movements.filter((m) => m.kind === 'count');
        fc.pre(counts.length > 0);
        const lastAt = Math.max(...counts.map((c) => c.at));
        const last = movements.filter((m) => m.kind === 'count' && m.at === lastAt).at(-1)!;
        const after = movements
          .filter((m) => m.at > lastAt && m.kind !== 'count')
          .reduce((sum, m) => sum + (m.kind === 'use' ? -m.quantity : m.quantity), 0);
        expect(stockOnHand(movements).onHand).toBe(last.quantity + after);
      }),
    );
  });
});

describe('demandFromMovements properties', () => {
  it('has a mean equal to the window total of use divided by the window days', () => {
    fc.assert(
      fc.property(fc.array(movementArb, { maxLength: 40 }), fc.integer({ min: 1, max: 30 }), (movements, windowDays) => {
        const now = T0 + 20 * DAY;
        const inWindow = movements
          .filter((m) => m.kind === 'use' && m.at <= now && m.at > now - windowDays * DAY)
          .reduce((sum, m) => sum + m.quantity, 0);
        const { dailyMean, dailySd } = demandFromMovements(movements, { windowDays, now });
        expect(dailyMean * windowDays).toBeCloseTo(inWindow, 6);
        expect(dailySd).toBeGreaterThanOrEqual(0);
      }),
    );
  });
});

describe('roundUpToPack properties', () => {
  it('gives whole packs, at least the need and the minimum, less than one pack over', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.001, max: 1e5, noNaN: true }),
        fc.integer({ min: 1, max: 500 }),
        fc.integer({ min: 0, max: 2000 }),
        (q, pack, minimum) => {
          const out = roundUpToPack(q, pack, minimum);
          const need = Math.max(q, minimum);
          expect(Number.isInteger(out / pack)).toBe(true);
          expect(out).toBeGreaterThanOrEqual(need * (1 - 1e-12));
          expect(out).toBeLessThan(need + pack);
        },
      ),
    );
  });
});

describe('suggestOrder properties', () => {
  it('is due exactly when stock plus on order is at or below the reorder point, and then covers the gap', () => {
    fc.assert(
      fc.property(
        fc.record({
          onHand: fc.integer({ min: 0, max: 5000 }),
          onOrder: fc.integer({ min: 0, max: 1000 }),
          dailyDemand: fc.double({ min: 0, max: 200, noNaN: true }),
          dailyDemandSd: fc.double({ min: 0, max: 50, noNaN: true }),
          leadTimeDays: fc.double({ min: 0, max: 60, noNaN: true }),
          serviceLevel: fc.double({ min: 0.5, max: 0.999, noNaN: true }),
          orderCost: fc.double({ min: 0, max: 500, noNaN: true }),
          holdingCostPerUnitPerYear: fc.double({ min: 0.01, max: 50, noNaN: true }),
          packSize: fc.integer({ min: 1, max: 100 }),
          minimumOrder: fc.integer({ min: 0, max: 500 }),
        }),
        (input) => {
          const s = suggestOrder({ now: T0, ...input });
          const position = input.onHand + input.onOrder;
          expect(s.due).toBe(position <= s.reorderPoint);
          expect(Number.isInteger(s.suggestedQuantity / input.packSize)).toBe(true);
          const need = Math.max(s.eoq, s.reorderPoint - position);
          if (need > 0) expect(s.suggestedQuantity).toBeGreaterThanOrEqual(Math.max(need, input.minimumOrder) - 1e-9);
          else expect(s.suggestedQuantity).toBe(0);
          if (s.due) {
            expect(position + s.suggestedQuantity).toBeGreaterThanOrEqual(s.reorderPoint - 1e-9);
            expect(s.orderBy).toBe(T0);
          }
        },
      ),
    );
  });
});
