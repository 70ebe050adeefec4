// The purchase-order mail to a supplier: text, HTML and a CSV of the lines, money in the organisation's currency.
import type { PurchaseOrder as OrderDto, SessionUser } from '@shared/schemas';
import { toCsv } from '../csv';
import { escapeHtml } from '../mail/mailer';

/** Money as the supplier reads it, in the organisation's ISO 4217 currency ("€18.00", "NZ$18.00"). */
export function moneyIn(currency: string): (value: number) => string {
  const format = new Intl.NumberFormat('en-GB', { style: 'currency', currency });
  return (value) => format.format(value);
}

/** Subject, text, HTML and CSV of the mail that sends `order` to its supplier. */
export function orderMail(order: OrderDto, sender: SessionUser) {
  const org = sender.organisationName;
  const money = moneyIn(sender.currency);
  const qty = (v: number) => v.toLocaleString('en-GB', { maximumFractionDigits: 3 });
  const lines = order.lines.map((l, i) => `${i + 1}. ${l.inputName} — ${qty(l.quantity)} ${l.unit}${l.unitPrice ? ` at ${money(l.unitPrice)} = ${money(l.lineTotal)}` : ''}`);
  const text = [
    `Purchase order ${order.number} from ${org}`,
    `Deliver to: ${order.farmName}`,
    `Prices in ${sender.currency}`,
    '',
    ...lines,
    '',
    `Order total: ${money(order.total)}`,
    ...(order.notes ? ['', `Notes: ${order.notes}`] : []),
    '',
    `Please confirm the delivery date by replying to this message, quoting ${order.number}. — ${sender.name}, ${org}`,
  ].join('\n');
  const rows = order.lines
    .map((l) => `<tr><td>${escapeHtml(l.inputName)}</td><td style="text-align:right">${qty(l.quantity)} ${escapeHtml(l.unit)}</td><td style="text-align:right">${money(l.unitPrice)}</td><td style="text-align:right">${money(l.lineTotal)}</td></tr>`)
    .join('');
  const html = `<h2>Purchase order ${escapeHtml(order.number)}</h2><p>From ${escapeHtml(org)} — deliver to <strong>${escapeHtml(order.farmName)}</strong>. Prices in ${escapeHtml(sender.currency)}.</p>
<table cellpadding="6" style="border-collapse:collapse" border="1"><thead><tr><th>Item</th><th>Quantity</th><th>Unit price</th><th>Line total</th></tr></thead><tbody>${rows}</tbody>
<tfoot><tr><td colspan="3"><strong>Order total</strong></td><td style="text-align:right"><strong>${money(order.total)}</strong></td></tr></tfoot></table>
${order.notes ? `<p>Notes: ${escapeHtml(order.notes)}</p>` : ''}<p>Please confirm the delivery date by replying to this message, quoting ${escapeHtml(order.number)}.<br>${escapeHtml(sender.name)}, ${escapeHtml(org)}</p>`;
  const csv = toCsv({
    fields: ['order', 'item', 'quantity', 'unit', 'unit_price', 'line_total', 'currency'],
    data: order.lines.map((l) => [order.number, l.inputName, l.quantity, l.unit, l.unitPrice, l.lineTotal, sender.currency]),
  });
  return { subject: `Purchase order ${order.number} — ${org}`, text, html, csv };
}
