import { afterEach, describe, expect, it } from 'vitest';
import { adviceSentences, formatCover, formatDays, formatMoney, formatPacks, formatQuantity, movementEffect, orderTag } from '@/components/inputs/inputsFormat';
import { buySentence, reorderGroups, stockSentence } from '@/components/inputs/reorderGroups';
import { setLanguage } from '@/i18n';
import { makeInput, makeMovement } from './support/inventoryFixtures';

// Phrasing only: every figure is the server's (shared/inventory), so the cases check words and rounding.
describe('orderTag', () => {
  it.each([
    ['due with stock left', { due: true, onHand: 12, orderBy: '2026-03-02T09:00:00.000Z' }, 'Buy now', 'warn'],
    ['due and empty', { due: true, onHand: 0, orderBy: '2026-03-02T09:00:00.000Z' }, 'Out of stock · buy now', 'danger'],
    ['no use recorded', { due: false, onHand: 40, orderBy: null }, 'No use recorded', 'secondary'],
  ] as const)('says %s', (_case, input, label, severity) => {
    expect(orderTag(input)).toEqual({ label, severity });
  });

  it('gives the order-by day of an input not due yet, with the year when it is another year', () => {
    const tag = orderTag({ due: false, onHand: 40, orderBy: '2027-01-15T12:00:00.000Z' }, new Date('2026-12-01T12:00:00.000Z'));
    expect(tag.severity).toBe('info');
    expect(tag.label).toMatch(/^Buy by .*15.*2027$/);
  });
});

describe('formatDays and formatCover', () => {
  it.each([
    [0.4, 'less than a day'],
    [1, '1 day'],
    [9.06, '9.1 days'],
    [104.3, '104 days'],
  ])('prints %f days as "%s"', (days, text) => {
    expect(formatDays(days)).toBe(text);
  });

  it('says when nothing is used or nothing is left', () => {
    expect(formatCover({ daysOfCover: null })).toBe('No use recorded');
    expect(formatCover({ daysOfCover: 0 })).toBe('None left');
  });
});

describe('adviceSentences', () => {
  it('explains a zero suggestion instead of suggesting 0 L', () => {
    const words = adviceSentences(makeInput(1, { dailyDemand: 0, dailyDemandSd: 0, daysOfCover: null, reorderPoint: 0, safetyStock: 0, eoq: 0, suggestedQuantity: 0, due: false, orderBy: null }), 'EUR');
    expect(words.order).toBe('Nothing to order: no use is recorded and stock is above the reorder point.');
    expect(words.orderWhy).toBeNull();
    expect(words.reorderPoint).toBe('Reorder point 0 L: with no use recorded, nothing is expected to be used in the 6 days of lead time.');
  });

  it('names what is on order and the minimum order when there are any', () => {
    const words = adviceSentences(makeInput(1, { onOrder: 40, minimumOrder: 100 }), 'NZD');
    expect(words.onOrder).toBe('40 L is on order already and counts toward the reorder point.');
    expect(words.orderWhy).toContain('rounded up to whole packs and to at least the minimum order of 100 L.');
    // Money in the organisation's currency, as Intl.NumberFormat writes it in this locale.
    expect(words.orderWhy).toContain(`balances ${new Intl.NumberFormat(undefined, { style: 'currency', currency: 'NZD' }).format(makeInput(1).orderCost)} per order`);
  });

  it('says how many packs the suggestion is', () => {
    expect(formatPacks(340, 20, 'L')).toBe('17 packs of 20 L');
    expect(formatPacks(5, 5, 'kg')).toBe('1 pack of 5 kg');
  });
});

describe('movementEffect', () => {
  it.each([
    ['use', { kind: 'use' as const, quantity: 4.25 }, '−4.25 L'],
    ['receipt', { kind: 'receipt' as const, quantity: 240 }, '+240 L'],
    ['adjustment down', { kind: 'adjustment' as const, quantity: -3 }, '−3 L'],
    ['count above the records', { kind: 'count' as const, quantity: 50, difference: 2 }, 'Counted 50 L, 2 L more than the records'],
    ['count as recorded', { kind: 'count' as const, quantity: 50, difference: 0 }, 'Counted 50 L, as the records said'],
  ])('words a %s', (_case, movement, text) => {
    expect(movementEffect(makeMovement(1, 1, movement), 'L')).toBe(text);
  });
});

// Numbers as each language writes them: decimal comma in Spanish and French; Spanish groups thousands
// with a dot only from five digits, French with a narrow no-break space (CLDR number data, as ICU 78 ships it).
describe('in Spanish and French', () => {
  afterEach(() => setLanguage('en'));

  it.each([
    ['es', 9.06, '9,1 días'],
    ['es', 1, '1 día'],
    ['es', 0.4, 'menos de un día'],
    ['fr', 9.06, '9,1 jours'],
    ['fr', 1, '1 jour'],
    ['fr', 104.3, '104 jours'],
  ] as const)('in %s prints %f days as "%s"', (language, days, text) => {
    setLanguage(language);
    expect(formatDays(days)).toBe(text);
  });

  it.each([
    ['es', 1250, '1250 L'],
    ['es', 12500, '12.500 L'],
    ['es', 42.5, '42,5 L'],
    ['fr', 12500, '12\u202f500 L'],
    ['fr', 0.15, '0,15 L'],
  ] as const)('in %s writes %f L as "%s"', (language, value, text) => {
    setLanguage(language);
    expect(formatQuantity(value, 'L')).toBe(text);
  });

  it('writes money after the figure with a decimal comma in French', () => {
    setLanguage('fr');
    expect(formatMoney(18, 'EUR')).toBe('18,00\u00a0€');
  });

  it('words packs, counts and the order tag in Spanish', () => {
    setLanguage('es');
    expect(formatPacks(340, 20, 'L')).toBe('17 envases de 20 L');
    expect(formatPacks(5, 5, 'kg')).toBe('1 envase de 5 kg');
    expect(formatCover({ daysOfCover: 0 })).toBe('Sin existencias');
    expect(movementEffect(makeMovement(1, 1, { kind: 'count', quantity: 50, difference: 2 }), 'L')).toBe('Recuento: 50 L, 2 L más que los registros');
    expect(orderTag({ due: true, onHand: 12, orderBy: null })).toEqual({ label: 'Comprar ya', severity: 'warn' });
    expect(orderTag({ due: false, onHand: 40, orderBy: '2027-01-15T12:00:00.000Z' }, new Date('2026-12-01T12:00:00.000Z')).label).toBe('Comprar a más tardar el 15 ene 2027');
  });

  it('explains the reorder point in Spanish with the server’s figures', () => {
    setLanguage('es');
    const words = adviceSentences(makeInput(1), 'EUR');
    expect(words.reorderPoint).toBe('Punto de pedido 41,6 L = 6 días de plazo de entrega × 5,2 L al día + 10,4 L de stock de seguridad para un nivel de servicio del 95 %.');
    expect(words.order).toBe('Compre 340 L (17 envases de 20 L) ya.');
    expect(words.cover).toBe('Con 30 L en existencia hay para unos 5,8 días a 5,2 L al día.');
    expect(words.orderWhy).toContain('el lote económico de pedido, 337,5 L');
  });

  it('words the reorder list in French, the group titles included', () => {
    setLanguage('fr');
    const now = new Date('2026-12-03T12:00:00.000Z');
    const input = makeInput(1, { due: true, suggestedQuantity: 60, packSize: 20, onHand: 12, dailyDemand: 5, daysOfCover: 2.4, onOrder: 20 });
    expect(reorderGroups([input], now).map((g) => g.title)).toEqual(['À acheter maintenant']);
    expect(buySentence(input, now)).toBe('Achetez 60 L (3 conditionnements de 20 L) maintenant.');
    expect(stockSentence(input)).toBe('Avec 12 L en stock, il y en a pour environ 2,4 jours à 5 L par jour ; 20 L en commande.');
    // French abbreviates December with a full stop ("déc."), which also ends the sentence: one stop, not two.
    expect(buySentence({ ...input, due: false, orderBy: '2026-12-16T12:00:00.000Z' }, now)).toBe('Achetez 60 L (3 conditionnements de 20 L) au plus tard le 16 déc.');
  });

  it('follows a change of language back to English at once', () => {
    setLanguage('fr');
    expect(formatDays(2)).toBe('2 jours');
    setLanguage('en');
    expect(formatDays(2)).toBe('2 days');
  });
});
