// Browser test of the round and the live stock board: the demo manager watches the board on a
// desktop while the demo worker, on a 360 px phone, enters a round for Hollin Ridge; the manager's
// water total moves within a second without a reload. Also the buyer's read-only board, and the
// board on a phone.
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import type { BoardDelta, StockBoard } from '@shared/schemas';
import { readScenario } from '../../server/services/demo';
import { launch, pickOption, screenshot, signInAs, type Browser } from '../support/browser';

const { baseUrl } = inject('app');
const people = readScenario().people;
const demo = (role: string) => people.find((p) => p.role === role)!;
const PHONE = { viewport: { width: 360, height: 740 }, isMobile: true };

const signIn = (page: Page, role: string) => signInAs(page, baseUrl, demo(role));

const opened: Browser[] = [];
async function open(opts: Parameters<typeof launch>[0] = {}): Promise<Browser> {
  const b = await launch(opts);
  opened.push(b);
  return b;
}
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

describe('round and live stock board', () => {
  it('moves the manager’s water total within a second of a worker’s round, without a reload', async () => {
    const worker = await open(PHONE);
    await signIn(worker.page, 'worker');

    const manager = await open();
    await signIn(manager.page, 'manager');
    const board = manager.page;
    // The board, its flags and any import progress share one socket.io connection per tab.
    const sockets: string[] = [];
    board.on('websocket', (ws) => {
      if (ws.url().includes('/socket.io/')) sockets.push(ws.url());
    });
    const deltas: BoardDelta[] = [];
    board.on('websocket', (ws) =>
      ws.on('framereceived', (f) => {
        if (typeof f.payload === 'string' && f.payload.startsWith('42["board:delta"')) deltas.push((JSON.parse(f.payload.slice(2)) as [string, BoardDelta])[1]);
      }),
    );
    await board.goto(`${baseUrl}/`);
    await expect.poll(() => board.getByTestId('board-live').getAttribute('data-status')).toBe('live');
    expect(await board.getByTestId('board-live').innerText()).toMatch(/^Live/);
    const waterTotal = board.getByTestId('board-total-water');
    await expect.poll(() => waterTotal.innerText()).toMatch(/usable/);
    const before = await waterTotal.innerText();
    let reloads = 0;
    board.on('framenavigated', (frame) => {
      if (frame === board.mainFrame()) reloads++;
    });

    const phone = worker.page;
    await phone.goto(`${baseUrl}/round`);
    await pickOption(phone, 'round-farm', 'Hollin Ridge');
    await phone.getByTestId('round-tank-HR-W1').waitFor();

    // Litres appear while typing: 1140 mm + 60 mm datum = 1.2 m in a cylinder 3.2 m across,
    // π × 1.6² × 1.2 m³ = 9,651 L in the tank, π × 1.6² × 1.05 m³ = 8,445 L of it above the 150 mm outlet
    // (right circular cylinder V = π r² h; recalled from memory).
    await phone.getByTestId('round-input-HR-W1').fill('1140');
    await expect.poll(() => phone.getByTestId('round-stock-HR-W1-usable').innerText()).toBe('8,445 L');
    expect(await phone.getByTestId('round-stock-HR-W1-total').innerText()).toBe('9,651 L in the tank');
    // A reading past the top of the 950 mm drum is refused on the spot, then corrected.
    await phone.getByTestId('round-input-HR-P1').fill('5000');
    await expect.poll(() => phone.getByTestId('round-error-HR-P1').innerText()).toMatch(/above the top of the tank/);
    await phone.getByTestId('round-input-HR-P1').fill('600');
    await phone.getByTestId('round-input-HR-C1').fill('800');
    await phone.getByTestId('round-temperature-HR-C1').fill('21.5');
    await phone.getByTestId('round-input-HR-C2').fill('700');
    await phone.getByTestId('round-temperature-HR-C2').fill('16.5');
    await expect.poll(() => phone.getByTestId('round-warning-HR-C2').innerText()).toMatch(/inactive/);
    expect(await phone.getByTestId('round-error-HR-P1').count()).toBe(0);
    // A cold culture is asked about before the round sends; so is a stock far from the last one, which
    // depends on the browser tests that ran before, so each question asked is answered here
    // (tests/e2e/round-checks.test.ts tests the questions themselves).
    await phone.getByTestId('round-question-HR-C2').waitFor();
    for (const question of await phone.locator('[data-testid^="round-question-"]').all()) await question.getByText('Yes, this is right').click();
    await expect.poll(() => phone.getByTestId('round-progress').innerText()).toBe('4 of 4 tanks ready');

    // Phone-first: nothing wider than the screen, and inputs big enough for a thumb.
    expect(await phone.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    const inputBox = await phone.getByTestId('round-input-HR-W1').boundingBox();
    expect(inputBox!.height).toBeGreaterThanOrEqual(48);
    const sendBox = await phone.getByTestId('round-submit').boundingBox();
    expect(sendBox!.height).toBeGreaterThanOrEqual(48);
    await phone.evaluate(() => window.scrollTo(0, 0));
    await screenshot(phone, 'round-worker-phone-typed');

    // The board fetches the 14-day history again once pushes settle, so the chart shows today's round.
    const historyRefreshed = board.waitForResponse((r) => r.url().endsWith('/api/board/history'), { timeout: 15_000 }).then(
      () => true,
      () => false,
    );
    await phone.getByTestId('round-submit').click();
    await expect.poll(() => phone.getByTestId('round-result-HR-W1').innerText(), { timeout: 5000 }).toBe('Stored');
    const storedAt = Date.now();
    await expect.poll(() => waterTotal.innerText(), { timeout: 1000, interval: 50 }).not.toBe(before);
    expect(Date.now() - storedAt).toBeLessThan(1000);
    expect(reloads).toBe(0);
    expect(sockets).toHaveLength(1);
    // It came as a delta whose Hollin Ridge part carries only tiles of the round's four tanks (a background
    // job such as the frost forecast may change another farm in the same 100 ms window and share the delta).
    // Tiles travel as their changed fields, so they are known by id (the board's own answer names them).
    const shown = (await board.evaluate(() => fetch('/api/board').then((r) => r.json()))) as StockBoard;
    const codeOf = new Map(shown.farms.flatMap((f) => f.tanks.map((t) => [t.tankId, t.code] as const)));
    const withRound = deltas.find((d) => d.farms.some((f) => f.tanks.some((t) => codeOf.get(t.tankId) === 'HR-W1')))!;
    const hollin = withRound.farms.find((f) => f.tanks.some((t) => codeOf.get(t.tankId) === 'HR-W1'))!;
    expect(hollin.tanks.map((t) => codeOf.get(t.tankId)!).every((c) => ['HR-W1', 'HR-P1', 'HR-C1', 'HR-C2'].includes(c))).toBe(true);
    // Of a tile the board already shows, a round changes the reading's figures, not its name or shape.
    expect(hollin.tanks.every((t) => !('name' in t) && !('capacityL' in t))).toBe(true);

    for (const code of ['HR-C1', 'HR-C2', 'HR-P1']) expect(await phone.getByTestId(`round-result-${code}`).innerText()).toBe('Stored');
    expect(await phone.getByTestId('round-summary').innerText()).toContain('4 stored');
    expect(await phone.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    await phone.evaluate(() => window.scrollTo(0, 0));
    await screenshot(phone, 'round-worker-phone');

    // The tile shows the new reading as usable stock: π × 1.6² × (1.2 − 0.15) m³ above the 150 mm outlet.
    await expect.poll(() => board.getByTestId('board-stock-HR-W1-usable').innerText()).toBe('8,445 L');
    expect(await board.getByTestId('board-tile-HR-W1').innerText()).toMatch(/usable[\s\S]*Read just now/);
    expect(await historyRefreshed).toBe(true);
    await board.getByTestId('board-history-chart').waitFor();
    await board.waitForTimeout(1200);
    await screenshot(board, 'board-manager');
  });

  it('shows the same usable litres and the same share of the usable capacity on the round, the board and the tank page', async () => {
    const desk = await open();
    await signIn(desk.page, 'manager');
    const page = desk.page;
    await page.goto(`${baseUrl}/round`);
    await pickOption(page, 'round-farm', 'Hollin Ridge');
    await page.getByTestId('round-input-HR-W1').fill('1700');
    // 1700 + 60 mm = 1.76 m in the 3.2 m cylinder: π × 1.6² × (1.76 − 0.15) m³ = 12,948 L usable (V = π r² h).
    await expect.poll(() => page.getByTestId('round-stock-HR-W1-usable').innerText()).toBe('12,948 L');
    for (const question of await page.locator('[data-testid^="round-question-"]').all()) await question.getByText('Yes, this is right').click();
    const onRound = { usable: await page.getByTestId('round-stock-HR-W1-usable').innerText(), percent: await page.getByTestId('round-stock-HR-W1-percent').innerText() };
    expect(onRound.percent).toMatch(/^\d+ % of [\d,]+ L usable capacity$/);
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'round-manager-desktop');
    await page.getByTestId('round-submit').click();
    await expect.poll(() => page.getByTestId('round-result-HR-W1').innerText(), { timeout: 5000 }).toBe('Stored');

    await page.goto(`${baseUrl}/`);
    const tile = page.getByTestId('board-tile-HR-W1');
    await expect.poll(() => tile.getByTestId('board-stock-HR-W1-usable').innerText(), { timeout: 5000 }).toBe(onRound.usable);
    expect(await tile.getByTestId('board-stock-HR-W1-percent').innerText()).toBe(onRound.percent);
    expect(await tile.locator('svg[role="img"]').getAttribute('aria-label')).toContain(`${onRound.usable} usable`);

    await tile.click();
    await page.waitForURL(/\/tanks\/\d+/);
    await expect.poll(() => page.getByTestId('tank-stock-usable').innerText(), { timeout: 5000 }).toBe(onRound.usable);
    expect(await page.getByTestId('tank-stock-percent').innerText()).toBe(onRound.percent);
    await screenshot(page, 'tank-manager-desktop');

    // The manager's round on a phone, before anything is typed.
    const phone = await open(PHONE);
    await signIn(phone.page, 'manager');
    await phone.page.goto(`${baseUrl}/round`);
    await pickOption(phone.page, 'round-farm', 'Hollin Ridge');
    await phone.page.getByTestId('round-input-HR-W1').fill('1500');
    await phone.page.getByTestId('round-stock-HR-W1-usable').waitFor();
    expect(await phone.page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    await phone.page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(phone.page, 'round-manager-phone');
  });

  it('shows a buyer the board read-only, without a round', async () => {
    const buyer = await open();
    await signIn(buyer.page, 'buyer');
    const page = buyer.page;
    await page.goto(`${baseUrl}/`);

    await expect.poll(() => page.getByTestId('board-total-water').innerText()).toMatch(/usable/);
    expect(await page.getByTestId('board-readonly').count()).toBe(1);
    expect(await page.getByTestId('board-round').count()).toBe(0);
    expect(await page.getByTestId('nav-round').count()).toBe(0);
    expect(await page.getByTestId('nav-home').innerText()).toContain('Stock board');
    await page.goto(`${baseUrl}/round`);
    await page.waitForURL((url) => url.pathname === '/');
    await page.getByTestId('board-total-water').waitFor();
    await page.getByTestId('board-history-chart').waitFor();
    // Let the chart's drawing animation finish before the picture.
    await page.waitForTimeout(1200);
    await screenshot(page, 'board-buyer');
  });

  it('shows the manager’s board on a phone without sideways scrolling', async () => {
    const phone = await open(PHONE);
    await signIn(phone.page, 'manager');
    await phone.page.goto(`${baseUrl}/`);
    await phone.page.getByTestId('board-total-water').waitFor();
    await phone.page.getByTestId('board-tile-HR-W1').waitFor();
    await phone.page.getByTestId('board-history-chart').waitFor();
    await phone.page.waitForTimeout(1200);

    await screenshot(phone.page, 'board-manager-phone');
    expect(await phone.page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
  });
});
