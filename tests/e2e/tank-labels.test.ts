// Browser test of tank labels as the demo worker uses them on a 360 px phone: the label downloaded
// from the tank page holds a QR code (rendered with pdftoppm, decoded with jsQR) whose link opens the
// round at that tank, its card in view and its reading box focused; the farm page's sheet of labels
// downloads with a code for each tank. Screenshots of the round opened at the tank and of the label.
import { readFileSync } from 'node:fs';
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { launch, screenshot, signInAs, type Browser } from '../support/browser';
import { decodeQr, hasPdftoppm, renderPdfPage } from '../support/pdf-qr';

const { baseUrl } = inject('app');
const worker = readScenario().people.find((p) => p.role === 'worker')!;
const PHONE = { viewport: { width: 360, height: 780 }, isMobile: true };

const opened: Browser[] = [];
async function open(opts: Parameters<typeof launch>[0] = {}): Promise<Browser> {
  const b = await launch(opts);
  opened.push(b);
  return b;
}
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

/** The worker's tanks as the API lists them, in walking order per farm. */
async function tanksOf(page: Page): Promise<{ id: number; farmId: number; code: string; name: string }[]> {
  return page.evaluate(async () => (await fetch('/api/tanks')).json());
}

/** The bytes of the download started by clicking `testId`. */
async function download(page: Page, testId: string): Promise<{ name: string; bytes: Buffer }> {
  const [file] = await Promise.all([page.waitForEvent('download'), page.getByTestId(testId).click()]);
  const path = await file.path();
  return { name: file.suggestedFilename(), bytes: readFileSync(path) };
}

/** Whether the element's box lies wholly inside the viewport. */
async function inView(page: Page, selector: string): Promise<boolean> {
  return page.locator(selector).evaluate((el) => {
    const r = el.getBoundingClientRect();
    return r.top >= 0 && r.bottom <= window.innerHeight && r.left >= 0 && r.right <= window.innerWidth;
  });
}

describe.skipIf(!hasPdftoppm)('tank labels in the browser', () => {
  it('opens the round at the tank of a scanned label: its farm, its card in view, its reading box focused', async () => {
    const { page } = await open(PHONE);
    await signInAs(page, baseUrl, worker);
    const tanks = await tanksOf(page);
    // The last tank of the last farm: the round starts elsewhere and has to scroll to it.
    const tank = tanks[tanks.length - 1];
    expect(tanks.length).toBeGreaterThan(3);

    await page.goto(`${baseUrl}/tanks/${tank.id}`);
    await page.getByTestId('tank-title').waitFor();
    await screenshot(page, 'tank-page-label-button-360');
    const label = await download(page, 'tank-label');
    expect(label.name).toBe(`${tank.code}-label.pdf`);
    const link = decodeQr(renderPdfPage(label.bytes, 1, 200, 'test-results/screenshots/e2e-tank-label.png'));
    expect(link).toBe(`${baseUrl}/round?tank=${tank.id}`);

    // A phone's camera opens the link as a new page load.
    await page.goto(link!);
    const input = `#round-${tank.id}-reading`;
    await expect.poll(() => page.evaluate(() => document.activeElement?.id ?? null), { timeout: 10_000 }).toBe(`round-${tank.id}-reading`);
    await expect.poll(() => inView(page, input)).toBe(true);
    await expect.poll(() => inView(page, `[data-testid="round-tank-${tank.code}"] .round-card__name`)).toBe(true);
    const farms: { id: number; name: string }[] = await page.evaluate(async () => (await fetch('/api/farms')).json());
    await expect(page.getByTestId('round-farm').textContent()).resolves.toContain(farms.find((f) => f.id === tank.farmId)!.name);
    await page.screenshot({ path: 'test-results/screenshots/round-at-tank-360.png' });

    // Typing goes straight into that tank's box.
    await page.keyboard.type('420');
    expect(await page.locator(input).inputValue()).toBe('420');
  });

  it('says so when the label’s tank is not on the round, and still opens the round', async () => {
    const { page } = await open(PHONE);
    await signInAs(page, baseUrl, worker);
    await page.goto(`${baseUrl}/round?tank=999999`);
    await expect.poll(() => page.getByTestId('round-tank-notice').textContent().catch(() => null)).toContain('is not on your round');
    await expect.poll(() => page.locator('[data-round-reading]').count()).toBeGreaterThan(0);
    await screenshot(page, 'round-tank-not-found-360');
  });

  it('downloads the farm’s sheet of labels from the farm page, a QR code per tank', async () => {
    const { page } = await open();
    await signInAs(page, baseUrl, worker);
    const tanks = await tanksOf(page);
    const farmId = tanks[0].farmId;
    const onFarm = tanks.filter((t) => t.farmId === farmId);
    await page.goto(`${baseUrl}/farms/${farmId}`);
    const sheet = await download(page, 'farm-labels');
    expect(sheet.name).toMatch(/-tank-labels\.pdf$/);
    const first = renderPdfPage(sheet.bytes, 1, 150, 'test-results/screenshots/e2e-farm-label-sheet.png');
    // The first cell of the A4 grid (2 × 95 mm across, 4 × 66 mm down, centred): 10 mm from the left, 16.5 mm from the top.
    expect(decodeQr(first, { xMm: 10, yMm: 297 - 16.5 - 66, widthMm: 95, heightMm: 66 })).toBe(`${baseUrl}/round?tank=${onFarm[0].id}`);
    await screenshot(page, 'farm-labels-button-1280');
  });
});
