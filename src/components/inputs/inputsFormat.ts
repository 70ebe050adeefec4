// Words and number formats for the buyer's screens. Every figure comes from the server's
// InputStatus (worked out in shared/inventory); these functions only round and phrase them, in
// the language on screen (messages of the `inputs` area, numbers and dates in its locale).
import type { InputCategory, InputStatus, Movement } from '@shared/schemas';
import { currentLocale, i18n } from '@/i18n';

// Called when the words are needed, never at module load, so a change of language shows at once. A sentence
// that ends on an abbreviated month ("déc.") takes no second full stop.
const t = (key: string, named: Record<string, unknown> = {}, plural?: number): string =>
  (plural === undefined ? i18n.global.t(key, named) : i18n.global.t(key, named, plural)).replace(/\.\.$/, '.');

const CATEGORY_KEYS: Record<InputCategory, string> = {
  fertilizer: 'fertilizer',
  'pest-control': 'pestControl',
  'culture-starter': 'cultureStarter',
  amendment: 'amendment',
  other: 'other',
};

/** An input category in words: "Fertilizer", "Pest control"… */
export function categoryLabel(category: InputCategory): string {
  return t(`inputs.category.${CATEGORY_KEYS[category]}`);
}

export type TagSeverity = 'secondary' | 'success' | 'info' | 'warn' | 'danger' | 'contrast';

function digitsFor(value: number): number {
  const size = Math.abs(value);
  // Enough digits to tell 0.15 kg from 0.2 kg, without printing 160.0000 L.
  if (size === 0 || size >= 100) return 0;
  if (size >= 10) return 1;
  return 2;
}

/** A plain number rounded for reading: "1,250", "42.5", "0.15". */
export function formatNumber(value: number): string {
  return new Intl.NumberFormat(currentLocale(), { maximumFractionDigits: digitsFor(value) }).format(value);
}

/** A quantity with its unit: "42.5 L", "3 bag (25 kg)". */
export function formatQuantity(value: number, unit: string): string {
  return `${formatNumber(value)} ${unit}`;
}

/** A quantity with a decimal more than formatQuantity, for a figure that is rounded up after ("350.2 L"). */
export function formatQuantityFine(value: number, unit: string): string {
  return `${new Intl.NumberFormat(currentLocale(), { maximumFractionDigits: Math.min(2, digitsFor(value) + 1) }).format(value)} ${unit}`;
}

/** A signed change of stock: "+40 L", "−3.2 L". */
export function formatChange(value: number, unit: string): string {
  const sign = value > 0 ? '+' : value < 0 ? '−' : '';
  return `${sign}${formatQuantity(Math.abs(value), unit)}`;
}

/** A daily rate: "5.2 L a day". */
export function formatRate(perDay: number, unit: string): string {
  return t('inputs.perDay', { quantity: formatQuantity(perDay, unit) });
}

/** Days as people say them: "6.6 days", "1 day", "less than a day". */
export function formatDays(days: number): string {
  if (days > 0 && days < 1) return t('inputs.lessThanADay');
  // Tenths of a day are as fine as anyone plans a delivery.
  const digits = days >= 10 ? 0 : 1;
  const shown = Number(days.toFixed(digits));
  const text = new Intl.NumberFormat(currentLocale(), { maximumFractionDigits: digits }).format(days);
  return t('inputs.days', { days: text }, shown === 1 ? 1 : 2);
}

/** Money in the organisation's ISO 4217 currency, in the reader's locale: "€18.00", "NZ$18.00", "¥1,800". */
export function formatMoney(value: number, currency: string): string {
  return new Intl.NumberFormat(currentLocale(), { style: 'currency', currency }).format(value);
}

/** A service level 0.95 as "95 %" (99.5 % keeps its decimal). */
export function formatPercent(fraction: number): string {
  return `${new Intl.NumberFormat(currentLocale(), { maximumFractionDigits: 1 }).format(fraction * 100)} %`;
}

/** A day in the reader's locale: "12 Dec" (or "Dec 12"), with the year when it is not this year. */
export function formatShortDate(iso: string, now: Date = new Date()): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return '—';
  const sameYear = date.getFullYear() === now.getFullYear();
  return new Intl.DateTimeFormat(currentLocale(), { day: 'numeric', month: 'short', ...(sameYear ? {} : { year: 'numeric' }) }).format(date);
}

/** When to buy an input, in our words: "Buy now" (amber; "Out of stock · buy now" in red), "Buy by 16 Dec", or no use recorded. */
export function orderTag(input: Pick<InputStatus, 'due' | 'onHand' | 'orderBy'>, now: Date = new Date()): { label: string; severity: TagSeverity } {
  if (input.due) return input.onHand <= 0 ? { label: t('inputs.tag.outOfStock'), severity: 'danger' } : { label: t('inputs.tag.buyNow'), severity: 'warn' };
  if (input.orderBy === null) return { label: t('inputs.noUseRecorded'), severity: 'secondary' };
  return { label: t('inputs.tag.buyBy', { date: formatShortDate(input.orderBy, now) }), severity: 'info' };
}

/** Whole packs in a quantity that the server already rounded up to packs. */
export function packCount(quantity: number, packSize: number): number {
  return Math.round(quantity / packSize);
}

/** "3 packs of 20 L" or "1 pack of 5 kg". */
export function formatPacks(quantity: number, packSize: number, unit: string): string {
  const packs = packCount(quantity, packSize);
  return t('inputs.packs', { count: formatNumber(packs), size: formatQuantity(packSize, unit) }, packs === 1 ? 1 : 2);
}

/** Days of cover for a table cell. */
export function formatCover(input: Pick<InputStatus, 'daysOfCover'>): string {
  if (input.daysOfCover === null) return t('inputs.noUseRecorded');
  if (input.daysOfCover <= 0) return t('inputs.noneLeft');
  return formatDays(input.daysOfCover);
}

/**
 * "Buy 60 L (3 packs of 20 L) now." and its siblings: `when` is now, by the order-by day, at the
 * reorder point, or at a stock level given in `level`.
 */
export function buyWords(input: InputStatus, when: 'now' | 'by' | 'atReorderPoint' | 'atLevel', now: Date = new Date()): string {
  return t(`inputs.buy.${when}`, {
    quantity: formatQuantity(input.suggestedQuantity, input.unit),
    packs: formatPacks(input.suggestedQuantity, input.packSize, input.unit),
    date: input.orderBy ? formatShortDate(input.orderBy, now) : '',
    level: formatQuantity(input.reorderPoint, input.unit),
  });
}

/** The reorder advice in plain words, one sentence per figure (nothing here is worked out anew). */
export function adviceSentences(input: InputStatus, currency: string, now: Date = new Date()): { cover: string; reorderPoint: string; reorderMeaning: string; onOrder: string | null; order: string; orderWhy: string | null } {
  const q = (v: number) => formatQuantity(v, input.unit);
  const figures = {
    onHand: q(input.onHand),
    rate: formatRate(input.dailyDemand, input.unit),
    level: formatPercent(input.serviceLevel),
    lead: formatDays(input.leadTimeDays),
    reorderPoint: q(input.reorderPoint),
    safetyStock: q(input.safetyStock),
    days: input.daysOfCover === null ? '' : formatDays(input.daysOfCover),
  };

  const cover = t(input.daysOfCover === null ? 'inputs.advice.coverNoUse' : input.daysOfCover <= 0 ? 'inputs.advice.coverEmpty' : 'inputs.advice.coverLasts', figures);
  const reorderPoint = t(input.dailyDemand > 0 ? 'inputs.advice.reorderPoint' : 'inputs.advice.reorderPointNoUse', figures);
  const reorderMeaning = t('inputs.advice.reorderMeaning', figures);
  const onOrder = input.onOrder > 0 ? t('inputs.advice.onOrder', { onOrder: q(input.onOrder) }) : null;

  if (input.suggestedQuantity <= 0) {
    return { cover, reorderPoint, reorderMeaning, onOrder, order: t('inputs.advice.nothingToOrder'), orderWhy: null };
  }
  const order = buyWords(input, input.due ? 'now' : input.orderBy ? 'by' : 'atReorderPoint', now);
  const why = {
    eoq: formatQuantityFine(input.eoq, input.unit),
    orderCost: formatMoney(input.orderCost, currency),
    holdingCost: formatMoney(input.holdingCostPerYear, currency),
    unit: input.unit,
    minimum: q(input.minimumOrder),
  };
  const orderWhy = t(input.minimumOrder > 0 ? 'inputs.advice.orderWhyMinimum' : 'inputs.advice.orderWhy', why);
  return { cover, reorderPoint, reorderMeaning, onOrder, order, orderWhy };
}

/** The movements a person records by hand on the Inputs screen. */
export type MovementKind = 'use' | 'count' | 'adjustment';

/** A kind of movement in words: "Use", "Count", "Adjustment", "Receipt". */
export function movementLabel(kind: Movement['kind']): string {
  return t(`inputs.movement.${kind}`);
}

/** What a movement did to stock, in words: "−3.2 L", "Counted 18 L, 0.4 L less than the records". */
export function movementEffect(movement: Movement, unit: string): string {
  switch (movement.kind) {
    case 'use':
      return formatChange(-movement.quantity, unit);
    case 'receipt':
    case 'adjustment':
      return formatChange(movement.quantity, unit);
    case 'count': {
      const counted = formatQuantity(movement.quantity, unit);
      const diff = movement.difference;
      if (diff === null) return t('inputs.movement.counted', { counted });
      if (Math.abs(diff) < 1e-9) return t('inputs.movement.countedSame', { counted });
      return t(diff > 0 ? 'inputs.movement.countedMore' : 'inputs.movement.countedLess', { counted, difference: formatQuantity(Math.abs(diff), unit) });
    }
  }
}

/** PrimeVue pass-through that points an InputNumber's inner input at its hint or error. */
export function describedBy(id: string | undefined): { pcInputText: { root: { 'aria-describedby'?: string } } } {
  return { pcInputText: { root: id ? { 'aria-describedby': id } : {} } };
}
