// Browser test of the tank page as a farm manager reads it: a tank whose sight-tube zero mark was moved
// 30 mm below the floor after its first reading (so it has two calibrations), the facts in words and
// with a numbered calibration, the calibration table by tube reading, charts without a zoom bar, each
// reading's calibration version and a correction previewed with the reading's own calibration; then
// a demo tank's month of history. Screenshots at 1280 px and 360 px.
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
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

/**
 * Through the API as the signed-in manager: a 1 m wide, 1.2 m tall cylinder with its tube zero at the
 * floor, read at 500 mm on the tube 26 hours ago; then the zero mark set 30 mm below the floor (a new
 * calibration) and read at 400 mm two hours ago. Returns the tank id and both calibration keys.
 */
async function tankWithTwoCalibrations(page: Page, code: string): Promise<{ id: number; keys: string[] }> {
  return page.evaluate(
    async ({ farmName, code }) => {
      const { csrfToken } = await (await fetch('/api/auth/session')).json();
      const headers = { 'content-type': 'application/json', 'x-csrf-token': csrfToken };
      const farms: { id: number; name: string }[] = await (await fetch('/api/farms')).json();
      const farmId = farms.find((f) => f.name === farmName)!.id;
      const geometry = { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1200 };
      const created = await (await fetch('/api/tanks', { method: 'POST', headers, body: JSON.stringify({ farmId, name: 'Tube check tank', code, contents: 'water', geometry }) })).json();
      const round = (hoursAgo: number, readingMm: number) =>
        fetch('/api/rounds', {
          method: 'POST',
          headers,
          body: JSON.stringify({ farmId, takenAt: new Date(Date.now() - hoursAgo * 3_600_000).toISOString(), entries: [{ tankId: created.id, readingMm, idempotencyKey: crypto.randomUUID().replace(/-/g, '') }] }),
        });
      if ((await round(26, 500)).status !== 201) throw new Error('first round refused');
      const moved = await (await fetch(`/api/tanks/${created.id}`, { method: 'PATCH', headers, body: JSON.stringify({ datumOffsetMm: -30 }) })).json();
      if ((await round(2, 400)).status !== 201) throw new Error('second round refused');
      return { id: created.id as number, keys: [created.calibrationVersion as string, moved.calibrationVersion as string] };
    },
    { farmName: FARM, code },
  );
}

/** Counts drawn pixels in the bottom `bandPx` CSS pixels of the chart's canvas (where a zoom bar would sit). */
async function inkAtChartBottom(page: Page, testId: string, bandPx: number): Promise<number> {
  return page.getByTestId(testId).locator('canvas').first().evaluate((canvas: HTMLCanvasElement, band) => {
    const ctx = canvas.getContext('2d')!;
    const scale = canvas.width / canvas.getBoundingClientRect().width;
    const rows = Math.round(band * scale);
    const data = ctx.getImageData(0, canvas.height - rows, canvas.width, rows).data;
    let ink = 0;
    for (let i = 3; i < data.length; i += 4) if (data[i] > 0) ink++;
    return ink;
  }, bandPx);
}

/** The calibration table's header texts and its first rows as cell texts. */
async function calibrationTable(page: Page): Promise<{ headers: string[]; rows: string[][] }> {
  const table = page.getByTestId('calibration-table');
  await table.locator('tbody tr').first().waitFor();
  const headers = await table.locator('thead th').allInnerTexts();
  const rows = await table.locator('tbody tr').evaluateAll((trs) => trs.slice(0, 3).map((tr) => [...tr.querySelectorAll('td')].map((td) => td.textContent!.trim())));
  return { headers: headers.map((h) => h.trim()), rows };
}

/** Texts on the page that look like a content hash (8 or more hex digits with at least one letter and one digit). */
async function hashLikeTexts(page: Page): Promise<string[]> {
  const text = await page.locator('body').innerText();
  return (text.match(/\b[0-9a-f]{8,}\b/gi) ?? []).filter((w) => /[a-f]/i.test(w) && /\d/.test(w));
}

describe('tank page', () => {
  it('names the calibration by number and date, words the zero mark, lists the table by tube reading and previews a correction with the reading’s own calibration', async () => {
    const { page } = await open();
    await signInAs(page, baseUrl, manager);
    const { id, keys } = await tankWithTwoCalibrations(page, `SO-T${run}`);
    await page.goto(`${baseUrl}/tanks/${id}`);
    await page.getByTestId('tank-title').waitFor();

    expect(await page.getByTestId('tank-zero-mark').innerText()).toBe('30 mm below the floor');
    await expect.poll(() => page.getByTestId('tank-calibration-version').innerText()).toMatch(/^Version 2 · \S/);
    await page.getByTestId('tank-history-chart').locator('canvas').first().waitFor();
    await page.waitForTimeout(300);
    // The zoom bar stood in the chart's bottom 4–30 px; nothing is drawn there now.
    expect(await inkAtChartBottom(page, 'tank-history-chart', 14)).toBe(0);
    await screenshot(page, 'tank-page-history-1280');
    await page.getByTestId('series-measure').getByText('In the tank', { exact: true }).click();
    await page.waitForTimeout(300);
    await screenshot(page, 'tank-page-history-in-tank-1280');

    await page.getByTestId('tank-tab-calibration').click();
    await page.getByTestId('calibration-chart').locator('canvas').first().waitFor();
    const { headers, rows } = await calibrationTable(page);
    expect(headers).toEqual(['Tube reads (mm)', 'Level above floor (mm)', 'Volume (L)']);
    // The tube's zero is 30 mm below the floor: it reads 30 at the floor, 40 at a level of 10 mm,
    // where the 1 m cylinder holds π/4 × 1 m² × 0.01 m = 7.854 L (hand derivation, V = πr²h).
    expect(rows[0]).toEqual(['30', '0', '0.0']);
    expect(rows[1]).toEqual(['40', '10', '7.9']);
    expect(await page.getByTestId('calibration-version').innerText()).toMatch(/^Version 2 · \S/);
    expect(await page.getByTestId('calibration-readings-note').innerText()).toContain('stored with the calibration in use when it was taken');
    await page.waitForTimeout(300);
    expect(await inkAtChartBottom(page, 'calibration-chart', 14)).toBe(0);
    await screenshot(page, 'tank-page-calibration-1280');

    await page.getByTestId('tank-tab-readings').click();
    const table = page.getByTestId('readings-table');
    await expect.poll(() => table.locator('tbody tr').count()).toBe(2);
    expect(await table.locator('tbody tr').allInnerTexts()).toEqual([expect.stringContaining('Version 2'), expect.stringContaining('Version 1')]);
    expect(await page.getByTestId('readings-calibration-note').innerText()).toContain('(version 2 now)');
    for (const key of keys) expect(await page.locator('body').innerText()).not.toContain(key);
    expect(await hashLikeTexts(page)).toEqual([]);
    await screenshot(page, 'tank-page-readings-1280');

    // The older reading was taken with the zero mark at the floor: 520 mm on the tube is the level 520 mm there,
    // not 490 mm as today's zero mark would make it.
    await table.locator('tbody tr').nth(1).getByRole('button', { name: 'Correct' }).click();
    await dialogOpened(page, 'correction-dialog');
    await page.locator('#correction-reading').fill('520');
    await page.locator('#correction-reading').press('Tab');
    await expect.poll(() => page.getByTestId('correction-preview').innerText()).toContain('Level 520 mm');
    expect(await page.getByTestId('correction-older-calibration').innerText()).toMatch(/Version 1 · /);
    await screenshot(page, 'tank-page-correction-1280');
  });

  it('fills a demo tank’s month of history and fits a 360 px phone without a hash or a zoom bar', async () => {
    const { page } = await open(PHONE);
    await signInAs(page, baseUrl, manager);
    // The demo's orchard cistern, read every morning (other tests add tanks of their own to this farm).
    const tankId = await page.evaluate(async () => {
      const tanks: { id: number; code: string }[] = await (await fetch('/api/tanks')).json();
      return tanks.find((t) => t.code === 'SO-W1')!.id;
    });
    await page.goto(`${baseUrl}/tanks/${tankId}`);
    await page.getByTestId('tank-title').waitFor();
    await page.getByTestId('tank-history-chart').locator('canvas').first().waitFor();

    // The month view's data: a point for each of the last 30 days.
    const days = await page.evaluate(async (id) => {
      const to = new Date();
      const from = new Date(to.getTime() - 30 * 86_400_000);
      const q = new URLSearchParams({ from: from.toISOString(), to: to.toISOString(), bucket: 'day' });
      const points: { t: string }[] = await (await fetch(`/api/tanks/${id}/series?${q}`)).json();
      return new Set(points.map((p) => p.t.slice(0, 10))).size;
    }, tankId);
    expect(days).toBeGreaterThanOrEqual(30);

    const overflow = () => page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(await overflow()).toBeLessThanOrEqual(0);
    await page.waitForTimeout(300);
    expect(await inkAtChartBottom(page, 'tank-history-chart', 14)).toBe(0);
    await expect.poll(() => page.getByTestId('tank-calibration-version').innerText()).toMatch(/^Version 1 · \S/);
    expect(await hashLikeTexts(page)).toEqual([]);
    await screenshot(page, 'tank-page-history-360');

    await page.getByTestId('tank-tab-calibration').click();
    await page.getByTestId('calibration-chart').locator('canvas').first().waitFor();
    const { headers } = await calibrationTable(page);
    expect(headers[0]).toBe('Tube reads (mm)');
    expect(await overflow()).toBeLessThanOrEqual(0);
    await screenshot(page, 'tank-page-calibration-360');
  });
});
