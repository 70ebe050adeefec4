// Browser test of brews: the demo worker, on a phone, logs a culture brew in HR-C2 at Hollin
// Ridge with 2 L of Blackstrap molasses; that input's stock falls by 2 L. A temperature logged on
// the brew at 15 °C shows up as a cold-culture flag (cultures go inactive under about 18 °C:
// common practice, no published source).
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { type Browser, dialogOpened, launch, pickOption, quantityOf, screenshot, signInAs } from '../support/browser';

const { baseUrl } = inject('app');
const worker = readScenario().people.find((p) => p.role === 'worker')!;
const PHONE = { viewport: { width: 360, height: 740 }, isMobile: true };

const signIn = (page: Page) => signInAs(page, baseUrl, worker);

async function molassesOnHand(page: Page): Promise<number> {
  await page.goto(`${baseUrl}/inputs`);
  const row = page.locator('[data-testid^="input-row-"]').filter({ hasText: 'Blackstrap molasses' }).first();
  await row.waitFor();
  return quantityOf(await row.getByTestId('input-onhand').innerText());
}

const opened: Browser[] = [];
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

describe('brews on a phone', () => {
  it('logs a culture brew with 2 L of molasses, takes it off stock, and flags a cold temperature logged on it', async () => {
    const phone = await launch(PHONE);
    opened.push(phone);
    const { page } = phone;
    await signIn(page);
    const before = await molassesOnHand(page);

    await page.goto(`${baseUrl}/brews`);
    await page.getByTestId('brew-new').click();
    await dialogOpened(page, 'brew-dialog');
    await pickOption(page, 'brew-farm', 'Hollin Ridge');
    await pickOption(page, 'brew-tank', /\(HR-C2\)$/);
    await pickOption(page, 'brew-kind', 'Culture');
    await page.getByTestId('brew-name').fill('Molasses starter, week 49');
    // The calculator: 1 part to 50 parts water for 102 L in all gives 2 L concentrate + 100 L water.
    await page.getByTestId('mix-n').fill('50');
    await page.getByTestId('mix-total').fill('102');
    await page.getByTestId('mix-conv-water').click();
    await expect.poll(() => page.getByTestId('mix-concentrate').innerText()).toMatch(/^2(\.0+)? L$/);
    expect(await page.getByTestId('mix-water').innerText()).toMatch(/^100(\.0+)? L$/);
    await page.getByTestId('mix-use').click();
    expect(await page.getByTestId('brew-water').inputValue()).toBe('100');
    expect(await page.getByTestId('caution-heater').innerText()).toMatch(/residual-current/i);
    if (!(await page.getByTestId('brew-line-0').count())) await page.getByTestId('brew-add-line').click();
    await pickOption(page, 'brew-line-0-input', /^Blackstrap molasses/);
    await page.getByTestId('brew-line-0-qty').fill('2');
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    await screenshot(page, 'brews-new-phone');
    await page.getByTestId('brew-save').click();

    const card = page.locator('li[data-testid^="brew-"]').filter({ hasText: 'Molasses starter, week 49' }).first();
    await card.waitFor();
    expect(await card.getByTestId('brew-inputs').innerText()).toBe('Blackstrap molasses 2 L');
    expect(await card.getByTestId('brew-status').innerText()).toBe('Brewing');
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);

    // A temperature under 18 °C logged on the brew.
    const id = (await card.getAttribute('data-testid'))!.replace('brew-', '');
    await page.getByTestId(`brew-${id}-temp`).fill('15');
    await page.getByTestId(`brew-${id}-temp`).press('Enter');
    await expect.poll(() => card.locator('.brew__temps').innerText()).toMatch(/15/);
    await page.waitForTimeout(500);
    await screenshot(page, 'brews-list-phone');

    await expect.poll(() => molassesOnHand(page), { timeout: 10_000 }).toBeCloseTo(before - 2, 3);

    await page.goto(`${baseUrl}/flags`);
    const flag = page.locator('[data-testid^="flags-row-"][data-kind="cold-culture"]').filter({ hasText: 'HR-C2' });
    await expect.poll(async () => {
      await page.reload();
      await page.locator('[data-testid^="flags-row-"]').first().waitFor();
      return (await flag.count()) ? flag.first().innerText() : '';
    }, { timeout: 15_000, interval: 500 }).toMatch(/at 15 °C/);
  });
});
