// Browser test of the farm and tank pages: the demo manager adds a vertical cylinder, a 2:1
// horizontal tank and a fill-and-mark tank to Saltmeadow Orchard (a farm the other browser tests
// leave alone), sees each one's curve and table, is told which size is wrong, downloads a gauge
// strip, and corrects a reading. Screenshots at 1280 px and 360 px.
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { capacityL, TANK_SHAPES, type TankGeometry } from '@shared/calibration';
import { formatVolume } from '@shared/units';
import { readScenario } from '../../server/services/demo';
import { type Browser, dialogOpened, launch, screenshot, signInAs } from '../support/browser';

const { baseUrl } = inject('app');
const manager = readScenario().people.find((p) => p.role === 'manager')!;
const FARM = 'Saltmeadow Orchard';
const PHONE = { viewport: { width: 360, height: 780 }, isMobile: true };
const run = Date.now().toString(36).slice(-4).toUpperCase();

const opened: Browser[] = [];
async function open(opts: Parameters<typeof launch>[0] = {}): Promise<Browser> {
  const b = await launch(opts);
  opened.push(b);
  return b;
}
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

const signIn = (page: Page) => signInAs(page, baseUrl, manager);

async function openFarm(page: Page) {
  await page.goto(`${baseUrl}/farms`);
  await page.getByRole('link', { name: FARM }).click();
  await page.waitForURL(/\/farms\/\d+$/);
  await page.getByTestId('farm-tanks').waitFor();
}

/** Types into an InputNumber (it takes the text as its value on leaving the field). */
async function typeNumber(page: Page, id: string, value: number) {
  await page.locator(`#${id}`).fill(String(value));
  await page.locator(`#${id}`).press('Tab');
}

/** A screenshot of an open dialog whole: a tall window for the moment, so nothing scrolls inside it. */
async function dialogShot(page: Page, name: string) {
  const size = page.viewportSize()!;
  await page.setViewportSize({ width: size.width, height: 3200 });
  await page.waitForTimeout(150);
  await screenshot(page, name);
  await page.setViewportSize(size);
}

async function startTank(page: Page, name: string, code: string) {
  await page.getByTestId('farm-add-tank').click();
  await dialogOpened(page, 'tank-dialog');
  await page.getByTestId('tank-name').fill(name);
  await page.getByTestId('tank-code').fill(code);
}

/**
 * Saves the new tank and opens its page. Waits for the editor to have taken every size (its capacity
 * shows) first; when the save is never sent or refused, fails with what the dialog says.
 */
async function createAndOpen(page: Page): Promise<number> {
  await page.getByTestId('tank-capacity-value').waitFor();
  const saved = page.waitForResponse((r) => r.request().method() === 'POST' && new URL(r.url()).pathname === '/api/tanks', { timeout: 20_000 }).catch(() => null);
  await page.getByTestId('tank-submit').click();
  const answer = await saved;
  if (answer?.status() !== 201) {
    await screenshot(page, 'tank-create-failed');
    const dialog = await page.getByTestId('tank-dialog').innerText().catch(() => '(no dialog)');
    throw new Error(`the new tank was ${answer ? `refused (${answer.status()}: ${await answer.text()})` : 'never sent'}; the dialog says:\n${dialog}`);
  }
  await page.waitForURL(/\/tanks\/\d+/);
  await page.getByTestId('tank-title').waitFor();
  return Number(new URL(page.url()).pathname.split('/').pop());
}

/** Opens the calibration tab and returns the first table rows as [tube reading, level, volume] text. */
async function calibrationRows(page: Page): Promise<string[][]> {
  await page.getByTestId('tank-tab-calibration').click();
  await page.getByTestId('calibration-chart').locator('canvas').first().waitFor();
  const rows = page.locator('[data-testid="calibration-table"] tbody tr');
  await rows.first().waitFor();
  return rows.evaluateAll((trs) => trs.map((tr) => [...tr.querySelectorAll('td')].map((td) => td.textContent!.trim())));
}

describe('tank pages', () => {
  it('creates a tank of each kind in the browser and shows its curve and table', async () => {
    const { page } = await open();
    await signIn(page);
    await openFarm(page);
    await screenshot(page, 'tank-farm-1280');

    // Vertical cylinder, 1.2 m across and 1.5 m tall.
    await startTank(page, 'Packing shed tank', `SO-V${run}`);
    await typeNumber(page, 'tank-size-diameterMm', 1200);
    await typeNumber(page, 'tank-size-heightMm', 1500);
    await typeNumber(page, 'tank-outlet', 80);
    const cylinder: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 1200, heightMm: 1500 };
    await expect.poll(() => page.getByTestId('tank-capacity-value').innerText()).toBe(formatVolume(capacityL(cylinder), 'metric'));
    await dialogShot(page, 'tank-editor-cylinder-1280');
    await createAndOpen(page);
    expect(await page.getByTestId('tank-capacity-header').innerText()).toBe(formatVolume(capacityL(cylinder), 'metric'));
    const cylRows = await calibrationRows(page);
    expect(cylRows[0]).toEqual(['0', '0', '0.0']);
    // 10 mm of a 1.2 m cylinder is π/4 × 1.2² × 0.01 m³ = 11.3 L (the tube's zero at the floor: it reads the level).
    expect(cylRows[1]).toEqual(['10', '10', '11.3']);
    await screenshot(page, 'tank-calibration-cylinder-1280');

    // Horizontal cylinder with 2:1 ellipsoidal heads.
    await page.getByTestId('tank-farm-link').click();
    await page.getByTestId('farm-tanks').waitFor();
    await startTank(page, 'Orchard header tank', `SO-H${run}`);
    await page.getByTestId('shape-option-horizontal-cylinder').click();
    await page.getByTestId('tank-ends').getByText('2:1 ellipsoidal ends').click();
    await typeNumber(page, 'tank-size-diameterMm', 1600);
    await typeNumber(page, 'tank-size-lengthMm', 3800);
    const horizontal: TankGeometry = { shape: 'horizontal-cylinder', diameterMm: 1600, lengthMm: 3800, ends: 'ellipsoidal-2to1' };
    await expect.poll(() => page.getByTestId('tank-capacity-value').innerText()).toBe(formatVolume(capacityL(horizontal), 'metric'));
    await dialogShot(page, 'tank-editor-horizontal-1280');
    await createAndOpen(page);
    const horRows = await calibrationRows(page);
    expect(horRows[0]).toEqual(['0', '0', '0.0']);
    expect(await page.locator('[data-testid="calibration-table"] tbody tr').count()).toBe(20);
    await screenshot(page, 'tank-calibration-horizontal-1280');

    // Fill-and-mark barrel, with a bad row first.
    await page.getByTestId('tank-farm-link').click();
    await page.getByTestId('farm-tanks').waitFor();
    await startTank(page, 'Brew barrel', `SO-M${run}`);
    await page.getByTestId('tank-contents').getByText('Culture').click();
    await expect.poll(() => page.getByTestId('tank-caution-rcd').count()).toBe(1);
    await page.getByTestId('shape-option-points').click();
    await typeNumber(page, 'tank-point-level-1', 120);
    await typeNumber(page, 'tank-point-volume-1', 25);
    await typeNumber(page, 'tank-point-level-2', 110);
    await typeNumber(page, 'tank-point-volume-2', 50);
    await expect.poll(() => page.getByTestId('tank-point-error-2').innerText()).toContain('is not above the previous point');
    await dialogShot(page, 'tank-editor-points-error-1280');
    await typeNumber(page, 'tank-point-level-2', 240);
    await page.getByTestId('tank-point-add').click();
    await typeNumber(page, 'tank-point-level-3', 360);
    await typeNumber(page, 'tank-point-volume-3', 80);
    await expect.poll(() => page.getByTestId('tank-point-error-2').count()).toBe(0);
    await expect.poll(() => page.getByTestId('tank-capacity-value').innerText()).toBe('80 L');
    await createAndOpen(page);
    const markRows = await calibrationRows(page);
    expect(markRows[0]).toEqual(['0', '0', '0.0']);
    await screenshot(page, 'tank-calibration-points-1280');
  });

  it('names the wrong size under its field and sends nothing', async () => {
    const { page } = await open();
    await signIn(page);
    await openFarm(page);
    let posted = 0;
    page.on('request', (r) => {
      if (r.method() === 'POST' && r.url().endsWith('/api/tanks')) posted++;
    });
    await startTank(page, 'Too small', `SO-X${run}`);
    await typeNumber(page, 'tank-size-diameterMm', 0);
    await typeNumber(page, 'tank-size-heightMm', 900);
    await page.getByTestId('tank-submit').click();

    await expect.poll(() => page.getByTestId('tank-size-diameterMm-error').innerText()).toBe('must be greater than 0');
    expect(posted).toBe(0);
    await dialogShot(page, 'tank-editor-bad-size-1280');
  });

  it('downloads a gauge strip PDF, charts readings and corrects one', async () => {
    const { page } = await open();
    await signIn(page);
    await openFarm(page);
    await startTank(page, 'Strip test tank', `SO-G${run}`);
    await typeNumber(page, 'tank-size-diameterMm', 1000);
    await typeNumber(page, 'tank-size-heightMm', 1200);
    const tankId = await createAndOpen(page);

    await page.getByTestId('tank-tab-gauge').click();
    const href = await page.getByTestId('gauge-download').getAttribute('href');
    expect(href).toMatch(new RegExp(`^/api/tanks/${tankId}/gauge-strip\\.pdf\\?every=\\d+&unit=metric&paper=a4$`));
    const pdf = await page.evaluate(async (url) => {
      const res = await fetch(url);
      const bytes = new Uint8Array(await res.arrayBuffer());
      return { status: res.status, type: res.headers.get('content-type'), head: String.fromCharCode(...bytes.slice(0, 5)) };
    }, href!);
    expect(pdf).toEqual({ status: 200, type: 'application/pdf', head: '%PDF-' });
    await screenshot(page, 'tank-gauge-1280');

    // Two rounds through the API, a day apart: 900 mm then 600 mm on the tube (tube zero at the floor).
    const status = await page.evaluate(async (id) => {
      const { csrfToken } = await (await fetch('/api/auth/session')).json();
      const tank = await (await fetch(`/api/tanks/${id}`)).json();
      const codes: number[] = [];
      for (const [hoursAgo, readingMm] of [[26, 900], [2, 600]]) {
        const res = await fetch('/api/rounds', {
          method: 'POST',
          headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken },
          body: JSON.stringify({ farmId: tank.farmId, takenAt: new Date(Date.now() - hoursAgo * 3_600_000).toISOString(), entries: [{ tankId: id, readingMm, idempotencyKey: crypto.randomUUID().replace(/-/g, '') }] }),
        });
        codes.push(res.status);
      }
      return codes;
    }, tankId);
    expect(status).toEqual([201, 201]);

    await page.reload();
    await page.getByTestId('tank-tab-history').click();
    await page.getByTestId('tank-history-chart').locator('canvas').first().waitFor();
    await screenshot(page, 'tank-history-1280');
    await page.getByTestId('series-window').getByText('Week', { exact: true }).click();
    await page.waitForTimeout(300);
    await screenshot(page, 'tank-history-week-1280');

    await page.getByTestId('tank-tab-readings').click();
    const rows = page.locator('[data-testid="readings-table"] tbody tr');
    await expect.poll(() => rows.count()).toBe(2);
    await rows.first().getByRole('button', { name: 'Correct' }).click();
    await dialogOpened(page, 'correction-dialog');
    await page.getByTestId('correction-submit').click();
    await expect.poll(() => page.getByTestId('correction-note-error').innerText()).toBe('say why the reading was wrong');
    await typeNumber(page, 'correction-reading', 650);
    await expect.poll(() => page.getByTestId('correction-preview').innerText()).toContain('650 mm');
    await page.getByTestId('correction-note').fill('Read the tube from the wrong side');
    await dialogShot(page, 'tank-correction-1280');
    await page.getByTestId('correction-submit').click();
    await page.getByTestId('correction-dialog').waitFor({ state: 'hidden' });

    await expect.poll(() => rows.count()).toBe(3);
    await expect.poll(() => page.locator('[data-testid="readings-table"] tr.reading--corrected').count()).toBe(1);
    expect(await page.locator('[data-testid^="reading-correction-link-"]').count()).toBe(1);
    await screenshot(page, 'tank-readings-1280');
  });

  it('moves a tank earlier in the walking order', async () => {
    const { page } = await open();
    await signIn(page);
    await openFarm(page);
    const names = () => page.locator('[data-testid="farm-tanks"] .tank-card__name').allInnerTexts();
    const before = await names();
    expect(before.length).toBeGreaterThan(1);
    const lastCard = page.locator('[data-testid="farm-tanks"] > li').last();
    await lastCard.locator('[data-testid^="tank-up-"]').click();
    const expected = [...before];
    [expected[expected.length - 2], expected[expected.length - 1]] = [expected[expected.length - 1], expected[expected.length - 2]];
    await expect.poll(names).toEqual(expected);
    // Every button is disabled while the new order is saved; afterwards only the first tank's "up" is.
    await expect.poll(() => page.locator('[data-testid^="tank-up-"]:disabled').count()).toBe(1);
    await page.reload();
    await page.getByTestId('farm-tanks').waitFor();
    await expect.poll(names).toEqual(expected);
  });

  it('draws a labelled diagram for every shape in the editor', async () => {
    const { page } = await open();
    await signIn(page);
    await openFarm(page);
    await page.getByTestId('farm-add-tank').click();
    const figure = page.getByTestId('tank-dialog').locator('figure');
    const dir = join(process.cwd(), 'test-results', 'screenshots');
    mkdirSync(dir, { recursive: true });
    for (const shape of TANK_SHAPES) {
      await page.getByTestId(`shape-option-${shape}`).click();
      const ends = shape === 'horizontal-cylinder' ? ['Flat ends', 'Hemispherical ends', '2:1 ellipsoidal ends'] : [null];
      for (const end of ends) {
        if (end) await page.getByTestId('tank-ends').getByText(end, { exact: true }).click();
        await expect.poll(() => figure.locator('[data-testid="tank-diagram"]').getAttribute('data-shape')).toBe(shape);
        expect(await figure.getByTestId('tank-diagram-label').count()).toBeGreaterThan(0);
        await figure.screenshot({ path: join(dir, `tank-diagram-${shape}${end ? `-${end.split(' ')[0].replace(':', 'to')}` : ''}.png`) });
      }
    }
  });

  it('fits the farm, editor and tank pages on a 360 px phone', async () => {
    const { page } = await open(PHONE);
    await signIn(page);
    await openFarm(page);
    await screenshot(page, 'tank-farm-360');
    const overflow = () => page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(await overflow()).toBeLessThanOrEqual(0);

    await page.getByTestId('farm-add-tank').click();
    await dialogOpened(page, 'tank-dialog');
    await page.getByTestId('shape-option-cone-bottom').click();
    await dialogShot(page, 'tank-editor-360');
    await page.keyboard.press('Escape');

    await page.locator('[data-testid^="tank-open-"]').first().click();
    await page.getByTestId('tank-title').waitFor();
    await page.getByTestId('tank-tab-calibration').click();
    await page.getByTestId('calibration-chart').locator('canvas').first().waitFor();
    await screenshot(page, 'tank-calibration-360');
    expect(await overflow()).toBeLessThanOrEqual(0);
    await page.getByTestId('tank-tab-gauge').click();
    await page.getByTestId('gauge-download').waitFor();
    await screenshot(page, 'tank-gauge-360');
  });
});
