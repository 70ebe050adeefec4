// Browser test of the buyer's side with the demo buyer: Inputs shows a due input with what to order
// and when; orders are drafted from the suggestions, the one for that input's supplier is sent and
// lands in the outbox, the delivery is booked in, and Inputs shows the stock risen by what arrived.
// Also the same screens on a 360 px phone.
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { type Browser, dialogOpened, launch, navigateTo, quantityOf, screenshot, signInAs } from '../support/browser';
import { waitForMail } from '../support/mail';

const { baseUrl, outboxDir } = inject('app');
const scenario = readScenario();
const buyer = scenario.people.find((p) => p.role === 'buyer')!;
const PHONE = { viewport: { width: 360, height: 740 }, isMobile: true };

const signIn = (page: Page) => signInAs(page, baseUrl, buyer);

/** A quantity as the screen prints it ("1,021.5 L") as a number. */
/** The demo supplier of a demo input, by the input's name. */
function supplierOf(inputName: string) {
  const input = scenario.inputs.find((i) => i.name === inputName);
  if (!input) throw new Error(`"${inputName}" is not a demo input`);
  return scenario.suppliers.find((s) => s.key === input.supplier)!;
}

/** A screenshot once messages, drawers and dialogs have finished sliding and fading in. */
async function shot(page: Page, name: string) {
  await page.waitForTimeout(450);
  await screenshot(page, name);
}

/** A screenshot of a drawer or dialog whole: a tall window for the moment, so nothing scrolls inside it. */
async function tallShot(page: Page, name: string) {
  const size = page.viewportSize()!;
  await page.setViewportSize({ width: size.width, height: 2400 });
  await shot(page, name);
  await page.setViewportSize(size);
}

const opened: Browser[] = [];
async function open(opts: Parameters<typeof launch>[0] = {}): Promise<Browser> {
  const b = await launch(opts);
  opened.push(b);
  return b;
}
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

describe('buyer’s side', () => {
  it('orders a due input from the suggestions, e-mails the order, books it in and sees the stock rise', async () => {
    const { page } = await open();
    await signIn(page);
    await navigateTo(page, 'inputs');
    await page.waitForURL(/\/inputs$/);
    await page.getByTestId('inputs-list').waitFor();

    // The server sorts the due inputs first; the first row is one to buy now, under that heading, with a quantity.
    const dueRow = page.locator('[data-testid^="input-row-"][data-due="true"]').first();
    await dueRow.waitFor();
    const rowId = (await dueRow.getAttribute('data-testid'))!;
    expect(await page.locator('[data-testid^="input-row-"]').first().getAttribute('data-testid')).toBe(rowId);
    const inputName = (await dueRow.locator('[data-testid^="input-open-"]').innerText()).trim();
    expect(await page.getByTestId('reorder-group-now').getByTestId(rowId).count()).toBe(1);
    expect(await dueRow.getByTestId('input-suggested').innerText()).toMatch(/^Buy [\d.,]+ \S+ \(\d+ packs? of .+\) now\.$/);
    const suggested = quantityOf(await dueRow.getByTestId('input-suggested').innerText());
    expect(suggested).toBeGreaterThan(0);
    const onHandBefore = quantityOf(await dueRow.getByTestId('input-onhand').innerText());
    // A later input says the day to buy by.
    const laterWords = await page.locator('[data-testid^="input-row-"][data-due="false"] [data-testid="input-suggested"]').allInnerTexts();
    expect(laterWords.some((t) => /^Buy .+ by .+\.$/.test(t))).toBe(true);
    await shot(page, 'buyer-inputs-1280');

    await dueRow.locator('[data-testid^="input-open-"]').click();
    const drawer = page.getByTestId('input-drawer');
    await drawer.getByTestId('input-advice').waitFor();
    expect(await drawer.getByTestId('input-advice-order').innerText()).toMatch(new RegExp(`^Buy ${suggested.toLocaleString('en-US')} .+ now\\.$`));
    expect(await drawer.getByTestId('input-advice-rop').innerText()).toMatch(/^Reorder point [\d.,]+ \S+ = [\d.,]+ days? of lead time × [\d.,]+ \S+ a day \+ [\d.,]+ \S+ safety stock for a 95 % service level\./);
    await drawer.getByTestId('input-movements').locator('[data-testid^="movement-"]').first().waitFor();
    await tallShot(page, 'buyer-input-detail-1280');
    await page.keyboard.press('Escape');

    // An empty new-input form is refused field by field, in words.
    await page.getByTestId('inputs-new').click();
    const inputDialog = page.getByTestId('input-dialog');
    await inputDialog.getByTestId('input-submit').click();
    expect(await inputDialog.locator('#input-name-error').innerText()).toBe('Required');
    expect(await inputDialog.locator('#input-category-error').innerText()).toBe('Choose a category');
    await tallShot(page, 'buyer-input-new-1280');
    await page.keyboard.press('Escape');

    // Draft orders from the suggestions, then send the one for this input's supplier.
    const supplier = supplierOf(inputName);
    await navigateTo(page, 'orders');
    await page.waitForURL(/\/orders/);
    await page.getByTestId('orders-draft-suggestions').click();
    const draftRow = page.locator('[data-testid^="order-row-"][data-status="draft"]', { hasText: supplier.name }).first();
    await draftRow.waitFor();
    const orderNumber = (await draftRow.locator('[data-testid^="order-open-"]').innerText()).trim();
    await shot(page, 'buyer-orders-drafted-1280');
    await draftRow.locator('[data-testid^="order-open-"]').click();
    const orderDrawer = page.getByTestId('order-drawer');
    await orderDrawer.getByTestId('order-status').waitFor();
    expect(await orderDrawer.getByTestId('order-status').innerText()).toBe('Draft');
    const lineQuantity = page.locator('[data-testid^="order-edit-"][data-testid$="-quantity"] input');
    const lineNames = await orderDrawer.locator('[data-testid^="order-edit-line-"] [data-testid$="-input"]').allInnerTexts();
    const lineIndex = lineNames.findIndex((t) => t.includes(inputName));
    expect(lineIndex).toBeGreaterThanOrEqual(0);
    expect(quantityOf(await lineQuantity.nth(lineIndex).inputValue())).toBe(suggested);
    await tallShot(page, 'buyer-order-draft-1280');

    await orderDrawer.getByTestId('order-send').click();
    const confirmText = await page.locator('.p-confirmdialog').innerText();
    expect(confirmText).toContain(`This e-mails the order to ${supplier.email}`);
    await shot(page, 'buyer-order-send-confirm-1280');
    await page.getByTestId('order-send-confirm').click();
    await orderDrawer.getByTestId('order-sent-notice').waitFor();
    expect(await orderDrawer.getByTestId('order-status').innerText()).toBe('Sent');
    expect(await orderDrawer.getByTestId('order-sent-notice').innerText()).toContain(`e-mail to ${supplier.email}`);

    const mail = await waitForMail(outboxDir, supplier.email, 10_000);
    expect(mail.subject).toContain(orderNumber);
    expect(mail.text).toContain(inputName);
    expect(mail.attachments.map((a) => a.filename)).toContain(`${orderNumber}.csv`);
    await tallShot(page, 'buyer-order-sent-1280');

    await orderDrawer.getByTestId('order-outbox-link').click();
    await page.waitForURL(/\/outbox$/);
    const message = page.getByTestId('outbox-message').filter({ hasText: orderNumber }).first();
    await message.waitFor();
    expect(await message.getByTestId('outbox-to').innerText()).toContain(supplier.email);
    await shot(page, 'buyer-outbox-1280');

    // The delivery arrives in full: book it in, each line at what is still due.
    await page.goto(`${baseUrl}/orders`);
    const sentRow = page.locator('[data-testid^="order-row-"]', { hasText: orderNumber });
    await sentRow.locator('[data-testid^="order-open-"]').click();
    await orderDrawer.getByTestId('order-receive').click();
    const receipt = page.getByTestId('receipt-dialog');
    await receipt.waitFor();
    await shot(page, 'buyer-receipt-1280');
    await receipt.getByTestId('receipt-submit').click();
    await expect.poll(() => orderDrawer.getByTestId('order-status').innerText()).toBe('Received');
    const received = await orderDrawer.getByTestId('order-lines').locator('[data-testid="order-line-received"]').allInnerTexts();
    expect(received.map(quantityOf)).toContain(suggested);

    await page.goto(`${baseUrl}/inputs`);
    const row = page.getByTestId(rowId);
    await row.waitFor();
    expect(quantityOf(await row.getByTestId('input-onhand').innerText())).toBeCloseTo(onHandBefore + suggested, 1);
    expect(await row.getAttribute('data-due')).toBe('false');
    await shot(page, 'buyer-inputs-after-delivery-1280');
  });

  it('shows the inputs, an input’s advice and the orders on a 360 px phone', async () => {
    const { page } = await open(PHONE);
    await signIn(page);
    await page.goto(`${baseUrl}/inputs`);
    await page.getByTestId('inputs-list').waitFor();
    const first = page.locator('[data-testid^="input-row-"]').first();
    expect(await first.getByTestId('input-suggested').innerText()).toMatch(/^(Buy .+|Nothing to buy yet\.)$/);
    // Nothing wider than the phone: the page must not scroll sideways.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    await shot(page, 'buyer-inputs-360');

    await first.locator('[data-testid^="input-open-"]').click();
    await page.getByTestId('input-advice').waitFor();
    await tallShot(page, 'buyer-input-detail-360');
    await page.getByTestId('input-record-count').click();
    await dialogOpened(page, 'movement-dialog');
    await shot(page, 'buyer-count-360');
    await page.keyboard.press('Escape');
    await page.keyboard.press('Escape');

    const pest = page.locator('[data-testid^="input-row-"]', { has: page.locator('.input-pest') }).first();
    await pest.locator('[data-testid^="input-open-"]').click();
    expect(await page.getByTestId('input-caution').innerText()).toContain('Store pest-control products locked up and labelled.');
    await page.keyboard.press('Escape');

    await page.goto(`${baseUrl}/orders`);
    await page.getByTestId('orders-list').or(page.getByTestId('empty-state')).first().waitFor();
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    await shot(page, 'buyer-orders-360');
    const firstOrder = page.locator('[data-testid^="order-open-"]').first();
    if (await firstOrder.count()) {
      await firstOrder.click();
      await page.getByTestId('order-status').waitFor();
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
      await tallShot(page, 'buyer-order-360');
      await page.keyboard.press('Escape');
    }

    await page.goto(`${baseUrl}/suppliers`);
    await page.getByTestId('suppliers-list').waitFor();
    expect(await page.getByTestId('suppliers-list').innerText()).toContain(scenario.suppliers[0]!.name);
    await shot(page, 'buyer-suppliers-360');
  });
});
