// The reorder list in groups of urgency, each input with a plain sentence of what to buy and when.
// Every figure comes from the server's InputStatus (shared/inventory); this only sorts and words it.
import type { InputStatus } from '@shared/schemas';
import { formatDays, formatPacks, formatQuantity, formatRate, formatShortDate } from './inputsFormat';

/** How soon an input needs buying. */
export type ReorderUrgency = 'now' | 'soon' | 'later' | 'no-use';

/** Days ahead that count as "soon": two weeks, a buyer's usual planning horizon (common practice, no published source). */
export const SOON_DAYS = 14;

/** One group of the reorder list. */
export interface ReorderGroup {
  urgency: ReorderUrgency;
  title: string;
  intro: string;
  items: InputStatus[];
}

const TEXT: Record<ReorderUrgency, { title: string; intro: string }> = {
  now: { title: 'Buy now', intro: 'Stock on hand plus on order is at or below the reorder point: it may not last until a delivery arrives.' },
  soon: { title: `Buy within ${SOON_DAYS} days`, intro: 'These reach their reorder point soon; order by the date given.' },
  later: { title: 'Stocked for now', intro: 'Enough on hand and on order for more than two weeks at the present rate of use.' },
  'no-use': { title: 'No use recorded', intro: 'No use in the last 60 days, so there is no date to order by.' },
};

/** Which group an input belongs to at `now`. */
export function urgencyOf(input: Pick<InputStatus, 'due' | 'orderBy'>, now: Date = new Date()): ReorderUrgency {
  if (input.due) return 'now';
  if (input.orderBy === null) return 'no-use';
  return new Date(input.orderBy).getTime() - now.getTime() <= SOON_DAYS * 86_400_000 ? 'soon' : 'later';
}

/** The non-empty groups, most urgent first; inside each, the server's order (earliest order-by date first). */
export function reorderGroups(items: readonly InputStatus[], now: Date = new Date()): ReorderGroup[] {
  const order: ReorderUrgency[] = ['now', 'soon', 'later', 'no-use'];
  return order
    .map((urgency) => ({ urgency, ...TEXT[urgency], items: items.filter((i) => urgencyOf(i, now) === urgency) }))
    .filter((g) => g.items.length > 0);
}

/** What to buy and when, in one sentence: "Buy 60 L (3 packs of 20 L) by 16 Dec." */
export function buySentence(input: InputStatus, now: Date = new Date()): string {
  if (input.suggestedQuantity <= 0) return 'Nothing to buy yet.';
  const what = `${formatQuantity(input.suggestedQuantity, input.unit)} (${formatPacks(input.suggestedQuantity, input.packSize, input.unit)})`;
  if (input.due) return `Buy ${what} now.`;
  if (input.orderBy) return `Buy ${what} by ${formatShortDate(input.orderBy, now)}.`;
  return `Buy ${what} when stock reaches ${formatQuantity(input.reorderPoint, input.unit)}.`;
}

/** The stock behind the advice, in one sentence: "12 L on hand lasts about 2.4 days at 5 L a day; 20 L on order." */
export function stockSentence(input: InputStatus): string {
  const onHand = `${formatQuantity(input.onHand, input.unit)} on hand`;
  const onOrder = input.onOrder > 0 ? `; ${formatQuantity(input.onOrder, input.unit)} on order` : '';
  if (input.daysOfCover === null) return `${onHand}${onOrder}.`;
  if (input.daysOfCover <= 0) return `Nothing on hand at ${formatRate(input.dailyDemand, input.unit)}${onOrder}.`;
  const lasts = input.daysOfCover < 1 ? 'less than a day' : `about ${formatDays(input.daysOfCover)}`;
  return `${onHand} lasts ${lasts} at ${formatRate(input.dailyDemand, input.unit)}${onOrder}.`;
}
