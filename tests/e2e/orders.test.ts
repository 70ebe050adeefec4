// Browser test of purchase orders with the demo buyer at 1280 and 360 px: order numbers by the
// organisation's code and year, money in its currency, line fields of one height, the whole-pack
// nudge, a toast shown above the open order drawer, and a part delivery closed short with a reason.
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { type Browser, dialogOpened, launch, quantityOf, screenshot, signInAs } from '../support/browser';

const { baseUrl } = inject('app');
const scenario = readScenario();
const buyer = scenario.people.find((p) => p.role === 'buyer')!;
const PHONE = { viewport: { width: 360, height: 740 }, isMobile: true };
const CURRENCY = scenario.organisation.currency;

const opened: Browser[] = [];
async function open(opts: Parameters<typeof launch>[0] = {}): Promise<Browser> {
  const b = await launch(opts);
  opened.push(b);
  return b;
}
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

async function shot(page: Page, name: string) {
  await page.waitForTimeout(450);
  await screenshot(page, name);
}

interface Order { id: number; number: string; lines: { id: number; quantity: number }[] }
interface InputRow { id: number; name: string; farmId: number; supplierId: number | null; packSize: number; onOrder: number; unit: string }

/** The API as the signed-in page calls it (same cookies, the session's CSRF token). */
async function api(page: Page) {
  const csrf = (await (await page.request.get(`${baseUrl}/api/auth/session`)).json()).csrfToken as string;
  const send = async <T>(method: 'get' | 'post', path: string, data?: object): Promise<T> => {
    const res = await page.request[method](`${baseUrl}${path}`, { headers: { 'x-csrf-token': csrf }, ...(data ? { data } : {}) });
    if (!res.ok()) throw new Error(`${method} ${path}: ${res.status()} ${await res.text()}`);
    return (await res.json()) as T;
  };
  return {
    input: async (name: string) => (await send<InputRow[]>('get', '/api/inputs')).find((i) => i.name === name)!,
    /** A sent order for `quantity` of the input with `arrived` of it booked in. */
    async partDelivered(input: InputRow, quantity: number, arrived: number): Promise<Order> {
      const o = await send<Order>('post', '/api/orders', { supplierId: input.supplierId, farmId: input.farmId, lines: [{ inputId: input.id, quantity }] });
      await send('post', `/api/orders/${o.id}/send`);
      return send<Order>('post', `/api/orders/${o.id}/receipts`, { lines: [{ lineId: o.lines[0]!.id, quantity: arrived }] });
    },
    draft: (input: InputRow, quantity: number) => send<Order>('post', '/api/orders', { supplierId: input.supplierId, farmId: input.farmId, lines: [{ inputId: input.id, quantity }] }),
  };
}

/** Whether the toast's message is the topmost element at its own centre (nothing covers it). */
async function toastOnTop(page: Page): Promise<boolean> {
  const message = page.locator('.p-toast-message').last();
  await message.waitFor();
  return message.evaluate((el) => {
    const r = el.getBoundingClientRect();
    const top = document.elementFromPoint(r.left + r.width / 2, r.top + r.height / 2);
    return !!top && el.contains(top);
  });
}

async function closeShort(page: Page, reason: string) {
  const drawer = page.getByTestId('order-drawer');
  await drawer.getByTestId('order-close-short').click();
  await dialogOpened(page, 'close-short-dialog');
  await page.getByTestId('close-short-submit').click();
  expect(await page.getByTestId('close-short-reason-error').innerText()).toBe('say why the rest will not come');
  await page.getByTestId('close-short-reason').fill(reason);
}

describe('purchase orders', () => {
  it('numbers by code and year, shows the currency, keeps line fields level, and closes a part delivery short at 1280 px', async () => {
    const { page } = await open();
    await signInAs(page, baseUrl, buyer);
    const call = await api(page);
    const kelp = await call.input('Kelp concentrate');

    // A draft: its number, money in the organisation's currency, and the line's fields at one height.
    const draft = await call.draft(kelp, kelp.packSize * 2);
    expect(draft.number).toMatch(new RegExp(`^${scenario.organisation.code}-\\d{2}-\\d{3}$`));
    await page.goto(`${baseUrl}/orders?order=${draft.id}`);
    const drawer = page.getByTestId('order-drawer');
    await drawer.getByTestId('order-status').waitFor();
    const symbol = new Intl.NumberFormat('en-US', { style: 'currency', currency: CURRENCY }).formatToParts(1).find((p) => p.type === 'currency')!.value;
    expect(await drawer.getByTestId('order-total').innerText()).toContain(symbol);
    await drawer.getByTestId('order-edit-0-quantity').waitFor();
    const heights = await Promise.all(['order-edit-0-input', 'order-edit-0-quantity', 'order-edit-0-price'].map(async (id) => (await drawer.getByTestId(id).boundingBox())!.height));
    expect(Math.max(...heights) - Math.min(...heights)).toBeLessThanOrEqual(1);
    const tops = await Promise.all(['order-edit-0-input', 'order-edit-0-quantity', 'order-edit-0-price'].map(async (id) => (await drawer.getByTestId(id).boundingBox())!.y));
    expect(Math.max(...tops) - Math.min(...tops)).toBeLessThanOrEqual(1);

    // A quantity that is not whole packs is pointed out and can be rounded up.
    const qty = drawer.locator('[data-testid="order-edit-0-quantity"] input');
    await qty.fill(String(kelp.packSize * 2 + 3));
    await qty.blur();
    const packNote = drawer.getByTestId('order-edit-0-quantity-packs');
    expect(await packNote.innerText()).toContain(`would be 3 packs of ${kelp.packSize} ${kelp.unit}`);
    await shot(page, 'orders-draft-pack-note-1280');
    await drawer.getByTestId('order-edit-0-quantity-round').click();
    expect(quantityOf(await qty.inputValue())).toBe(kelp.packSize * 3);

    // Saving shows a toast while the drawer stays open: it must sit above the drawer.
    await drawer.getByTestId('order-save').click();
    expect(await toastOnTop(page)).toBe(true);
    await shot(page, 'orders-toast-over-drawer-1280');
    await page.keyboard.press('Escape');

    // The list shows the numbers and the totals in the currency.
    await page.getByTestId('orders-list').waitFor();
    const row = page.getByTestId(`order-row-${draft.id}`);
    expect(await row.innerText()).toContain(draft.number);
    expect(await row.innerText()).toContain(symbol);
    await shot(page, 'orders-list-1280');

    // A part delivery closed short: the reason is asked for, then the status, the reason and the cancelled rest show.
    const before = (await call.input('Kelp concentrate')).onOrder;
    const part = await call.partDelivered(kelp, kelp.packSize * 4, kelp.packSize);
    expect((await call.input('Kelp concentrate')).onOrder).toBeCloseTo(before + kelp.packSize * 3, 6);
    await page.goto(`${baseUrl}/orders?order=${part.id}`);
    await drawer.getByTestId('order-status').waitFor();
    expect(await drawer.getByTestId('order-status').innerText()).toBe('Part received');
    await closeShort(page, 'Supplier has no more kelp until the spring harvest');
    await shot(page, 'orders-close-short-dialog-1280');
    await page.getByTestId('close-short-submit').click();
    await expect.poll(() => drawer.getByTestId('order-status').innerText()).toBe('Closed short');
    expect(await toastOnTop(page)).toBe(true);
    expect(await drawer.getByTestId('order-closed-short').innerText()).toContain('Supplier has no more kelp until the spring harvest');
    expect(quantityOf(await drawer.getByTestId('order-line-cancelled').innerText())).toBe(kelp.packSize * 3);
    expect(await drawer.getByTestId('order-receive').count()).toBe(0);
    await shot(page, 'orders-closed-short-1280');
    expect((await call.input('Kelp concentrate')).onOrder).toBeCloseTo(before, 6);
  });

  it('closes a part delivery short on a 360 px phone, with the toast above the full-width drawer', async () => {
    const { page } = await open(PHONE);
    await signInAs(page, baseUrl, buyer);
    const call = await api(page);
    const fish = await call.input('Fish hydrolysate');
    const part = await call.partDelivered(fish, fish.packSize * 2, fish.packSize);

    await page.goto(`${baseUrl}/orders`);
    await page.getByTestId('orders-list').waitFor();
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    expect(await page.getByTestId(`order-row-${part.id}`).innerText()).toContain(part.number);
    await shot(page, 'orders-list-360');

    await page.getByTestId(`order-open-${part.id}`).click();
    const drawer = page.getByTestId('order-drawer');
    await drawer.getByTestId('order-status').waitFor();
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    await closeShort(page, 'Rest back-ordered for six weeks; bought elsewhere');
    await shot(page, 'orders-close-short-dialog-360');
    await page.getByTestId('close-short-submit').click();
    await expect.poll(() => drawer.getByTestId('order-status').innerText()).toBe('Closed short');
    expect(await toastOnTop(page)).toBe(true);
    await shot(page, 'orders-closed-short-360');
  });
});
