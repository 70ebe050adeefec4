// The reorder list in groups of urgency, each input with a plain sentence of what to buy and when.
// Every figure comes from the server's InputStatus (shared/inventory); this only sorts and words it.
import type { InputStatus } from '@shared/schemas';
import { i18n } from '@/i18n';
import { buyWords, formatDays, formatQuantity, formatRate } from './inputsFormat';

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

const GROUP_KEYS: Record<ReorderUrgency, string> = { now: 'now', soon: 'soon', later: 'later', 'no-use': 'noUse' };

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
    .map((urgency) => ({
      urgency,
      title: i18n.global.t(`inputs.group.${GROUP_KEYS[urgency]}.title`, { days: SOON_DAYS }),
      intro: i18n.global.t(`inputs.group.${GROUP_KEYS[urgency]}.intro`),
      items: items.filter((i) => urgencyOf(i, now) === urgency),
    }))
    .filter((g) => g.items.length > 0);
}

/** What to buy and when, in one sentence: "Buy 60 L (3 packs of 20 L) by 16 Dec." */
export function buySentence(input: InputStatus, now: Date = new Date()): string {
  if (input.suggestedQuantity <= 0) return i18n.global.t('inputs.buy.nothingYet');
  return buyWords(input, input.due ? 'now' : input.orderBy ? 'by' : 'atLevel', now);
}

/** The stock behind the advice, in one sentence: "12 L on hand lasts about 2.4 days at 5 L a day; 20 L on order." */
export function stockSentence(input: InputStatus): string {
  const figures = {
    onHand: formatQuantity(input.onHand, input.unit),
    onOrder: formatQuantity(input.onOrder, input.unit),
    rate: formatRate(input.dailyDemand, input.unit),
    days: input.daysOfCover === null ? '' : formatDays(input.daysOfCover),
  };
  const stock = input.daysOfCover === null ? 'onHand' : input.daysOfCover <= 0 ? 'empty' : input.daysOfCover < 1 ? 'lastsUnderADay' : 'lasts';
  return i18n.global.t(`inputs.stock.${stock}${input.onOrder > 0 ? 'OnOrder' : ''}`, figures);
}
