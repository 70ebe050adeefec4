// Browser test of the buyer's screens in French and Spanish: the demo buyer, switched to French on the
// Profile API, opens Inputs (the reorder list and a due input's drawer) and Orders (the list and an
// order's drawer) at 1280 px; then in Spanish the same two screens on a 360 px phone, which must not
// scroll sideways with the longer words. Neither shows an English word of the inputs and orders
// messages; numbers carry the language's decimal comma. The buyer's language is set back afterwards.
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { launch, screenshot, signInAs, type Browser } from '../support/browser';
import { englishWordsIn, flatten, readArea, sessionLanguage, setLanguage, wordsOf } from '../support/page-language';

const { baseUrl } = inject('app');
const buyer = readScenario().people.find((p) => p.role === 'buyer')!;
const DESK = { width: 1280, height: 860 };
const PHONE = { width: 360, height: 740 };

/** The areas whose English must not show on these screens: this test's own (other areas have their own tests). */
const OWN_AREAS = ['inputs', 'orders'];
/** Every area of the language, for the words it uses itself ("total", "stock", "notes" are French too). */
const ALL_AREAS = ['app', 'common', 'words', 'errors', 'inputs', 'orders', 'suppliers', 'farms'];

/** English words of the own areas' messages, less every word the language itself uses. */
function englishOnlyWords(language: string): Set<string> {
  const english = new Set<string>(['the', 'and', 'of', 'with', 'buy', 'order', 'orders', 'hand', 'day', 'days']);
  for (const area of OWN_AREAS) for (const text of flatten(readArea('en', area)).values()) for (const w of wordsOf(text)) english.add(w);
  for (const area of ALL_AREAS) for (const text of flatten(readArea(language, area)).values()) for (const w of wordsOf(text)) english.delete(w);
  return english;
}

/** The organisation's own data these screens show (names of inputs, suppliers, farms, people; movement reasons, order numbers and notes). */
async function dataTexts(page: Page): Promise<string[]> {
  const texts = await page.evaluate(async () => {
    const get = async (path: string) => (await fetch(path, { credentials: 'same-origin' })).json();
    const out: unknown[] = [];
    const session = await get('/api/auth/session');
    out.push(session.user?.name, session.user?.email, session.user?.organisationName);
    for (const f of await get('/api/farms')) out.push(f.name);
    for (const s of await get('/api/suppliers')) out.push(s.name, s.email, s.contactName, s.notes);
    for (const i of await get('/api/inputs')) {
      out.push(i.name, i.notes, i.farmName, i.supplierName);
      // Reasons typed with each movement ("Shelf count") are the organisation's words too.
      for (const m of await get(`/api/inputs/${i.id}/movements`)) out.push(m.reason, m.by);
    }
    for (const o of await get('/api/orders')) {
      out.push(o.number, o.notes, o.createdBy, o.closedShortBy, o.closedShortReason, o.supplierName, o.supplierEmail, o.farmName);
      for (const l of o.lines) out.push(l.inputName);
    }
    return out.filter((v): v is string => typeof v === 'string' && v.trim() !== '');
  });
  return texts.sort((a, b) => b.length - a.length);
}

/**
 * The English words in `selector`'s text, the organisation's data taken out first. The safety cautions are left
 * out: their words come from shared/cautions and are checked where they are translated.
 */
async function englishIn(page: Page, selector: string, english: Set<string>, data: string[]): Promise<string[]> {
  const text = await page.locator(selector).first().evaluate((root) => {
    const copy = root.cloneNode(true) as HTMLElement;
    copy.querySelectorAll('[data-testid$="caution"]').forEach((el) => el.remove());
    return copy.innerText ?? copy.textContent ?? '';
  });
  return englishWordsIn(text, english, data);
}

/** Drafts orders from the reorder list when the organisation has none yet, so the Orders screen has rows; returns their ids. */
async function ensureOrders(page: Page): Promise<number[]> {
  return page.evaluate(async () => {
    const orders = (await (await fetch('/api/orders')).json()) as unknown[];
    if (orders.length) return [];
    const { csrfToken } = (await (await fetch('/api/auth/session')).json()) as { csrfToken: string };
    const res = await fetch('/api/orders/from-suggestions', { method: 'POST', headers: { 'Content-Type': 'application/json', 'X-CSRF-Token': csrfToken }, body: '{}' });
    return ((await res.json()) as { id: number }[]).map((o) => o.id);
  });
}

/** Cancels the drafts this test made, so the other browser tests find the organisation's orders as they left them. */
async function cancelOrders(page: Page, ids: number[]): Promise<void> {
  await page.evaluate(async (list) => {
    const { csrfToken } = (await (await fetch('/api/auth/session')).json()) as { csrfToken: string };
    for (const id of list) await fetch(`/api/orders/${id}/cancel`, { method: 'POST', headers: { 'X-CSRF-Token': csrfToken } });
  }, ids);
}

async function settle(page: Page): Promise<void> {
  await page.waitForTimeout(450);
}

const opened: Browser[] = [];
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

describe('the buyer’s screens in French and Spanish', () => {
  it('shows Inputs and Orders in French on a desk and in Spanish on a phone, with no English word of either', async () => {
    const browser = await launch({ viewport: DESK, locale: 'fr-FR' });
    opened.push(browser);
    const page = browser.page;
    await signInAs(page, baseUrl, buyer);
    const before = await sessionLanguage(page);
    // Other browser tests sign the buyer in from an English Chromium: English is what it goes back to.
    const restore = before && before !== 'fr' ? before : 'en';
    let drafted: number[] = [];
    try {
      await setLanguage(page, 'fr');
      drafted = await ensureOrders(page);
      const data = await dataTexts(page);
      const french = englishOnlyWords('fr');
      // The words looked for are real ones of the catalogues.
      expect(french.has('reorder')).toBe(true);

      await page.goto(`${baseUrl}/inputs`);
      await page.getByTestId('inputs-list').waitFor();
      expect(await page.locator('h1').innerText()).toBe('Intrants');
      const dueRow = page.locator('[data-testid^="input-row-"][data-due="true"]').first();
      await dueRow.waitFor();
      expect(await dueRow.getByTestId('input-suggested').innerText()).toMatch(/^Achetez [\d\s\u202f,]+ \S+ \(\d+ conditionnements? de .+\) maintenant\.$/);
      expect(await englishIn(page, 'main', french, data)).toEqual([]);
      await screenshot(page, 'buyer-french-inputs-1280');

      await dueRow.locator('[data-testid^="input-open-"]').click();
      const drawer = page.getByTestId('input-drawer');
      await drawer.getByTestId('input-advice').waitFor();
      await settle(page);
      expect(await drawer.getByTestId('input-advice-rop').innerText()).toMatch(/^Point de commande [\d\s\u202f,]+ \S+ = [\d,]+ jours? de délai de livraison × /);
      expect(await englishIn(page, '[data-testid="input-drawer"]', french, data)).toEqual([]);
      await screenshot(page, 'buyer-french-input-drawer-1280');
      await page.keyboard.press('Escape');

      await page.goto(`${baseUrl}/orders`);
      await page.getByTestId('orders-list').waitFor();
      expect(await page.locator('h1').innerText()).toBe('Commandes');
      expect(await englishIn(page, 'main', french, data)).toEqual([]);
      await screenshot(page, 'buyer-french-orders-1280');
      await page.locator('[data-testid^="order-open-"]').first().click();
      await page.getByTestId('order-status').waitFor();
      await settle(page);
      expect(await englishIn(page, '[data-testid="order-drawer"]', french, data)).toEqual([]);
      await screenshot(page, 'buyer-french-order-drawer-1280');

      // On a phone in Spanish: nothing wider than the screen, and no English word either.
      await setLanguage(page, 'es');
      const spanish = englishOnlyWords('es');
      await page.setViewportSize(PHONE);
      await page.goto(`${baseUrl}/inputs`);
      await page.getByTestId('inputs-list').waitFor();
      expect(await page.locator('h1').innerText()).toBe('Insumos');
      await settle(page);
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width);
      expect(await englishIn(page, 'main', spanish, data)).toEqual([]);
      await screenshot(page, 'buyer-spanish-inputs-360');

      await page.goto(`${baseUrl}/orders`);
      await page.getByTestId('orders-list').waitFor();
      expect(await page.locator('h1').innerText()).toBe('Pedidos');
      await settle(page);
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width);
      expect(await englishIn(page, 'main', spanish, data)).toEqual([]);
      await screenshot(page, 'buyer-spanish-orders-360');
    } finally {
      await cancelOrders(page, drafted);
      await setLanguage(page, restore);
    }
  });
});
