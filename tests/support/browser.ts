// Debian's Chromium driven by playwright-core, with a fresh profile per launch.
import { mkdtempSync, rmSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

const ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

export interface Browser {
  context: BrowserContext;
  page: Page;
  close(): Promise<void>;
}

/** Launches Chromium with a fresh profile; `viewport` defaults to a desktop size, `locale` (navigator.languages and Accept-Language) to Chromium's English. */
export async function launch(opts: { viewport?: { width: number; height: number }; isMobile?: boolean; locale?: string } = {}): Promise<Browser> {
  const profile = mkdtempSync(join(tmpdir(), 'brimstock-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: ARGS,
    viewport: opts.viewport ?? { width: 1280, height: 860 },
    isMobile: opts.isMobile,
    hasTouch: opts.isMobile,
    locale: opts.locale,
  });
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** Saves a screenshot under test-results/screenshots (for people to look at; never compared). */
export async function screenshot(page: Page, name: string): Promise<void> {
  const dir = join(process.cwd(), 'test-results', 'screenshots');
  mkdirSync(dir, { recursive: true });
  await page.screenshot({ path: join(dir, `${name}.png`), fullPage: true });
}

/**
 * Picks `option` (exact text, or a pattern) from the PrimeVue Select with data-testid `testId`. The select may still be
 * loading its options, or re-render as they arrive and close its overlay, so the overlay is
 * opened again until the option shows (bounded to a few tries).
 */
export async function pickOption(page: Page, testId: string, option: string | RegExp): Promise<void> {
  const choice = page.locator('.p-select-overlay').getByRole('option', { name: option, exact: typeof option === 'string' });
  for (let attempt = 1; ; attempt++) {
    if (!(await choice.isVisible())) await page.getByTestId(testId).click();
    try {
      await choice.waitFor({ state: 'visible', timeout: 4000 });
      await choice.click();
      return;
    } catch (error) {
      if (attempt >= 4) throw error;
      await page.keyboard.press('Escape');
    }
  }
}

/** Signs a demo person in through the sign-in screen and waits to leave it. */
export async function signInAs(page: Page, baseUrl: string, who: { email: string; password: string }): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByTestId('signin-email').fill(who.email);
  await page.locator('[data-testid="signin-password"] input, input[data-testid="signin-password"]').first().fill(who.password);
  await page.getByTestId('signin-submit').click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
}

/** The first number in a shown quantity ("1,234.5 L" → 1234.5). */
export function quantityOf(text: string): number {
  const m = /(-?[\d,]+(?:\.\d+)?)/.exec(text);
  if (!m) throw new Error(`no number in "${text}"`);
  return Number(m[1]!.replace(/,/g, ''));
}

/**
 * Waits until the dialog `testId` has finished opening. PrimeVue moves the focus into a dialog when
 * its opening transition ends; typing before that loses keys to the jump on a slow machine.
 */
export async function dialogOpened(page: Page, testId: string): Promise<void> {
  await page.getByTestId(testId).waitFor();
  await page.waitForFunction((id) => {
    const dialog = document.querySelector(`[data-testid="${id}"]`);
    return !!dialog && !dialog.className.includes('enter') && !!document.activeElement && dialog.contains(document.activeElement);
  }, testId);
}

/** The nav test ids (`nav-<screen>`) a person can reach on a wide screen: the bar's links, then each menu's, opened in turn. */
export async function reachableNav(page: Page): Promise<string[]> {
  await page.locator('.navbar__links').waitFor();
  const ids = await page.locator('.navbar [data-testid^="nav-"]').evaluateAll((els) => els.map((el) => el.getAttribute('data-testid')!));
  for (const group of ids.filter((id) => id.startsWith('nav-group-'))) {
    const button = page.getByTestId(group);
    await button.click();
    const menu = page.locator(`#${await button.getAttribute('aria-controls')}`);
    await menu.waitFor();
    ids.push(...(await menu.locator('[data-testid^="nav-"]').evaluateAll((els) => els.map((el) => el.getAttribute('data-testid')!))));
    await page.keyboard.press('Escape');
    await menu.waitFor({ state: 'detached' });
  }
  return ids.filter((id) => id !== 'nav-sign-out' && !id.startsWith('nav-group-'));
}

/** Follows the wide navigation to screen `name`, opening the menu it sits in when it is not on the bar itself. */
export async function navigateTo(page: Page, name: string): Promise<void> {
  const link = page.getByTestId(`nav-${name}`);
  if (!(await link.isVisible())) {
    for (const group of await page.locator('[data-testid^="nav-group-"]').all()) {
      await group.click();
      if (await link.isVisible()) break;
      await page.keyboard.press('Escape');
    }
  }
  await link.click();
}
