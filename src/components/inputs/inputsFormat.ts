// Words and number formats for the buyer's screens. Every figure comes from the server's
// InputStatus (worked out in shared/inventory); these functions only round and phrase them.
import type { InputCategory, InputStatus, Movement } from '@shared/schemas';

export const CATEGORY_LABELS: Record<InputCategory, string> = {
  fertilizer: 'Fertilizer',
  'pest-control': 'Pest control',
  'culture-starter': 'Culture starter',
  amendment: 'Soil amendment',
  other: 'Other',
};

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
  return new Intl.NumberFormat(undefined, { maximumFractionDigits: digitsFor(value) }).format(value);
}

/** A quantity with its unit: "42.5 L", "3 bag (25 kg)". */
export function formatQuantity(value: number, unit: string): string {
  return `${formatNumber(value)} ${unit}`;
}

/** A quantity with a decimal more than formatQuantity, for a figure that is rounded up after ("350.2 L"). */
export function formatQuantityFine(value: number, unit: string): string {
  return `${new Intl.NumberFormat(undefined, { maximumFractionDigits: Math.min(2, digitsFor(value) + 1) }).format(value)} ${unit}`;
}

/** A signed change of stock: "+40 L", "−3.2 L". */
export function formatChange(value: number, unit: string): string {
  const sign = value > 0 ? '+' : value < 0 ? '−' : '';
  return `${sign}${formatQuantity(Math.abs(value), unit)}`;
}

/** A daily rate: "5.2 L a day". */
export function formatRate(perDay: number, unit: string): string {
  return `${formatQuantity(perDay, unit)} a day`;
}

/** Days as people say them: "6.6 days", "1 day", "less than a day". */
export function formatDays(days: number): string {
  if (days > 0 && days < 1) return 'less than a day';
  // Tenths of a day are as fine as anyone plans a delivery.
  const text = new Intl.NumberFormat(undefined, { maximumFractionDigits: days >= 10 ? 0 : 1 }).format(days);
  return `${text} ${text === '1' ? 'day' : 'days'}`;
}

/** Money in the organisation's ISO 4217 currency, in the reader's locale: "€18.00", "NZ$18.00", "¥1,800". */
export function formatMoney(value: number, currency: string): string {
  return new Intl.NumberFormat(undefined, { style: 'currency', currency }).format(value);
}

/** A service level 0.95 as "95 %" (99.5 % keeps its decimal). */
export function formatPercent(fraction: number): string {
  return `${new Intl.NumberFormat(undefined, { maximumFractionDigits: 1 }).format(fraction * 100)} %`;
}

/** A day in the reader's locale: "12 Dec" (or "Dec 12"), with the year when it is not this year. */
export function formatShortDate(iso: string, now: Date = new Date()): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return '—';
  const sameYear = date.getFullYear() === now.getFullYear();
  return new Intl.DateTimeFormat(undefined, { day: 'numeric', month: 'short', ...(sameYear ? {} : { year: 'numeric' }) }).format(date);
}

/** When to buy an input, in our words: "Buy now" (amber; "Out of stock · buy now" in red), "Buy by 16 Dec", or no use recorded. */
export function orderTag(input: Pick<InputStatus, 'due' | 'onHand' | 'orderBy'>, now: Date = new Date()): { label: string; severity: TagSeverity } {
  if (input.due) return input.onHand <= 0 ? { label: 'Out of stock · buy now', severity: 'danger' } : { label: 'Buy now', severity: 'warn' };
  if (input.orderBy === null) return { label: 'No use recorded', severity: 'secondary' };
  return { label: `Buy by ${formatShortDate(input.orderBy, now)}`, severity: 'info' };
}

/** Whole packs in a quantity that the server already rounded up to packs. */
export function packCount(quantity: number, packSize: number): number {
  return Math.round(quantity / packSize);
}

/** "3 packs of 20 L" or "1 pack of 5 kg". */
export function formatPacks(quantity: number, packSize: number, unit: string): string {
  const packs = packCount(quantity, packSize);
  return `${packs} ${packs === 1 ? 'pack' : 'packs'} of ${formatQuantity(packSize, unit)}`;
}

/** Days of cover for a table cell. */
export function formatCover(input: Pick<InputStatus, 'daysOfCover'>): string {
  if (input.daysOfCover === null) return 'No use recorded';
  if (input.daysOfCover <= 0) return 'None left';
  return formatDays(input.daysOfCover);
}

/** The reorder advice in plain words, one sentence per figure (nothing here is worked out anew). */
export function adviceSentences(input: InputStatus, currency: string, now: Date = new Date()): { cover: string; reorderPoint: string; reorderMeaning: string; onOrder: string | null; order: string; orderWhy: string | null } {
  const q = (v: number) => formatQuantity(v, input.unit);
  const rate = formatRate(input.dailyDemand, input.unit);
  const level = formatPercent(input.serviceLevel);
  const lead = formatDays(input.leadTimeDays);

  const cover =
    input.daysOfCover === null
      ? `${q(input.onHand)} on hand. No use has been recorded lately, so there is no forecast yet.`
      : input.daysOfCover <= 0
        ? `Nothing on hand, and it is used at about ${rate}.`
        : `${q(input.onHand)} on hand lasts about ${formatDays(input.daysOfCover)} at ${rate}.`;

  const reorderPoint =
    input.dailyDemand > 0
      ? `Reorder point ${q(input.reorderPoint)} = ${lead} of lead time × ${rate} + ${q(input.safetyStock)} safety stock for a ${level} service level.`
      : `Reorder point ${q(input.reorderPoint)}: with no use recorded, nothing is expected to be used in the ${lead} of lead time.`;
  const reorderMeaning = `Order when stock on hand plus on order falls to ${q(input.reorderPoint)}: that covers the use expected until a delivery arrives, and the safety stock covers busier days, so in about ${level} of order cycles the delivery arrives before the shelf runs empty.`;

  const onOrder = input.onOrder > 0 ? `${q(input.onOrder)} is on order already and counts toward the reorder point.` : null;

  if (input.suggestedQuantity <= 0) {
    return { cover, reorderPoint, reorderMeaning, onOrder, order: 'Nothing to order: no use is recorded and stock is above the reorder point.', orderWhy: null };
  }
  const when = input.due ? 'now' : input.orderBy ? `by ${formatShortDate(input.orderBy, now)}` : 'when stock reaches the reorder point';
  const order = `Buy ${q(input.suggestedQuantity)} (${formatPacks(input.suggestedQuantity, input.packSize, input.unit)}) ${when}.`;
  const minimum = input.minimumOrder > 0 ? ` and to at least the minimum order of ${q(input.minimumOrder)}` : '';
  const orderWhy =
    `That is the larger of the economic order quantity, ${formatQuantityFine(input.eoq, input.unit)} (it balances ${formatMoney(input.orderCost, currency)} per order against ` +
    `${formatMoney(input.holdingCostPerYear, currency)} per ${input.unit} a year to hold), and what brings stock back up to the reorder point, ` +
    `rounded up to whole packs${minimum}.`;
  return { cover, reorderPoint, reorderMeaning, onOrder, order, orderWhy };
}

/** The movements a person records by hand on the Inputs screen. */
export type MovementKind = 'use' | 'count' | 'adjustment';

export const MOVEMENT_LABELS: Record<Movement['kind'], string> = {
  use: 'Use',
  count: 'Count',
  adjustment: 'Adjustment',
  receipt: 'Receipt',
};

/** What a movement did to stock, in words: "−3.2 L", "Counted 18 L, 0.4 L less than the records". */
export function movementEffect(movement: Movement, unit: string): string {
  switch (movement.kind) {
    case 'use':
      return formatChange(-movement.quantity, unit);
    case 'receipt':
    case 'adjustment':
      return formatChange(movement.quantity, unit);
    case 'count': {
      const counted = `Counted ${formatQuantity(movement.quantity, unit)}`;
      const diff = movement.difference;
      if (diff === null) return counted;
      if (Math.abs(diff) < 1e-9) return `${counted}, as the records said`;
      return `${counted}, ${formatQuantity(Math.abs(diff), unit)} ${diff > 0 ? 'more' : 'less'} than the records`;
    }
  }
}

/** PrimeVue pass-through that points an InputNumber's inner input at its hint or error. */
export function describedBy(id: string | undefined): { pcInputText: { root: { 'aria-describedby'?: string } } } {
  return { pcInputText: { root: id ? { 'aria-describedby': id } : {} } };
}
