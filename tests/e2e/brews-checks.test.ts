// Browser test of the new-brew checks on the demo: in Culture cone B (HR-C2) at Hollin Ridge the
// calculator and the form refuse a batch larger than the tank's free space below its safe fill line,
// warn within its last 10 % and say nothing for half of it; an input taken beyond its stock on hand
// is refused with the amount missing. Nothing is saved. Screens at 1280 px (manager) and 360 px (worker).
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { type Browser, dialogOpened, launch, pickOption, quantityOf, screenshot, signInAs } from '../support/browser';

const { baseUrl } = inject('app');
const people = readScenario().people;
const manager = people.find((p) => p.role === 'manager')!;
const worker = people.find((p) => p.role === 'worker')!;

const opened: Browser[] = [];
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

const scrollWidth = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth);

async function molassesOnHand(page: Page): Promise<number> {
  await page.goto(`${baseUrl}/inputs`);
  const row = page.locator('[data-testid^="input-row-"]').filter({ hasText: 'Blackstrap molasses' }).first();
  await row.waitFor();
  return quantityOf(await row.getByTestId('input-onhand').innerText());
}

/** Walks the checks in HR-C2 and saves a screenshot of the refusals and of the warning under `name`. */
async function walkTheChecks(page: Page, name: string, width: number): Promise<void> {
  const onHand = await molassesOnHand(page);
  await page.goto(`${baseUrl}/brews`);
  await page.getByTestId('brew-new').click();
  await dialogOpened(page, 'brew-dialog');
  await pickOption(page, 'brew-farm', 'Hollin Ridge');
  await pickOption(page, 'brew-tank', /\(HR-C2\)$/);
  await page.getByTestId('brew-name').fill('Compost tea, checks');
  // The start is typed in a DatePicker that writes the date as formatDateTime shows it (Intl, medium date).
  const started = page.getByTestId('brew-started').locator('input');
  const today = await page.evaluate(() => new Intl.DateTimeFormat(undefined, { dateStyle: 'medium' }).format(new Date()));
  expect(await started.inputValue()).toMatch(new RegExp(`^${today.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}, \\d{2}:\\d{2}`));
  await page.locator('.p-select-overlay').waitFor({ state: 'detached' });
  await screenshot(page, `${name}-dates`);

  // The calculator: 1 part to 50 parts water for 5,100 L cannot go into an 800 L cone.
  await page.getByTestId('mix-n').fill('50');
  await page.getByTestId('mix-total').fill('5100');
  await page.getByTestId('mix-conv-water').click();
  const calcOver = page.getByTestId('batch-over-calculator');
  await expect.poll(() => calcOver.innerText()).toMatch(/Does not fit Culture cone B\.\s+These amounts make 5,100(\.0)? L/);
  expect(await page.getByTestId('mix-use').isDisabled()).toBe(true);
  const freeL = quantityOf(/than the ([\d,.]+) L of free space/.exec(await calcOver.innerText())![1]!);
  expect(freeL).toBeGreaterThan(0);

  // The form: water over the free space, and more molasses than the shelf holds.
  await page.getByTestId('brew-water').fill(String(Math.ceil(freeL + 5)));
  const formOver = page.getByTestId('batch-over-form');
  await expect.poll(() => formOver.innerText()).toMatch(/Does not fit Culture cone B\./);
  expect(await formOver.innerText()).toMatch(/below its safe fill line \(it holds [\d,.]+ L of [\d,.]+ L\)/);
  if (!(await page.getByTestId('brew-line-0').count())) await page.getByTestId('brew-add-line').click();
  await pickOption(page, 'brew-line-0-input', /^Blackstrap molasses/);
  await page.getByTestId('brew-line-0-qty').fill(String(onHand + 5));
  const short = page.getByTestId('batch-short-form');
  await expect.poll(() => short.innerText()).toMatch(/Blackstrap molasses: this brew takes [\d,.]+ L, 5 L more than the [\d,.]+ L on hand\./);
  expect(await page.getByTestId('brew-save').isDisabled()).toBe(true);
  expect(await scrollWidth(page)).toBeLessThanOrEqual(width);
  await page.getByTestId('batch-checks-form').scrollIntoViewIfNeeded();
  await screenshot(page, `${name}-refused`);

  // Within the last 10 % of the free space: a warning, and Save is back once the molasses is covered.
  await page.getByTestId('brew-line-0-qty').fill('1');
  await page.getByTestId('brew-water').fill(String(Math.floor(freeL * 0.95 - 1)));
  const tight = page.getByTestId('batch-tight-form');
  await expect.poll(() => tight.innerText()).toMatch(/Close to the safe fill line\.\s+This brew makes [\d,.]+ L, 9\d % of the [\d,.]+ L free in Culture cone B/);
  expect(await page.getByTestId('batch-short-form').count()).toBe(0);
  expect(await page.getByTestId('brew-save').isDisabled()).toBe(false);
  await tight.scrollIntoViewIfNeeded();
  await screenshot(page, `${name}-warned`);

  // Half the free space: nothing to say.
  await page.getByTestId('brew-water').fill(String(Math.floor(freeL / 2)));
  await expect.poll(() => page.getByTestId('batch-checks-form').count()).toBe(0);
}

describe('new-brew checks', () => {
  it('refuses a batch over the free space and molasses beyond stock, and warns near the line, at 1280 px', async () => {
    const wide = await launch({ viewport: { width: 1280, height: 900 } });
    opened.push(wide);
    await signInAs(wide.page, baseUrl, manager);
    await walkTheChecks(wide.page, 'brews-checks-1280', 1280);
  });

  it('does the same on a 360 px phone without sideways scrolling', async () => {
    const phone = await launch({ viewport: { width: 360, height: 740 }, isMobile: true });
    opened.push(phone);
    await signInAs(phone.page, baseUrl, worker);
    await walkTheChecks(phone.page, 'brews-checks-360', 360);
  });
});
