// Browser test of the round without signal: the demo worker opens the round once, loses the network
// (Chromium's offline mode) or the server (a forwarder in front of it is shut), reloads the page, which
// the service worker serves, walks every tank of both farms from the device's copy, sends, and once the
// way to the server is back every reading is stored exactly once and the board shows it.
import { createServer, connect, type Server, type Socket } from 'node:net';
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import type { Reading, StockBoard } from '@shared/schemas';
import { freePort } from '../../scripts/lib/ports';
import { readScenario } from '../../server/services/demo';
import { launch, pickOption, screenshot, signInAs, type Browser } from '../support/browser';

const { baseUrl } = inject('app');
const worker = readScenario().people.find((p) => p.role === 'worker')!;
const FARMS = ['Hollin Ridge', 'Marrow Flats'];
// 300 mm on the tube is inside every demo tank of these farms (the lowest is 950 mm tall, the datums -30 to 80 mm).
const READING_MM = '300';

const opened: Browser[] = [];
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

/** A TCP forwarder to the app's server that can be shut and opened again: "the server stopped" for the browser. */
async function forwarder(target: URL): Promise<{ url: string; stop(): Promise<void>; start(): Promise<void> }> {
  const port = await freePort();
  const sockets = new Set<Socket>();
  let server: Server | null = null;
  const start = () =>
    new Promise<void>((resolve) => {
      server = createServer((inbound) => {
        const upstream = connect(Number(target.port), target.hostname);
        for (const s of [inbound, upstream]) {
          sockets.add(s);
          s.on('close', () => sockets.delete(s));
          s.on('error', () => s.destroy());
        }
        inbound.pipe(upstream).pipe(inbound);
      });
      server.listen(port, '127.0.0.1', () => resolve());
    });
  const stop = () =>
    new Promise<void>((resolve) => {
      for (const s of sockets) s.destroy();
      server?.close(() => resolve());
    });
  await start();
  return { url: `http://127.0.0.1:${port}`, stop, start };
}

/** GET from the page, with its session, as JSON. */
const apiGet = <T>(page: Page, path: string) => page.evaluate(async (p) => (await fetch(p, { headers: { Accept: 'application/json' } })).json(), path) as Promise<T>;

/** Opens the round online once and waits until the service worker is installed with the app shell. */
async function openRoundOnce(page: Page, url: string): Promise<void> {
  await signInAs(page, url, worker);
  await page.goto(`${url}/round`);
  await page.locator('[data-testid^="round-tank-"]').first().waitFor();
  await page.evaluate(async () => {
    await navigator.serviceWorker.ready;
  });
}

/** Types a reading on every tank of every farm (answering any question it raises) and sends each farm's round. */
async function walkEveryFarm(page: Page): Promise<string[]> {
  const codes: string[] = [];
  for (const farm of FARMS) {
    await pickOption(page, 'round-farm', farm);
    await expect.poll(() => page.locator('.round-card').count()).toBeGreaterThan(0);
    const cards = await page.locator('[data-testid^="round-tank-"]').evaluateAll((els) => els.map((e) => e.getAttribute('data-testid')!.replace('round-tank-', '')));
    for (const code of cards) {
      await page.getByTestId(`round-input-${code}`).fill(READING_MM);
      // The litres come from the shared calibration code in the browser, with no server to ask.
      await expect.poll(() => page.getByTestId(`round-stock-${code}-total`).innerText()).toMatch(/L in the tank/);
    }
    for (const question of await page.locator('[data-testid^="round-question-"]').all()) await question.getByText('Yes, this is right').click();
    await expect.poll(() => page.getByTestId('round-progress').innerText()).toBe(`${cards.length} of ${cards.length} tanks ready`);
    await page.getByTestId('round-submit').click();
    await expect.poll(() => page.getByTestId('round-submit-problem').innerText()).toMatch(/No connection: the round waits on this device/);
    for (const code of cards) expect(await page.getByTestId(`round-result-${code}`).innerText()).toBe('Waiting to send');
    codes.push(...cards);
  }
  return codes;
}

/** Every tank has exactly one round reading since `since`, by this worker, and the board's tile is that reading. */
async function expectStoredOnce(page: Page, codes: string[], since: string): Promise<void> {
  const board = await apiGet<StockBoard>(page, '/api/board');
  const tiles = board.farms.flatMap((f) => f.tanks);
  for (const code of codes) {
    const tile = tiles.find((t) => t.code === code)!;
    const readings = await apiGet<Reading[]>(page, `/api/tanks/${tile.tankId}/readings?limit=50`);
    const ours = readings.filter((r) => r.source === 'round' && r.takenAt >= since && r.enteredBy === worker.name);
    expect(ours, code).toHaveLength(1);
    expect(tile.takenAt, code).toBe(ours[0]!.takenAt);
    expect(tile.grossL, code).toBeCloseTo(ours[0]!.grossL, 6);
  }
}

describe('round without signal', () => {
  it('walks every tank offline after a reload, and stores each reading once when the network returns, and once only when the same rounds are sent again', async () => {
    const phone = await launch({ viewport: { width: 360, height: 740 }, isMobile: true });
    opened.push(phone);
    const { page, context } = phone;
    const since = new Date(Date.now() - 1000).toISOString();
    await openRoundOnce(page, baseUrl);

    await context.setOffline(true);
    await page.reload();
    await page.getByTestId('round-offline-copy').waitFor();
    expect(await page.getByTestId('connection-note').innerText()).toContain(`signed in as ${worker.name}`);
    const codes = await walkEveryFarm(page);
    expect(await page.getByTestId('round-outbox-waiting').locator('li').count()).toBe(FARMS.length);
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'round-offline-waiting-phone');
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);

    await context.setOffline(false);
    await expect.poll(() => page.getByTestId('round-outbox-sent').locator('li').count(), { timeout: 30_000 }).toBe(FARMS.length);
    expect(await page.getByTestId('round-outbox-waiting').count()).toBe(0);
    expect(await page.getByTestId('round-outbox-sent').innerText()).not.toMatch(/already stored/);
    await expect.poll(() => page.getByTestId('connection-note').count()).toBe(0);
    await expectStoredOnce(page, codes, since);

    // As if the answers had been lost on the way back: the device's outbox holds both rounds as waiting again,
    // and on the next start sends them with the same keys and time; the server answers "already stored".
    await page.evaluate(
      () =>
        new Promise<void>((resolve, reject) => {
          const open = indexedDB.open('brimstock');
          open.onerror = () => reject(open.error);
          open.onsuccess = () => {
            const tx = open.result.transaction('outbox', 'readwrite');
            const store = tx.objectStore('outbox');
            const all = store.getAll();
            all.onsuccess = () => {
              for (const r of all.result as { status: string; applied: boolean; results: unknown }[]) store.put({ ...r, status: 'waiting', applied: false, results: null });
            };
            tx.oncomplete = () => {
              open.result.close();
              resolve();
            };
            tx.onerror = () => reject(tx.error);
          };
        }),
    );
    await page.reload();
    await expect.poll(() => page.getByTestId('round-outbox-sent').innerText(), { timeout: 30_000 }).toMatch(/already stored[\s\S]*already stored/);
    expect(await page.getByTestId('round-outbox-waiting').count()).toBe(0);
    await expectStoredOnce(page, codes, since);
  });

  it('keeps the rounds while the server is stopped and sends them by itself once it is back', async () => {
    const door = await forwarder(new URL(baseUrl));
    const desktop = await launch();
    opened.push(desktop);
    const { page } = desktop;
    const since = new Date(Date.now() - 1000).toISOString();
    try {
      await openRoundOnce(page, door.url);

      await door.stop();
      await page.reload();
      await page.getByTestId('round-offline-copy').waitFor();
      expect(await page.getByTestId('connection-note').innerText()).toContain(`signed in as ${worker.name}`);
      const codes = await walkEveryFarm(page);
      await page.evaluate(() => window.scrollTo(0, 0));
      await screenshot(page, 'round-offline-waiting-desktop');

      await door.start();
      // No "online" event here (the network never went): the back-off tries again by itself.
      await expect.poll(() => page.getByTestId('round-outbox-sent').locator('li').count(), { timeout: 45_000, interval: 500 }).toBe(FARMS.length);
      for (const code of codes.slice(-2)) expect(await page.getByTestId(`round-result-${code}`).innerText()).toBe('Stored');
      await expectStoredOnce(page, codes, since);
    } finally {
      await door.stop();
    }
  });
});
