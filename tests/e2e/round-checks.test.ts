// Browser test of the round's input traps: the demo worker, on a 360 px phone, types a huge fall of
// the water tank and a 45 °C culture; the round asks on each card, the counter names the tanks still
// to fix or answer, and nothing is sent until both are answered; after sending, the result is
// scrolled into view and announced. Then the demo manager at 1280 px sees the same question for a
// big rise. Limits: 50 % of the last stock, cultures up to 40 °C (common practice, no published source).
import { afterEach, describe, expect, inject, it } from 'vitest';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { launch, pickOption, screenshot, signInAs, type Browser } from '../support/browser';

const { baseUrl } = inject('app');
const people = readScenario().people;
const demo = (role: string) => people.find((p) => p.role === role)!;
const PHONE = { viewport: { width: 360, height: 740 }, isMobile: true };

const opened: Browser[] = [];
async function open(opts: Parameters<typeof launch>[0] = {}): Promise<Browser> {
  const b = await launch(opts);
  opened.push(b);
  return b;
}
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

/** True when the element's top edge is inside the window (scrolled to). */
const inView = (page: Page, testId: string) =>
  page.getByTestId(testId).evaluate((el) => {
    const box = el.getBoundingClientRect();
    return box.top >= 0 && box.top < window.innerHeight;
  });

/** What the window shows now (the helper's screenshots are of the whole page). */
const viewShot = (page: Page, name: string) => page.screenshot({ path: join(process.cwd(), 'test-results', 'screenshots', `${name}.png`) });

describe('round input traps', () => {
  it('asks about a huge fall and a 45 °C culture, names the tanks to fix, and sends and announces once answered', async () => {
    const worker = await open(PHONE);
    await signInAs(worker.page, baseUrl, demo('worker'));
    const phone = worker.page;
    await phone.goto(`${baseUrl}/round`);
    await pickOption(phone, 'round-farm', 'Hollin Ridge');
    await phone.getByTestId('round-tank-HR-W1').waitFor();
    expect(await phone.locator('[data-caution="confined-space"]').innerText()).toMatch(/confined space/);

    // 0 mm + 60 mm datum in the 3.2 m cylinder: π × 1.6² × 0.06 m³ = 483 L (V = π r² h, recalled from memory),
    // far below any stock the demo water tank has held.
    await phone.getByTestId('round-input-HR-W1').fill('0');
    await expect.poll(() => phone.getByTestId('round-question-HR-W1').innerText()).toMatch(/^483 L in the tank, down from [\d,]+ L at the last reading \(\d+ % less\)\. Is the reading right\?/);
    await phone.getByTestId('round-input-HR-C1').fill('800');
    await phone.getByTestId('round-temperature-HR-C1').fill('45');
    await expect.poll(() => phone.getByTestId('round-question-HR-C1').innerText()).toMatch(/45\.0 °C is above 40 °C/);
    expect(await phone.getByTestId('round-tank-HR-C1').locator('[data-caution="electrical"]').count()).toBe(1);
    await phone.getByTestId('round-input-HR-P1').fill('5000');

    const progress = phone.getByTestId('round-progress');
    await expect.poll(() => progress.innerText()).toMatch(/To fix: HR-P1/);
    expect(await progress.innerText()).toMatch(/To answer: HR-W1, HR-C1/);
    // Cleared, the drum is no longer in the way of the round.
    await phone.getByTestId('round-input-HR-P1').fill('');
    await expect.poll(() => phone.getByTestId('round-progress-fix').count()).toBe(0);

    await phone.getByTestId('round-submit').click();
    await expect.poll(() => phone.getByTestId('round-submit-problem').innerText()).toBe('Answer the question on HR-W1, HR-C1 (or correct the reading) before sending.');
    expect(await phone.getByTestId('round-result-HR-W1').count()).toBe(0);
    expect(await phone.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    await phone.getByTestId('round-question-HR-W1').scrollIntoViewIfNeeded();
    await viewShot(phone, 'round-checks-phone-question');
    await screenshot(phone, 'round-checks-phone-asked');

    await phone.getByTestId('round-tank-HR-W1').getByText('Yes, this is right').click();
    await phone.getByTestId('round-tank-HR-C1').getByText('Yes, this is right').click();
    await expect.poll(() => progress.innerText()).toMatch(/^2 of \d+ tanks ready$/);
    await phone.getByTestId('round-submit').click();

    await expect.poll(() => phone.getByTestId('round-result-HR-W1').innerText(), { timeout: 5000 }).toBe('Stored');
    expect(await phone.getByTestId('round-result-HR-C1').innerText()).toBe('Stored');
    await expect.poll(() => phone.getByTestId('round-announcement').innerText()).toBe('Round sent: 2 stored. Round stored.');
    expect(await phone.getByTestId('round-announcement').getAttribute('aria-live')).toBe('polite');
    await expect.poll(() => inView(phone, 'round-summary')).toBe(true);
    expect(await phone.evaluate(() => document.activeElement?.getAttribute('data-testid'))).toBe('round-summary');
    await phone.waitForTimeout(400);
    await viewShot(phone, 'round-checks-phone-sent');

    // The manager at a desk: from the 483 L just stored, 1140 mm (9,651 L in the tank) is a rise worth asking about.
    const desk = await open();
    await signInAs(desk.page, baseUrl, demo('manager'));
    const page = desk.page;
    await page.goto(`${baseUrl}/round`);
    await pickOption(page, 'round-farm', 'Hollin Ridge');
    await page.getByTestId('round-input-HR-W1').fill('1140');
    await expect.poll(() => page.getByTestId('round-question-HR-W1').innerText()).toMatch(/^9,651 L in the tank, up from 483 L at the last reading/);
    await page.getByTestId('round-input-HR-C2').fill('700');
    await page.getByTestId('round-temperature-HR-C2').fill('45');
    await page.getByTestId('round-question-HR-C2').waitFor();
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'round-checks-desktop-asked');
    await page.getByTestId('round-tank-HR-W1').getByText('Yes, this is right').click();
    await page.getByTestId('round-tank-HR-C2').getByText('Yes, this is right').click();
    await page.getByTestId('round-submit').click();
    await expect.poll(() => page.getByTestId('round-announcement').innerText(), { timeout: 5000 }).toBe('Round sent: 2 stored. Round stored.');
    await expect.poll(() => inView(page, 'round-summary')).toBe(true);
    await page.waitForTimeout(400);
    await viewShot(page, 'round-checks-desktop-sent');
  });
});
