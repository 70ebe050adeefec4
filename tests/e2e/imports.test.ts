// Browser tests of the Logger files screen with the demo worker (Hollin Ridge and Marrow Flats):
// a sample logger file is mapped and imported with its counts shown; the same file sent again is a
// duplicate that adds nothing; a file with bad rows under "refuse the whole file" is refused with
// every bad line listed; on a phone the second file of the same logger goes in with the saved mapping.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { launch, pickOption, screenshot, signInAs, type Browser } from '../support/browser';

const { baseUrl } = inject('app');
const worker = readScenario().people.find((p) => p.role === 'worker')!;
const root = join(import.meta.dirname, '../..');
const SAMPLE_0707 = join(root, 'samples/loggers/mf-w1-level-2025-07-07.csv');
const SAMPLE_0713 = join(root, 'samples/loggers/mf-w1-level-2025-07-13.csv');
const BAD_ROWS = join(import.meta.dirname, 'files/hr-w1-level-bad-rows.csv');
// Lines of files/hr-w1-level-bad-rows.csv made bad on purpose: ERR, 30 February, 2,610 mm in a 2,400 mm tank, no value, 150 °C.
const BAD_LINES = [4, 7, 9, 12, 15];

/** Data rows of a CSV file with a header row: its non-blank lines less the header. */
function dataRows(path: string): number {
  return readFileSync(path, 'utf8').split(/\r?\n/).filter((l) => l.trim() !== '').length - 1;
}

/** The first and last instant of a sample whose first column is ISO 8601 with an offset. */
function spanOf(path: string): [string, string] {
  const stamps = readFileSync(path, 'utf8').split(/\r?\n/).slice(1).filter((l) => l.trim() !== '').map((l) => new Date(l.split(',')[0]).getTime());
  return [new Date(Math.min(...stamps)).toISOString(), new Date(Math.max(...stamps)).toISOString()];
}

const signIn = (page: Page) => signInAs(page, baseUrl, worker);

/** Opens a PrimeVue Select and clicks the option with exactly this text. */
async function pick(page: Page, testId: string, option: string) {
  await pickOption(page, testId, option);
  await expect.poll(() => page.getByTestId(testId).innerText()).toContain(option);
  // The list fades out; the next Select's list must be the only one on the page.
  await expect.poll(() => page.locator('.p-select-overlay').count()).toBe(0);
}

async function openTank(page: Page, farm: string, tank: string) {
  await page.goto(`${baseUrl}/imports`);
  await page.getByTestId('imports-farm').waitFor();
  if (!(await page.getByTestId('imports-farm').innerText()).includes(farm)) await pick(page, 'imports-farm', farm);
  // PrimeVue marks a disabled Select in its data-p attribute; the tank list is loading until it is not.
  await expect.poll(async () => (await page.getByTestId('imports-tank').getAttribute('data-p')) ?? '').not.toContain('disabled');
  if (!(await page.getByTestId('imports-tank').innerText()).includes(tank)) await pick(page, 'imports-tank', tank);
  await page.getByTestId('imports-tank-facts').waitFor();
}

async function chooseFile(page: Page, path: string) {
  await page.getByTestId('imports-file-input').setInputFiles(path);
  await page.getByTestId('imports-preview').waitFor();
}

/** Clicks Import and waits for the result card of the new import; returns it. */
async function runImport(page: Page, known: Set<string>) {
  await page.getByTestId('imports-submit').click();
  const card = page.locator('[data-testid^="imports-result-"][data-status]').first();
  await expect.poll(async () => {
    const id = await card.getAttribute('data-testid').catch(() => null);
    return id !== null && !known.has(id);
  }, { timeout: 30_000 }).toBe(true);
  known.add((await card.getAttribute('data-testid'))!);
  return card;
}

/** Readings of a tank between two instants (both included), as the API lists them. */
async function readingsBetween(page: Page, tankId: number, from: string, to: string): Promise<number> {
  return page.evaluate(async ({ tankId, from, to }) => {
    const q = new URLSearchParams({ from, to, limit: '1000' });
    const res = await fetch(`/api/tanks/${tankId}/readings?${q}`);
    return ((await res.json()) as unknown[]).length;
  }, { tankId, from, to });
}

async function tankIdOf(page: Page, code: string): Promise<number> {
  return page.evaluate(async (code) => {
    const res = await fetch('/api/tanks');
    return ((await res.json()) as { id: number; code: string }[]).find((t) => t.code === code)!.id;
  }, code);
}

let browser: Browser;
afterEach(async () => {
  await browser.close();
});

describe('Logger files at 1280 px', () => {
  beforeEach(async () => {
    browser = await launch({ viewport: { width: 1280, height: 900 } });
  });

  it('maps and imports a sample logger file with its counts, then shows the same file again as a duplicate that adds nothing', async () => {
    const { page } = browser;
    const known = new Set<string>();
    // socket.io frames the page receives: the server pushes 'import:progress' to the uploader.
    const pushed: string[] = [];
    page.on('websocket', (ws) => ws.on('framereceived', (frame) => pushed.push(String(frame.payload))));
    await signIn(page);
    await page.getByTestId('nav-imports').click();
    await page.waitForURL((url) => url.pathname === '/imports');
    await openTank(page, 'Marrow Flats', 'Flats header tank (MF-W1)');
    await chooseFile(page, SAMPLE_0707);

    // The guess fills the form; the worker confirms each choice of the value column.
    await pick(page, 'map-ts-column', 'Timestamp (column 1)');
    await pick(page, 'map-ts-format', 'ISO 8601 with its offset — 2026-03-01T06:00:00+01:00');
    await pick(page, 'map-value-column', 'Level (mm) (column 2)');
    await pick(page, 'map-value-kind', 'Level above the tank floor');
    await pick(page, 'map-value-unit', 'mm — millimetres');
    await expect.poll(() => page.getByTestId('imports-preview-good').innerText()).toBe('19 good');
    expect(await page.getByTestId('imports-preview-bad').innerText()).toBe('0 with problems');
    await screenshot(page, 'imports-mapped-1280');

    const rows = dataRows(SAMPLE_0707);
    const first = await runImport(page, known);
    expect(await first.getAttribute('data-status')).toBe('imported');
    expect(await first.getByTestId('imports-result-new').innerText()).toBe(rows.toLocaleString('en-US'));
    expect(await first.getByTestId('imports-result-rejected').innerText()).toBe('0');
    expect(await first.getByTestId('imports-result-total').innerText()).toBe(rows.toLocaleString('en-US'));
    const importId = Number((await first.getAttribute('data-testid'))!.replace('imports-result-', ''));
    const progress = pushed.filter((f) => f.startsWith('42["import:progress"')).map((f) => (JSON.parse(f.slice(2)) as [string, { importId: number; status: string; rowsRead: number }])[1]);
    expect(progress.filter((p) => p.importId === importId).at(-1)).toMatchObject({ status: 'imported', rowsRead: rows });
    await page.getByTestId('imports-history-table').getByText('mf-w1-level-2025-07-07.csv').first().waitFor();
    await screenshot(page, 'imports-imported-1280');

    const tankId = await tankIdOf(page, 'MF-W1');
    const day = spanOf(SAMPLE_0707);
    const stored = await readingsBetween(page, tankId, ...day);
    expect(stored).toBe(rows);

    // Next visit: the tank is remembered and its saved mapping fills the form; no mapping clicks.
    await page.reload();
    await page.getByTestId('imports-mapping-saved').waitFor();
    expect(await page.getByTestId('imports-tank').innerText()).toContain('Flats header tank (MF-W1)');
    await chooseFile(page, SAMPLE_0707);
    const again = await runImport(page, known);

    expect(await again.getAttribute('data-status')).toBe('duplicate');
    expect(await again.getByTestId('imports-result-status').innerText()).toBe('Already imported');
    expect(await again.getByTestId('imports-result-new').innerText()).toBe('0');
    expect(await again.getByTestId('imports-result-error').innerText()).toMatch(/imported into this tank already/);
    expect(await readingsBetween(page, tankId, ...day)).toBe(stored);
    await screenshot(page, 'imports-duplicate-1280');
  });

  it('refuses a file with bad rows under "refuse the whole file" and lists every bad line', async () => {
    const { page } = browser;
    const known = new Set<string>();
    await signIn(page);
    await openTank(page, 'Hollin Ridge', 'Ridge water tank (HR-W1)');
    await chooseFile(page, BAD_ROWS);
    await pick(page, 'map-ts-column', 'time (column 1)');
    await pick(page, 'map-value-column', 'level_mm (column 2)');
    await pick(page, 'map-temp-column', 'temp_c (column 3)');

    // The browser check marks the same lines red before anything is sent.
    for (const line of BAD_LINES) expect(await page.getByTestId(`imports-preview-row-${line}`).getAttribute('data-state')).toBe('rejected');
    expect(await page.getByTestId('imports-preview-bad').innerText()).toBe(`${BAD_LINES.length} with problems`);
    await page.getByTestId('imports-policy-reject-file').click();
    await screenshot(page, 'imports-bad-preview-1280');

    const card = await runImport(page, known);

    expect(await card.getAttribute('data-status')).toBe('rejected');
    expect(await card.getByTestId('imports-result-new').innerText()).toBe('0');
    expect(await card.getByTestId('imports-result-rejected').innerText()).toBe(String(BAD_LINES.length));
    for (const line of BAD_LINES) await card.getByTestId(`imports-problem-line-${line}`).waitFor();
    expect(await card.locator('[data-testid^="imports-problem-line-"]').count()).toBe(BAD_LINES.length);
    expect(await card.getByTestId('imports-problem-line-7').innerText()).toMatch(/day 30 does not exist/);
    expect(await card.getByTestId('imports-problem-line-9').innerText()).toMatch(/above the top of the tank/);

    const href = (await card.getByTestId('imports-result-download').getAttribute('href'))!;
    const csv = await page.evaluate(async (href) => (await fetch(href)).text(), href);
    // Blank lines skipped, as a spreadsheet would.
    const lines = csv.replace(/^\uFEFF/, '').split(/\r?\n/).slice(1).filter((l) => l.trim() !== '').map((l) => Number(l.split(',')[0]));
    expect(lines).toEqual(BAD_LINES);
    await screenshot(page, 'imports-refused-1280');
  });
});

describe('Logger files at 360 px', () => {
  beforeEach(async () => {
    browser = await launch({ viewport: { width: 360, height: 780 }, isMobile: true });
  });

  it('imports the next file of the same logger on a phone', async () => {
    const { page } = browser;
    const known = new Set<string>();
    await signIn(page);
    await openTank(page, 'Marrow Flats', 'Flats header tank (MF-W1)');
    // The two sample files overlap by a day: readings already stored for those instants are counted, not added.
    const tankId = await tankIdOf(page, 'MF-W1');
    const span = spanOf(SAMPLE_0713);
    const before = await readingsBetween(page, tankId, ...span);
    await chooseFile(page, SAMPLE_0713);
    await screenshot(page, 'imports-preview-360');
    expect(await page.locator('body').evaluate((b) => b.scrollWidth)).toBeLessThanOrEqual(360);

    const card = await runImport(page, known);

    expect(await card.getAttribute('data-status')).toBe('imported');
    const rows = dataRows(SAMPLE_0713);
    expect(await card.getByTestId('imports-result-new').innerText()).toBe((rows - before).toLocaleString('en-US'));
    expect(await card.getByTestId('imports-result-duplicate').innerText()).toBe(before.toLocaleString('en-US'));
    expect(await readingsBetween(page, tankId, ...span)).toBe(rows);
    await page.getByTestId('imports-history-list').waitFor();
    await screenshot(page, 'imports-imported-360');
  });
});
