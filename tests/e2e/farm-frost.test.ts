// Browser test of frost ahead on the demo: the fake forecast service (started by tests/support/global-app.ts)
// answers with samples/weather/frost-tomorrow.json, so Hollin Ridge has a frost before dawn tomorrow. The farm
// page shows the 48-hour chart with the threshold line and the frost with its caution; the board shows the
// frost-forecast flag with its own icon and words. Screenshots at 1280 px and 360 px.
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { type Browser, launch, screenshot, signInAs } from '../support/browser';

const { baseUrl } = inject('app');
const manager = readScenario().people.find((p) => p.role === 'manager')!;
const FARM = 'Hollin Ridge';
const PHONE = { viewport: { width: 360, height: 780 }, isMobile: true };

const opened: Browser[] = [];
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

async function openFarm(page: Page): Promise<void> {
  const farms: { id: number; name: string }[] = await page.evaluate(async () => (await fetch('/api/farms')).json());
  const id = farms.find((f) => f.name === FARM)!.id;
  // The job runs once shortly after start-up; wait until the farm's forecast is in.
  await expect.poll(async () => page.evaluate(async (farmId) => (await (await fetch(`/api/farms/${farmId}/frost`)).json()).fetchedAt, id), { timeout: 20_000 }).not.toBeNull();
  await page.goto(`${baseUrl}/farms/${id}`);
  await page.getByTestId('farm-frost-chart').waitFor();
}

describe('frost ahead on the farm page and the board', () => {
  it.each([
    ['1280', {}],
    ['360', PHONE],
  ] as const)('shows the 48-hour chart with the threshold line, the frost and its caution, and the flag on the board at %s px', { timeout: 90_000 }, async (width, opts) => {
    const b = await launch(opts);
    opened.push(b);
    const { page } = b;
    await signInAs(page, baseUrl, manager);
    await openFarm(page);

    const panel = page.getByTestId('farm-frost');
    await expect.poll(() => page.getByTestId('farm-frost-verdict').textContent()).toMatch(/Frost forecast: the air falls to -1\.8 °C around \w{3} 0[45]:00, under this farm’s 2 °C/);
    expect(await panel.getByTestId('farm-frost-caution').textContent()).toContain('residual-current protection');
    expect(await panel.getByTestId('farm-frost-stale').count()).toBe(0);
    // The chart is drawn on a canvas; its label says what it shows, the threshold line included.
    expect(await page.getByTestId('farm-frost-chart').getAttribute('aria-label')).toBe('Air temperature for the next 48 hours with the frost line at 2 °C');
    const canvas = await page.getByTestId('farm-frost-chart').locator('canvas').boundingBox();
    expect(canvas!.width).toBeGreaterThan(250);
    expect(canvas!.width).toBeLessThanOrEqual(Number(width));
    await screenshot(page, `farm-frost-${width}`);

    await page.goto(`${baseUrl}/`);
    const flag = page.getByTestId('board-flags-kind-frost-ahead');
    await flag.waitFor();
    expect(await flag.textContent()).toContain('Frost forecast');
    expect(await flag.locator('.pi-cloud').count()).toBe(1);
    await screenshot(page, `board-frost-${width}`);
  });
});
