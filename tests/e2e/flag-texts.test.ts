// Browser test of flag texts: the demo manager has a mobile number and texts on, so the demo's flags
// raised just after start-up reach them as a text, which the Outbox shows beside the mails. The
// owner gives a number on the Profile, is refused texts without one and a landline, and turns texts on.
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { type Browser, launch, screenshot, signInAs } from '../support/browser';

const { baseUrl } = inject('app');
const people = readScenario().people;
const demo = (role: string) => people.find((p) => p.role === role)!;
const SIZES = [
  { name: 'wide', opts: { viewport: { width: 1280, height: 900 } } },
  { name: 'phone', opts: { viewport: { width: 360, height: 740 }, isMobile: true } },
] as const;

const opened: Browser[] = [];
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

async function outboxTexts(page: Page) {
  await page.goto(`${baseUrl}/outbox`);
  await page.locator('[data-testid="outbox-text"], [data-testid="outbox-texts-none"]').first().waitFor();
  return page.getByTestId('outbox-text');
}

describe('flag texts in the browser', () => {
  it.each(SIZES)('shows the demo manager’s flag text in the Outbox, linking to a tank ($name)', async ({ name, opts }) => {
    const browser = await launch(opts);
    opened.push(browser);
    await signInAs(browser.page, baseUrl, demo('manager'));
    const manager = demo('manager') as { phone?: string };
    expect(manager.phone).toBe('+61491570156');
    // The demo's flags are raised about a second after start-up and the texts sent within seconds.
    await expect.poll(async () => (await outboxTexts(browser.page)).count(), { timeout: 20_000, interval: 1000 }).toBeGreaterThan(0);
    const text = (await outboxTexts(browser.page)).filter({ hasText: manager.phone! }).first();
    expect(await text.innerText()).toContain('Marek Danso');
    expect(await text.getByTestId('outbox-text-body').innerText()).toMatch(/^Brimstock[ :]/);
    expect(await text.getByTestId('outbox-link').first().getAttribute('href')).toMatch(/\/(tanks\/\d+|flags)$/);
    await screenshot(browser.page, `flag-texts-outbox-${name}`);
  });

  it.each(SIZES)('lets the owner give a mobile number and choose texts on the Profile ($name)', async ({ name, opts }) => {
    const browser = await launch(opts);
    opened.push(browser);
    const page = browser.page;
    await signInAs(page, baseUrl, demo('owner'));
    await page.goto(`${baseUrl}/profile`);
    const phone = page.getByTestId('profile-phone');
    await phone.fill('');
    await page.getByTestId('profile-flagtexts').getByText('Each new flag').click();
    await page.getByTestId('profile-submit').click();
    await expect.poll(() => page.locator('#profile-phone-error').innerText()).toContain('Texts need a mobile number');

    await phone.fill('+61 2 9876 5432');
    await page.getByTestId('profile-submit').click();
    await expect.poll(() => page.locator('#profile-phone-error').innerText()).toContain('Enter a mobile number with +');

    const number = name === 'wide' ? '+61 491 570 157' : '+61 491 570 158';
    await phone.fill(number);
    await page.getByTestId('profile-submit').click();
    await page.getByText('Profile saved').waitFor();
    await page.reload();
    await expect.poll(() => page.getByTestId('profile-phone').inputValue()).toBe(number.replace(/ /g, ''));
    expect(await page.getByTestId('profile-flagtexts').locator('[aria-pressed="true"]').innerText()).toBe('Each new flag');
    await page.getByTestId('profile-text-failures-none').waitFor();
    await screenshot(page, `flag-texts-profile-${name}`);
  });
});
