import { describe, expect, it } from 'vitest';
import { COLD_CULTURE_C, FROST_RISK_C, clearableByHand, judgedTankKinds, tankFlagConditions, type TankFlagInput } from '@shared/flags';
import { FLAG_KINDS } from '@shared/schemas';

const now = Date.UTC(2026, 11, 1, 12);
const base: TankFlagInput = {
  name: 'Cone A', contents: 'culture', usableL: 400, lowStockL: 100, levelMm: 900, safeFillLevelMm: 1100, temperatureC: 21,
  takenAt: now - 3_600_000, now, staleAfterDays: 3, coldCultureC: COLD_CULTURE_C, frostRiskC: FROST_RISK_C, leaks: [],
};
const kinds = (t: Partial<TankFlagInput>) => tankFlagConditions({ ...base, ...t }).map((c) => c.kind);

describe('tankFlagConditions', () => {
  it('raises nothing for a healthy tank', () => {
    expect(kinds({})).toEqual([]);
  });

  // 18 °C for cultures and 2 °C for frost: common practice, no published source; both boundaries exact.
  it.each([
    [18, []],
    [17.9, ['cold-culture']],
    [2.1, ['cold-culture']],
    [2, ['frost-risk']],
    [-1, ['frost-risk']],
  ])('gives a culture at %d °C the flags %j', (temperatureC, want) => {
    expect(kinds({ temperatureC })).toEqual(want);
  });

  it('warns of frost for water but never calls water a cold culture', () => {
    expect(kinds({ contents: 'water', temperatureC: 10 })).toEqual([]);
    expect(kinds({ contents: 'water', temperatureC: 2 })).toEqual(['frost-risk']);
  });

  it('flags low stock under the threshold, not at it', () => {
    expect(kinds({ usableL: 100 })).toEqual([]);
    expect(kinds({ usableL: 99.9 })).toEqual(['low-stock']);
  });

  it('flags a tank not read for the farm\'s stale days', () => {
    expect(kinds({ takenAt: now - 2.9 * 86_400_000 })).toEqual([]);
    expect(kinds({ takenAt: now - 3 * 86_400_000 })).toEqual(['stale-tank']);
  });

  it('flags a level above the safe fill line and a leak in quiet hours', () => {
    expect(kinds({ levelMm: 1120 })).toEqual(['overfill']);
    expect(tankFlagConditions({ ...base, leaks: [{ lossL: 30, rateLPerHour: 5 }] })[0].message).toMatch(/lost 30 L during quiet hours \(5 L\/h\)/);
  });

  it('says nothing of a tank that was never read', () => {
    expect(kinds({ takenAt: null, usableL: null, temperatureC: null })).toEqual([]);
  });

  it('judges the temperature of a tank whose level was never read but whose brew was logged, and never calls it stale', () => {
    expect(kinds({ takenAt: null, usableL: null, levelMm: null, temperatureC: 17.9 })).toEqual(['cold-culture']);
    expect(kinds({ takenAt: null, usableL: null, levelMm: null, temperatureC: 2 })).toEqual(['frost-risk']);
    expect(kinds({ takenAt: null, usableL: null, levelMm: null, temperatureC: 25 })).toEqual([]);
  });
});

describe('judgedTankKinds', () => {
  it('leaves the temperature kinds undecided when no temperature is known, so a level-only reading cannot end them', () => {
    expect(judgedTankKinds({ temperatureC: null })).not.toContain('frost-risk');
    expect(judgedTankKinds({ temperatureC: null })).not.toContain('cold-culture');
    expect(judgedTankKinds({ temperatureC: null })).toEqual(expect.arrayContaining(['low-stock', 'stale-tank', 'overfill', 'suspected-leak']));
    expect(judgedTankKinds({ temperatureC: 21 })).toEqual(expect.arrayContaining(['frost-risk', 'cold-culture', 'low-stock']));
  });

  it('lets only the temperature kinds be cleared by hand', () => {
    expect(FLAG_KINDS.filter(clearableByHand).sort()).toEqual(['cold-culture', 'frost-risk']);
  });
});
