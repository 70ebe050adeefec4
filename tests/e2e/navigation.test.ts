// Browser test of the navigation bar and the Flags screen for each demo role, at 1280 px and on a
// 360 px phone: one row of links with the buying and set-up screens in menus, the name and Sign out
// on one line each, menus used from the keyboard, a loading state while the session loads, and
// flag cards that keep their margin on the phone.
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Locator, Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { type Browser, launch, reachableNav, screenshot, signInAs } from '../support/browser';

const { baseUrl } = inject('app');
const people = readScenario().people;
const demo = (role: string) => people.find((p) => p.role === role)!;
const PHONE = { viewport: { width: 360, height: 740 }, isMobile: true };
const ROLES = ['owner', 'manager', 'worker', 'buyer'] as const;

/** The screens each role may open (src/router/nav.ts), as nav test ids. */
const SCREENS: Record<(typeof ROLES)[number], string[]> = {
  owner: ['home', 'round', 'imports', 'brews', 'flags', 'inputs', 'orders', 'suppliers', 'farms', 'people', 'outbox', 'profile'],
  manager: ['home', 'round', 'imports', 'brews', 'flags', 'inputs', 'orders', 'suppliers', 'farms', 'outbox', 'profile'],
  worker: ['home', 'round', 'imports', 'brews', 'flags', 'inputs', 'farms', 'profile'],
  buyer: ['home', 'flags', 'inputs', 'orders', 'suppliers', 'farms', 'outbox', 'profile'],
};

const opened: Browser[] = [];
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

async function open(opts: Parameters<typeof launch>[0] = {}): Promise<Page> {
  const browser = await launch(opts);
  opened.push(browser);
  return browser.page;
}

/** A picture of one part of the page, beside the full-page ones in test-results/screenshots. */
async function shotOf(locator: Locator, name: string): Promise<void> {
  const dir = join(process.cwd(), 'test-results', 'screenshots');
  mkdirSync(dir, { recursive: true });
  await locator.screenshot({ path: join(dir, `${name}.png`) });
}

/** A picture of what the window shows (not the whole page). */
async function viewShot(page: Page, name: string): Promise<void> {
  const dir = join(process.cwd(), 'test-results', 'screenshots');
  mkdirSync(dir, { recursive: true });
  await page.screenshot({ path: join(dir, `${name}.png`) });
}

/** How many lines of text an element's own box holds. */
function linesOf(locator: Locator): Promise<number> {
  return locator.evaluate((el) => {
    const style = getComputedStyle(el);
    const line = parseFloat(style.lineHeight) || parseFloat(style.fontSize) * 1.5;
    return Math.round((el as HTMLElement).getBoundingClientRect().height / line);
  });
}

describe('navigation at 1280 px', () => {
  it.each(ROLES)('fits the %s’s links on one row, with the name and Sign out on one line each', async (role) => {
    const page = await open();
    await signInAs(page, baseUrl, demo(role));
    await page.locator('.navbar__links').waitFor();

    const tops = await page.locator('.navbar__links > *').evaluateAll((els) => els.map((el) => Math.round(el.getBoundingClientRect().top)));
    expect(new Set(tops).size).toBe(1);
    const bar = await page.locator('.navbar__inner').boundingBox();
    expect(bar!.height).toBeLessThanOrEqual(72);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(1280);
    expect(await linesOf(page.locator('.navbar__user-text'))).toBe(1);
    expect(await page.locator('.navbar__user-text').innerText()).toBe(demo(role).name);
    expect(await linesOf(page.locator('[data-testid="nav-sign-out"] .p-button-label'))).toBe(1);
    expect(await linesOf(page.locator('.navbar__org'))).toBe(1);

    expect([...(await reachableNav(page))].sort()).toEqual(SCREENS[role].map((name) => `nav-${name}`).sort());
    await shotOf(page.locator('.navbar'), `nav-${role}-1280`);
    if (role !== 'worker') {
      await page.getByTestId('nav-group-setup').click();
      await page.getByTestId('nav-farms').waitFor();
      await page.waitForTimeout(400);
      await viewShot(page, `nav-${role}-1280-setup-open`);
      await page.keyboard.press('Escape');
    }

    await page.goto(`${baseUrl}/flags`);
    await page.locator('[data-testid^="flags-row-"]').first().waitFor();
    await page.waitForTimeout(500);
    await screenshot(page, `flags-${role}-1280`);
  });

  it('opens a menu from the keyboard, moves with the arrows, follows Enter and closes on Escape', async () => {
    const page = await open();
    await signInAs(page, baseUrl, demo('owner'));
    const buying = page.getByTestId('nav-group-buying');
    await buying.focus();
    await page.keyboard.press('Enter');
    const menu = page.locator(`#${await buying.getAttribute('aria-controls')}`);
    await menu.waitFor();
    await expect.poll(() => buying.getAttribute('aria-expanded')).toBe('true');

    await page.keyboard.press('Escape');
    await menu.waitFor({ state: 'detached' });
    expect(await buying.getAttribute('aria-expanded')).toBe('false');
    expect(await page.evaluate(() => document.activeElement?.getAttribute('data-testid'))).toBe('nav-group-buying');

    await page.keyboard.press('Enter');
    await menu.waitFor();
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('Enter');
    await page.waitForURL(/\/orders$/);
    await expect.poll(() => buying.getAttribute('class')).toContain('navbar__link--current');
  });

  it('shows a loading state, not a blank page, while the session loads', async () => {
    const page = await open();
    await signInAs(page, baseUrl, demo('manager'));
    let release: () => void = () => undefined;
    const held = new Promise<void>((resolve) => (release = resolve));
    await page.route('**/api/auth/session', async (route) => {
      await held;
      await route.continue();
    });

    await page.goto(`${baseUrl}/flags`, { waitUntil: 'domcontentloaded' });
    await page.getByTestId('app-loading').waitFor();
    expect(await page.getByTestId('app-loading').innerText()).toContain('Opening Brimstock');
    await screenshot(page, 'app-loading-1280');
    release();
    await page.locator('[data-testid^="flags-row-"]').first().waitFor();
    expect(await page.getByTestId('app-loading').count()).toBe(0);
  });
});

describe('navigation on a 360 px phone', () => {
  it.each(ROLES)('gives the %s every screen in the menu drawer, and Flags keeps its right margin', async (role) => {
    const page = await open(PHONE);
    await signInAs(page, baseUrl, demo(role));
    await page.getByTestId('nav-menu').waitFor();
    expect(await page.locator('.navbar__links').count()).toBe(0);
    await shotOf(page.locator('.navbar'), `nav-${role}-360`);

    await page.getByTestId('nav-menu').click();
    const drawer = page.locator('#nav-drawer');
    await drawer.waitFor();
    await page.waitForTimeout(400);
    const drawn = await drawer.locator('[data-testid^="nav-"]').evaluateAll((els) => els.map((el) => el.getAttribute('data-testid')!));
    expect(drawn.filter((id) => id !== 'nav-sign-out').sort()).toEqual(SCREENS[role].map((name) => `nav-${name}`).sort());
    expect(drawn).toContain('nav-sign-out');
    await viewShot(page, `nav-${role}-360-drawer`);

    await drawer.getByTestId('nav-flags').click();
    await page.waitForURL(/\/flags$/);
    await page.locator('[data-testid^="flags-row-"]').first().waitFor();
    await page.waitForTimeout(800);
    await screenshot(page, `flags-${role}-360`);
    await viewShot(page, `flags-${role}-360-top`);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    // Every card and the filters keep the page's margin on the right as on the left.
    const edges = await page.locator('.flags__filters, [data-testid^="flags-row-"]').evaluateAll((els) => els.map((el) => el.getBoundingClientRect()));
    const left = Math.min(...edges.map((e) => e.left));
    expect(left).toBeGreaterThanOrEqual(12);
    expect(Math.max(...edges.map((e) => e.right))).toBeLessThanOrEqual(360 - left + 1);
  });
});
