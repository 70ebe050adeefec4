import type { OrderStatus, PurchaseOrder } from '@shared/schemas';
import type { TagSeverity } from '@/components/inputs/inputsFormat';
import { i18n } from '@/i18n';

/** The tag colour of each order state, and the key of its name under `orders.status`. */
const ORDER_STATUS_TAGS: Record<OrderStatus, { key: string; severity: TagSeverity }> = {
  draft: { key: 'draft', severity: 'secondary' },
  sent: { key: 'sent', severity: 'info' },
  'part-received': { key: 'partReceived', severity: 'warn' },
  received: { key: 'received', severity: 'success' },
  'closed-short': { key: 'closedShort', severity: 'secondary' },
  cancelled: { key: 'cancelled', severity: 'contrast' },
};

/** Our words for an order state in the language on screen, with the tag colour it gets. */
export function orderStatusTag(status: OrderStatus): { label: string; severity: TagSeverity } {
  const tag = ORDER_STATUS_TAGS[status];
  return { label: i18n.global.t(`orders.status.${tag.key}`), severity: tag.severity };
}

/** What is still to come on a line of a sent order (units of the input). */
export function openQuantity(line: PurchaseOrder['lines'][number]): number {
  return Math.max(0, line.quantity - line.receivedQuantity);
}

/** Whether a delivery can still be booked in against this order. */
export function canReceive(order: Pick<PurchaseOrder, 'status'>): boolean {
  return order.status === 'sent' || order.status === 'part-received';
}

/** Whether the rest of a part-delivered order can be given up (closed short). */
export function canCloseShort(order: Pick<PurchaseOrder, 'status'>): boolean {
  return order.status === 'part-received';
}

/** Whether the order may still be cancelled. */
export function canCancel(order: Pick<PurchaseOrder, 'status'>): boolean {
  return order.status === 'draft' || order.status === 'sent';
}

/**
 * Field names for useFormErrors that put a zod or server error such as "lines.3.quantity" under
 * its own line; the whole-list field comes last so it only catches what names no line.
 */
export function lineFieldNames(count: number, parts: readonly string[], rest: readonly string[] = []): string[] {
  const names: string[] = [];
  for (let i = 0; i < count; i++) for (const part of parts) names.push(`lines.${i}.${part}`);
  return [...names, ...rest, 'lines'];
}

/** One order line being edited; `key` keeps Vue's rows stable while lines come and go. */
export interface EditLine {
  key: number;
  inputId: number | null;
  quantity: number | null;
  unitPrice: number | null;
}

let lineKey = 0;
/** A fresh key for an EditLine. */
export function nextLineKey(): number {
  lineKey += 1;
  return lineKey;
}

/** The body lines of an order form (empty unit price: the input's own). */
export function linesForBody(lines: readonly EditLine[]): { inputId: number | undefined; quantity: number | null; unitPrice: number | undefined }[] {
  return lines.map((l) => ({ inputId: l.inputId ?? undefined, quantity: l.quantity, unitPrice: l.unitPrice ?? undefined }));
}
