// The purchase-order mail to a supplier: text, HTML and a CSV of the lines, money in the organisation's
// currency, in the language of the buyer who sends it (the supplier deals with them).
import type { PurchaseOrder as OrderDto, SessionUser } from '@shared/schemas';
import { LANGUAGE_LOCALES, type Language } from '@shared/i18n/languages';
import { toCsv } from '../csv';
import { languageOr, translatorFor } from '../i18n';
import { escapeHtml } from '../mail/mailer';

// English mails keep the British way of writing money and quantities ("€18.00", "1,250") they always had.
const localeOf = (language: Language) => (language === 'en' ? 'en-GB' : LANGUAGE_LOCALES[language]);

/** Money as the supplier reads it, in the organisation's ISO 4217 currency ("€18.00", "NZ$18.00"; "18,00 €" in Spanish). */
export function moneyIn(currency: string, language: Language = 'en'): (value: number) => string {
  const format = new Intl.NumberFormat(localeOf(language), { style: 'currency', currency });
  return (value) => format.format(value);
}

/** Subject, text, HTML and CSV of the mail that sends `order` to its supplier, in the sender's language. */
export function orderMail(order: OrderDto, sender: SessionUser) {
  const language = languageOr(sender.language);
  const t = translatorFor(language);
  const org = sender.organisationName;
  const money = moneyIn(sender.currency, language);
  const qty = (v: number) => v.toLocaleString(localeOf(language), { maximumFractionDigits: 3 });
  const lines = order.lines.map((l, i) => {
    const named = { n: i + 1, item: l.inputName, quantity: qty(l.quantity), unit: l.unit };
    return l.unitPrice ? t('mail.order.lineAt', { ...named, price: money(l.unitPrice), total: money(l.lineTotal) }) : t('mail.order.line', named);
  });
  const text = [
    t('mail.order.title', { number: order.number, organisation: org }),
    t('mail.order.deliverTo', { farm: order.farmName }),
    t('mail.order.pricesIn', { currency: sender.currency }),
    '',
    ...lines,
    '',
    t('mail.order.total', { total: money(order.total) }),
    ...(order.notes ? ['', t('mail.order.notes', { notes: order.notes })] : []),
    '',
    `${t('mail.order.confirm', { number: order.number })} ${t('mail.order.signed', { name: sender.name, organisation: org })}`,
  ].join('\n');
  const rows = order.lines
    .map((l) => `<tr><td>${escapeHtml(l.inputName)}</td><td style="text-align:right">${qty(l.quantity)} ${escapeHtml(l.unit)}</td><td style="text-align:right">${money(l.unitPrice)}</td><td style="text-align:right">${money(l.lineTotal)}</td></tr>`)
    .join('');
  const h = (key: string, named: Record<string, string | number> = {}) => escapeHtml(t(key, named));
  // Our own words are plain text; the names in them are escaped, the farm's set in bold.
  const fromDeliver = t('mail.order.fromDeliver', { organisation: escapeHtml(org), farm: `<strong>${escapeHtml(order.farmName)}</strong>`, currency: escapeHtml(sender.currency) });
  const html = `<h2>${h('mail.order.heading', { number: order.number })}</h2><p>${fromDeliver}</p>
<table cellpadding="6" style="border-collapse:collapse" border="1"><thead><tr><th>${h('mail.order.item')}</th><th>${h('mail.order.quantity')}</th><th>${h('mail.order.unitPrice')}</th><th>${h('mail.order.lineTotal')}</th></tr></thead><tbody>${rows}</tbody>
<tfoot><tr><td colspan="3"><strong>${h('mail.order.totalHeading')}</strong></td><td style="text-align:right"><strong>${money(order.total)}</strong></td></tr></tfoot></table>
${order.notes ? `<p>${h('mail.order.notes', { notes: order.notes })}</p>` : ''}<p>${h('mail.order.confirm', { number: order.number })}<br>${escapeHtml(sender.name)}, ${escapeHtml(org)}</p>`;
  const csv = toCsv({
    fields: ['order', 'item', 'quantity', 'unit', 'unit_price', 'line_total', 'currency'],
    data: order.lines.map((l) => [order.number, l.inputName, l.quantity, l.unit, l.unitPrice, l.lineTotal, sender.currency]),
  });
  return { subject: t('mail.order.subject', { number: order.number, organisation: org }), text, html, csv };
}
