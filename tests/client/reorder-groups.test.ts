import { describe, expect, it } from 'vitest';
import { buySentence, reorderGroups, stockSentence, urgencyOf } from '@/components/inputs/reorderGroups';
import { makeInput } from './support/inventoryFixtures';

const NOW = new Date('2026-12-03T12:00:00.000Z');
const DAY = 86_400_000;
const at = (days: number) => new Date(NOW.getTime() + days * DAY).toISOString();

describe('reorderGroups', () => {
  it.each([
    ['due', { due: true, orderBy: at(0) }, 'now'],
    ['reaching the reorder point in 14 days', { due: false, orderBy: at(14) }, 'soon'],
    ['reaching it in 15 days', { due: false, orderBy: at(15) }, 'later'],
    ['with no use', { due: false, orderBy: null }, 'no-use'],
  ] as const)('puts an input %s under %s', (_name, input, urgency) => {
    expect(urgencyOf(input, NOW)).toBe(urgency);
  });

  it('keeps the server’s order inside each group and leaves out empty groups', () => {
    const items = [makeInput(1, { due: true }), makeInput(2, { due: false, orderBy: at(30) }), makeInput(3, { due: true })];
    const groups = reorderGroups(items, NOW);
    expect(groups.map((g) => [g.urgency, g.items.map((i) => i.id)])).toEqual([
      ['now', [1, 3]],
      ['later', [2]],
    ]);
    expect(groups[0]!.title).toBe('Buy now');
  });

  it('says what to buy in whole packs, and what stock is behind it', () => {
    const input = makeInput(1, { due: true, suggestedQuantity: 60, packSize: 20, onHand: 12, dailyDemand: 5, daysOfCover: 2.4, onOrder: 0 });
    expect(buySentence(input, NOW)).toBe('Buy 60 L (3 packs of 20 L) now.');
    expect(stockSentence(input)).toBe('12 L on hand lasts about 2.4 days at 5 L a day.');
    expect(stockSentence({ ...input, onOrder: 20, daysOfCover: 0.5 })).toBe('12 L on hand lasts less than a day at 5 L a day; 20 L on order.');
  });
});
