import { describe, expect, it } from 'vitest';
import {
  concentratePerVolume,
  concentrateVolume,
  describeRatio,
  dosingRate,
  injectionRatio,
  mixFromRatio,
  topUpPlan,
  type TopUpInput,
} from '@shared/mixing';

// Publications cited below, as read in stored copies of their public web versions:
// [MD0173] U.S. Army Medical Department Center and School, "Pesticides in the Military", subcourse
//   MD0173, edition 100, lesson 2 "Pesticide mixing calculations" (weight/weight or volume/volume).
// [UNHCR] UNHCR, "Vector and Pest Control in Refugee Situations" (1997), Annex 6 "Preparation of a
//   solution from an insecticide formulation" and Annex 7 "Preparation of a solution from an
//   emulsifiable concentrate".
// [WHO] WHO, "Vector Control – Methods for Use by Individuals and Communities" (1997), ch. 9
//   "House-spraying with residual insecticides", "Preparation of insecticide suspension".
// [UMass] UMass Extension Greenhouse & Floriculture fact sheet "Chart – Ratios and Concentrations for
//   Using Water Soluble Fertilizers", and New England Greenhouse Update "Checking Your Fertilizer
//   Injector" (UMass Extension).
// [TAMU] Texas A&M AgriLife, Greenhouse IPM guide, "Nutrition and fertility" ppm calculations.

describe('concentrateVolume', () => {
  it.each([
    // [MD0173] Problem #1: 55 gal of 1 % diazinon emulsion from 48 % EC: Q = A·S/C = 55 × 0.01 / 0.48
    // = 1.146 gal of concentrate (plus 53.9 gal of water).
    ['MD0173 lesson 2, problem #1 (diazinon 48 % EC → 55 gal at 1 %)', 48, 1, 55, 1.146, 3],
    // [MD0173] Problem #2, by weight: 10 lb of 5 % dust from 80 % carbaryl powder = 0.625 lb (10 oz).
    ['MD0173 lesson 2, problem #2 (carbaryl 80 % → 10 lb at 5 %, by weight)', 80, 5, 10, 0.625, 9],
    // [UNHCR] Annex 6: 100 L of a 2.5 % solution from a 50 % a.i. formulation: X = 2.5 × 100 / 50 = 5 L.
    ['UNHCR 1997 Annex 6 (50 % formulation → 100 L at 2.5 %)', 50, 2.5, 100, 5, 9],
    // [WHO] 25 % DDT EC sprayed at 1 g a.i./m² with 40 ml/m²: the spray holds 1 g per 40 ml = 25 g/L
    // (our conversion) against 250 g/L in the EC; WHO: 100 ml of EC to 900 ml of water per litre.
    ['WHO 1997 ch. 9 (25 % EC → 1 L of spray at 1 g per 40 ml)', 250, 25, 1000, 100, 9],
    // Classic C1·V1 = C2·V2 (hand derivation): 500 ml at 2 % from a 10 % stock → V1 = 2 × 500 / 10 = 100 ml.
    ['hand derivation, C1V1 = C2V2 (10 % stock → 500 ml at 2 %)', 10, 2, 500, 100, 9],
  ])('matches %s', (_source, stock, final, volume, expected, digits) => {
    expect(concentrateVolume(stock, final, volume)).toBeCloseTo(expected, digits);
  });

  it('leaves the MD0173 problem #1 water at 53.9 gal to one decimal', () => {
    expect(Number((55 - concentrateVolume(48, 1, 55)).toFixed(1))).toBe(53.9);
  });

  it.each([
    [10, 12, 100, /finalStrength/],
    [0, 1, 100, /stockStrength/],
    [10, 0, 100, /finalStrength/],
    [10, 1, -5, /finalVolume/],
    [10, Number.NaN, 5, /finalStrength/],
  ])('throws a RangeError naming the field for stock %s, final %s, volume %s', (stock, final, volume, field) => {
    expect(() => concentrateVolume(stock, final, volume)).toThrow(RangeError);
    expect(() => concentrateVolume(stock, final, volume)).toThrow(field);
  });
});

describe('mixFromRatio', () => {
  // [UNHCR] Annex 7: a 2.5 % solution from a 50 % EC is "19 parts water to 1 part EC", i.e. 1 in 20.
  it('splits 20 L of the UNHCR Annex 7 mix into 1 L of EC and 19 L of water both ways', () => {
    expect(mixFromRatio(20, 19, 'parts-water')).toEqual({ concentrate: 1, water: 19 });
    expect(mixFromRatio(20, 20, 'parts-total')).toEqual({ concentrate: 1, water: 19 });
  });

  it('gives different amounts for the two readings of the same number (hand derivation)', () => {
    // 1:100 on 505 L: to 100 parts water → 505/101 = 5 L; in 100 total → 5.05 L.
    expect(mixFromRatio(505, 100, 'parts-water').concentrate).toBeCloseTo(5, 12);
    expect(mixFromRatio(505, 100, 'parts-total').concentrate).toBeCloseTo(5.05, 12);
  });

  it('throws a RangeError naming n when a parts-total ratio is below 1', () => {
    expect(() => mixFromRatio(10, 0.5, 'parts-total')).toThrow(/n must be at least 1/);
  });

  it('throws a RangeError naming the convention when it is unknown', () => {
    expect(() => mixFromRatio(10, 5, 'parts' as never)).toThrow(/convention/);
  });
});

describe('describeRatio', () => {
  it('states both readings of 100', () => {
    expect(describeRatio(100)).toEqual({
      partsWater: '1 part to 100 parts water = 1 in 101 total',
      partsTotal: '1 part in 100 total = 1 part to 99 parts water',
    });
  });

  it('states the UNHCR Annex 7 mix as 1 part to 19 parts water = 1 in 20 total', () => {
    expect(describeRatio(19).partsWater).toBe('1 part to 19 parts water = 1 in 20 total');
    expect(describeRatio(20).partsTotal).toBe('1 part in 20 total = 1 part to 19 parts water');
  });

  it('uses the singular and marks readings that make no mix', () => {
    expect(describeRatio(1)).toEqual({
      partsWater: '1 part to 1 part water = 1 in 2 total',
      partsTotal: '1 part in 1 total = concentrate only, no water',
    });
    expect(describeRatio(2).partsTotal).toBe('1 part in 2 total = 1 part to 1 part water');
    expect(describeRatio(0.5)).toEqual({ partsWater: '1 part to 0.5 parts water = 1 in 1.5 total', partsTotal: null });
  });

  it('throws a RangeError naming n when it is not positive', () => {
    expect(() => describeRatio(0)).toThrow(/\bn\b/);
  });
});

describe('topUpPlan', () => {
  const tank: TopUpInput = {
    currentVolume: 200,
    currentStrength: 1,
    targetVolume: 800,
    targetStrength: 2,
    stockStrength: 20,
    ullageL: 700,
  };

  it('plans concentrate and water for a part-full tank (hand derivation)', () => {
    // concentrate = (2 × 800 − 1 × 200) / 20 = 70 L; water = 800 − 200 − 70 = 530 L.
    expect(topUpPlan(tank)).toEqual({ ok: true, concentrate: 70, water: 530, finalVolume: 800 });
  });

  it('reduces to C1V1 = C2V2 for an empty tank (MD0173 problem #1 in litres as gallons)', () => {
    const plan = topUpPlan({ currentVolume: 0, currentStrength: 0, targetVolume: 55, targetStrength: 1, stockStrength: 48, ullageL: 60 });
    expect(plan.ok && plan.concentrate).toBeCloseTo(1.146, 3);
    expect(plan.ok && plan.water).toBeCloseTo(53.854, 3);
  });

  it('refuses a target volume below what the tank holds', () => {
    const plan = topUpPlan({ ...tank, targetVolume: 150 });
    expect(plan).toMatchObject({ ok: false, code: 'target-below-current', heldL: 200, targetL: 150 });
    expect(!plan.ok && plan.reason).toContain('200 L');
  });

  it('refuses to plan past the safe fill line', () => {
    const plan = topUpPlan({ ...tank, ullageL: 500 });
    // 800 − 200 = 600 L to add against 500 L of room.
    expect(plan).toMatchObject({ ok: false, code: 'exceeds-ullage', targetL: 800, addL: 600, roomL: 500 });
    expect(!plan.ok && plan.reason).toContain('only 500 L fits');
  });

  it('refuses when the tank is already stronger than the target and says how far water alone goes', () => {
    // 200 L at 5 holds 1000 units; 300 L at 2 needs 600 → concentrate −20 L. Water alone reaches
    // strength 2 at 1000 / 2 = 500 L, which fits in the 700 L ullage.
    const plan = topUpPlan({ ...tank, currentStrength: 5, targetVolume: 300 });
    expect(plan).toMatchObject({ ok: false, code: 'already-too-strong', targetL: 300, targetStrength: 2, dilutedL: 500 });
    expect(!plan.ok && plan.reason).toContain('500 L');
  });

  it('refuses an already too strong tank without a water-only hint when that water does not fit', () => {
    // As above, but 500 L would need 300 L of water and only 250 L fits (hand derivation).
    const plan = topUpPlan({ ...tank, currentStrength: 5, targetVolume: 300, ullageL: 250 });
    expect(plan).toMatchObject({ ok: false, code: 'already-too-strong', dilutedL: null });
    expect(!plan.ok && plan.reason).toContain('Use or drain some of it first.');
  });

  it('refuses when the concentrate is too weak to reach the target strength', () => {
    // 800 L at 19 needs 15,000 units more than the 200 held; 600 L of 20-strength stock gives 12,000.
    // At most (200 + 12,000) / 800 = 15.25.
    const plan = topUpPlan({ ...tank, targetStrength: 19 });
    expect(plan).toMatchObject({ ok: false, code: 'stock-too-weak', targetL: 800, bestStrength: 15.25, targetStrength: 19 });
    expect(!plan.ok && plan.reason).toContain('15.25');
  });

  it('accepts an exact fill to the fill line and a plain-water top-up', () => {
    expect(topUpPlan({ ...tank, ullageL: 600 }).ok).toBe(true);
    expect(topUpPlan({ ...tank, currentStrength: 0, targetStrength: 0 })).toEqual({ ok: true, concentrate: 0, water: 600, finalVolume: 800 });
  });

  it.each([
    [{ currentVolume: -1 }, /currentVolume/],
    [{ stockStrength: 0 }, /stockStrength/],
    [{ ullageL: Number.NaN }, /ullageL/],
    [{ targetStrength: -2 }, /targetStrength/],
  ])('throws a RangeError naming the field for %o', (patch, field) => {
    expect(() => topUpPlan({ ...tank, ...patch })).toThrow(field);
  });
});

describe('injectionRatio, concentratePerVolume and dosingRate (1 part in n parts of dosed water)', () => {
  // [TAMU] 200 ppm N of ammonium nitrate for a 1:100 proportioner: the stock is made 100 times as
  // strong as the feed (7 oz per 100 gal × 100 = 700 oz per 100 gal of stock).
  it('gives 1:100 for a stock 100 times the feed strength (TAMU greenhouse guide)', () => {
    expect(injectionRatio({ concentrateStrength: 20_000, targetStrength: 200 })).toBe(100);
  });

  // [UMass] "An injector setting of 1:100 indicates that 1 gallon of fertilizer concentrate delivers
  // 100 gallons of final solution"; "a 1 percent setting is the same as a 1:100 ratio, a 2 percent
  // setting ... 1:50 and a 0.5 percent setting ... 1:200".
  it.each([
    [100, 1],
    [50, 2],
    [200, 0.5],
  ])('matches the UMass setting 1:%s = %s %% (gal of concentrate per 100 gal of final solution)', (ratio, percent) => {
    expect(concentratePerVolume(100, ratio)).toBeCloseTo(percent, 12);
  });

  it('doses a 40 L/min line at 1:50 with 0.8 L/min of concentrate (hand derivation)', () => {
    expect(dosingRate({ flowLPerMin: 40, ratio: 50 })).toBeCloseTo(0.8, 12);
  });

  it.each([
    [() => injectionRatio({ concentrateStrength: 100, targetStrength: 200 }), /targetStrength/],
    [() => injectionRatio({ concentrateStrength: 100, targetStrength: 0 }), /targetStrength/],
    [() => concentratePerVolume(100, 0.5), /ratio/],
    [() => dosingRate({ flowLPerMin: -1, ratio: 100 }), /flowLPerMin/],
  ])('throws a RangeError naming the field (case %#)', (call, field) => {
    expect(call).toThrow(RangeError);
    expect(call).toThrow(field);
  });
});
