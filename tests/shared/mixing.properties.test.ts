import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { concentratePerVolume, concentrateVolume, dosingRate, injectionRatio, mixFromRatio, topUpPlan } from '@shared/mixing';

const strength = fc.double({ min: 0.001, max: 1e5, noNaN: true });
const volume = fc.double({ min: 0.001, max: 1e5, noNaN: true });
const close = (a: number, b: number, tol = 1e-9) => Math.abs(a - b) <= tol * Math.max(1, Math.abs(a), Math.abs(b));

describe('concentrateVolume properties', () => {
  it('keeps the amount of active ingredient: C1·V1 = C2·V2', () => {
    fc.assert(
      fc.property(strength, strength, volume, (a, b, v2) => {
        const [c1, c2] = a >= b ? [a, b] : [b, a];
        const v1 = concentrateVolume(c1, c2, v2);
        expect(close(c1 * v1, c2 * v2)).toBe(true);
        expect(v1).toBeLessThanOrEqual(v2 * (1 + 1e-12));
      }),
    );
  });
});

describe('mixFromRatio properties', () => {
  it('reads "1 to n parts water" as "1 in n + 1 total" and always adds up to the total', () => {
    fc.assert(
      fc.property(volume, fc.double({ min: 0, max: 1e4, noNaN: true }), (total, n) => {
        const water = mixFromRatio(total, n, 'parts-water');
        const inTotal = mixFromRatio(total, n + 1, 'parts-total');
        expect(close(water.concentrate, inTotal.concentrate)).toBe(true);
        expect(close(water.concentrate + water.water, total)).toBe(true);
        expect(close(water.water / water.concentrate, n, 1e-6)).toBe(true);
      }),
    );
  });
});

describe('topUpPlan properties', () => {
  // Target volume drawn relative to the current one, so that most cases are plannable and every
  // refusal still turns up.
  const hundredths = (min: number, max: number) => fc.integer({ min: min * 100, max: max * 100 }).map((x) => x / 100);
  const input = fc
    .record({
      currentVolume: hundredths(0, 1000),
      currentStrength: hundredths(0, 30),
      addL: hundredths(-100, 900),
      targetStrength: hundredths(0, 30),
      stockStrength: hundredths(1, 100),
      ullageL: hundredths(0, 1000),
    })
    .map(({ addL, ...rest }) => ({ ...rest, targetVolume: Math.max(1, rest.currentVolume + addL) }));

  it('plans only mixes that balance volume and ingredient and fit below the fill line', () => {
    fc.assert(
      fc.property(input, (i) => {
        const plan = topUpPlan(i);
        if (!plan.ok) return;
        expect(plan.concentrate).toBeGreaterThanOrEqual(0);
        expect(plan.water).toBeGreaterThanOrEqual(0);
        expect(close(i.currentVolume + plan.concentrate + plan.water, i.targetVolume, 1e-8)).toBe(true);
        const ingredient = i.currentStrength * i.currentVolume + i.stockStrength * plan.concentrate;
        expect(Math.abs(ingredient - i.targetStrength * i.targetVolume)).toBeLessThanOrEqual(1e-6 * Math.max(1, ingredient));
        expect(plan.concentrate + plan.water).toBeLessThanOrEqual(i.ullageL + 1e-6);
      }),
    );
  });

  it('refuses exactly when the formula needs removal, negative amounts or room past the fill line', () => {
    fc.assert(
      fc.property(input, (i) => {
        const addL = i.targetVolume - i.currentVolume;
        const concentrate = (i.targetStrength * i.targetVolume - i.currentStrength * i.currentVolume) / i.stockStrength;
        const margin = 1e-6 * Math.max(1, i.targetVolume);
        const clearlyPossible = addL > margin && addL < i.ullageL - margin && concentrate > margin && addL - concentrate > margin;
        const clearlyImpossible = addL < -margin || addL > i.ullageL + margin || concentrate < -margin || addL - concentrate < -margin;
        const plan = topUpPlan(i);
        if (clearlyPossible) expect(plan.ok).toBe(true);
        if (clearlyImpossible) expect(plan.ok).toBe(false);
      }),
    );
  });
});

describe('injection properties', () => {
  it('delivers the target strength: concentrate drawn × its strength = dosed volume × target', () => {
    fc.assert(
      fc.property(strength, strength, volume, (a, b, dosed) => {
        const [stock, target] = a >= b ? [a, b] : [b, a];
        const ratio = injectionRatio({ concentrateStrength: stock, targetStrength: target });
        expect(close(concentratePerVolume(dosed, ratio) * stock, dosed * target)).toBe(true);
        expect(close(dosingRate({ flowLPerMin: dosed, ratio }) * ratio, dosed)).toBe(true);
      }),
    );
  });
});
