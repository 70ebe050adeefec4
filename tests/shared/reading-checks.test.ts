// Plausibility checks on a reading before a round sends it. The limits are common practice, no
// published source (50 % of the last stock; cultures safe from 18 °C, PRODUCT.md, up to about 40 °C,
// recalled from memory). The share is the relative change |new − last| / last (any algebra text's
// definition of relative change; recalled from memory).
import { describe, expect, it } from 'vitest';
import { COLD_CULTURE_C, WARM_CULTURE_C } from '@shared/flags/index';
import { STOCK_JUMP_SHARE, cultureTemperatureOutside, stockJump } from '@shared/readings/index';

describe('stockJump', () => {
  it.each<[number, number, number, number, boolean]>([
    // 6,273 L to 483 L: a fall of 5,790 L, 92.3 % of the last stock.
    [6273, 483, -5790, 5790 / 6273, true],
    [1000, 1400, 400, 0.4, false],
    [1000, 1500, 500, 0.5, false],
    [1000, 1501, 501, 0.501, true],
    [1000, 499, -501, 0.501, true],
    [800, 800, 0, 0, false],
    [0, 0, 0, 0, false],
    [0, 10, 10, Number.POSITIVE_INFINITY, true],
  ])('moves %d L to %d L by %d L, a share of %d (asks: %s)', (lastL, newL, changeL, share, large) => {
    const jump = stockJump(lastL, newL);
    expect(jump.changeL).toBe(changeL);
    expect(jump.share).toBeCloseTo(share, 9);
    expect(jump.large).toBe(large);
  });

  it('asks beyond half of the last stock unless told another limit', () => {
    expect(STOCK_JUMP_SHARE).toBe(0.5);
    expect(stockJump(1000, 1300, 0.25).large).toBe(true);
  });
});

describe('cultureTemperatureOutside', () => {
  it.each<[number, 'cold' | 'warm' | null]>([
    [45, 'warm'],
    [40.1, 'warm'],
    [40, null],
    [21.5, null],
    [18, null],
    [17.9, 'cold'],
    [4.5, 'cold'],
  ])('places %d °C as %s against the default range', (temperatureC, where) => {
    expect(cultureTemperatureOutside(temperatureC)).toBe(where);
  });

  it('uses the shared culture limits and a farm’s own cold limit when given', () => {
    expect([COLD_CULTURE_C, WARM_CULTURE_C]).toEqual([18, 40]);
    expect(cultureTemperatureOutside(20, 22)).toBe('cold');
  });
});
