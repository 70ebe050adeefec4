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

/** Launches Chromium with a fresh profile; `viewport` defaults to a desktop size. */
export async function launch(opts: { viewport?: { width: number; height: number }; isMobile?: boolean } = {}): Promise<Browser> {
  const profile = mkdtempSync(join(tmpdir(), 'brimstock-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: ARGS,
    viewport: opts.viewport ?? { width: 1280, height: 860 },
    isMobile: opts.isMobile,
    hasTouch: opts.isMobile,
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
