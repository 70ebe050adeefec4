// Browser tests of the Logger files screen on loggers' own exports, with the demo worker and manager:
// no failed request in the console while the screen opens a tank without a saved mapping; the MF-F1
// sample with the date and the time in two columns is guessed, checked whole by the server's dry run
// and imported with the same counts; a distance file for a tank without its sensor height tells the
// worker whom to ask by name, and lets the manager keep the height on the tank.
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { launch, pickOption, screenshot, signInAs, type Browser } from '../support/browser';

const { baseUrl } = inject('app');
const people = readScenario().people;
const worker = people.find((p) => p.role === 'worker')!;
const manager = people.find((p) => p.role === 'manager')!;
const owner = people.find((p) => p.role === 'owner')!;
const root = join(import.meta.dirname, '../..');
const DATE_TIME_SAMPLE = join(root, 'samples/loggers/mf-f1-date-time-2026-03-26.csv');
const ULTRASONIC_SAMPLE = join(root, 'samples/loggers/hr-w1-ultrasonic-2025-10-23.csv');

/** Opens a PrimeVue Select and clicks the option with exactly this text. */
async function pick(page: Page, testId: string, option: string) {
  await pickOption(page, testId, option);
  await expect.poll(() => page.getByTestId(testId).innerText()).toContain(option);
  await expect.poll(() => page.locator('.p-select-overlay').count()).toBe(0);
}

async function openTank(page: Page, farm: string, tank: string) {
  await page.goto(`${baseUrl}/imports`);
  await page.getByTestId('imports-farm').waitFor();
  if (!(await page.getByTestId('imports-farm').innerText()).includes(farm)) await pick(page, 'imports-farm', farm);
  await expect.poll(async () => (await page.getByTestId('imports-tank').getAttribute('data-p')) ?? '').not.toContain('disabled');
  if (!(await page.getByTestId('imports-tank').innerText()).includes(tank)) await pick(page, 'imports-tank', tank);
  await page.getByTestId('imports-tank-facts').waitFor();
}

let browser: Browser;
afterEach(async () => {
  await browser.close();
});

describe('Logger files: the server check and the date and time in two columns', () => {
  beforeEach(async () => {
    browser = await launch({ viewport: { width: 1280, height: 900 } });
  });

  it('opens a tank with no saved mapping without a failed request, and imports the two-column sample with the counts the dry run gave', async () => {
    const { page } = browser;
    const failed: string[] = [];
    page.on('console', (m) => void (m.type() === 'error' && failed.push(m.text())));
    page.on('response', (r) => void (r.status() >= 400 && failed.push(`${r.status()} ${r.url()}`)));
    await signInAs(page, baseUrl, worker);
    await openTank(page, 'Marrow Flats', 'Fertigation tote (MF-F1)');
    await page.getByTestId('imports-columns-hint').waitFor();
    expect(failed).toEqual([]);

    await page.getByTestId('imports-file-input').setInputFiles(DATE_TIME_SAMPLE);
    await page.getByTestId('imports-preview').waitFor();
    // The guess finds the date column, the time column beside it and their layouts.
    expect(await page.getByTestId('map-ts-column').innerText()).toContain('Date (column 1)');
    expect(await page.getByTestId('map-ts-format').innerText()).toContain('Day/month/year, time in its own column');
    expect(await page.getByTestId('map-time-column').innerText()).toContain('Time (column 2)');
    expect(await page.getByTestId('map-time-format').innerText()).toContain('24-hour, seconds');
    await pick(page, 'map-value-unit', 'cm — centimetres');

    // The server reads all 335 rows, not only the 20 the browser shows.
    await expect.poll(() => page.getByTestId('imports-dry-run').getAttribute('data-state'), { timeout: 30_000 }).toBe('ready');
    expect(await page.getByTestId('imports-dry-run-total').innerText()).toBe('335');
    expect(await page.getByTestId('imports-dry-run-new').innerText()).toBe('334');
    expect(await page.getByTestId('imports-dry-run-repeated').innerText()).toBe('1');
    expect(await page.getByTestId('imports-dry-run-duplicate').innerText()).toBe('0');
    await screenshot(page, 'imports-date-time-dry-run-1280');

    await page.getByTestId('imports-submit').click();
    const card = page.locator('[data-testid^="imports-result-"][data-status]').first();
    await card.waitFor({ timeout: 30_000 });
    expect(await card.getAttribute('data-status')).toBe('imported');
    expect(await card.getByTestId('imports-result-new').innerText()).toBe('334');
    expect(await card.getByTestId('imports-result-repeated').innerText()).toBe('1');
    expect(await card.getByTestId('imports-result-total').innerText()).toBe('335');
    expect(failed).toEqual([]);
    await screenshot(page, 'imports-date-time-imported-1280');
  });

  it('tells the worker whom to ask for the sensor height of a distance file, by name', async () => {
    const { page } = browser;
    await signInAs(page, baseUrl, worker);
    await openTank(page, 'Hollin Ridge', 'Ridge water tank (HR-W1)');
    await page.getByTestId('imports-file-input').setInputFiles(ULTRASONIC_SAMPLE);
    await page.getByTestId('imports-preview').waitFor();
    expect(await page.getByTestId('map-value-kind').innerText()).toContain('Distance down from the sensor');

    const ask = page.getByTestId('imports-sensor-height-ask');
    await ask.waitFor();
    expect(await ask.innerText()).toContain(`ask ${owner.name} (owner) or ${manager.name} (manager)`);
    expect(await page.getByTestId('imports-sensor-height-input').count()).toBe(0);
    await screenshot(page, 'imports-sensor-height-worker-1280');
  });

  it('lets the manager keep the sensor height on the tank, then checks the distance file', async () => {
    const { page } = browser;
    await signInAs(page, baseUrl, manager);
    await openTank(page, 'Hollin Ridge', 'Ridge water tank (HR-W1)');
    await page.getByTestId('imports-file-input').setInputFiles(ULTRASONIC_SAMPLE);
    await page.getByTestId('imports-preview').waitFor();
    await page.getByTestId('imports-sensor-height').waitFor();
    await screenshot(page, 'imports-sensor-height-manager-1280');

    // The sensor face sits 50 mm above the 2,400 mm brim (samples/loggers/README.md).
    await page.locator('[data-testid="imports-sensor-height-input"] input, input[data-testid="imports-sensor-height-input"]').first().fill('2450');
    await page.getByTestId('imports-sensor-height-save').click();
    await expect.poll(() => page.getByTestId('imports-tank-facts').innerText()).toContain('ultrasonic sensor 2,450 mm above the floor');
    expect(await page.getByTestId('imports-sensor-height').count()).toBe(0);
    await expect.poll(() => page.getByTestId('imports-dry-run').getAttribute('data-state'), { timeout: 30_000 }).toBe('ready');
    expect(await page.getByTestId('imports-dry-run-new').innerText()).toBe('338');
    // The repeated hour of 26 Oct 2025 is read in row order, each of its rows noted.
    expect(await page.locator('[data-testid^="imports-dry-run-lines-line-"][data-kind="note"]').count()).toBe(4);
    await screenshot(page, 'imports-sensor-height-kept-1280');

    // Put the demo tank back as it was (no sensor height) for the other tests.
    const tankId = await page.evaluate(async () => ((await (await fetch('/api/tanks')).json()) as { id: number; code: string }[]).find((t) => t.code === 'HR-W1')!.id);
    const status = await page.evaluate(async (id) => {
      const { csrfToken } = (await (await fetch('/api/auth/session')).json()) as { csrfToken: string };
      return (await fetch(`/api/tanks/${id}`, { method: 'PATCH', headers: { 'content-type': 'application/json', 'x-csrf-token': csrfToken }, body: JSON.stringify({ sensorHeightMm: null }) })).status;
    }, tankId);
    expect(status).toBe(200);
  });
});
