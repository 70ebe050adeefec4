// Browser test of flags: the demo manager watches the stock board while the demo worker, on a
// phone, reads Hollin Ridge with the culture tank HR-C1 at 15 °C. The board lists a cold-culture
// flag without a reload (cultures go inactive under about 18 °C: common practice, no published
// source), and the manager acknowledges it on the Flags screen.
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { type Browser, dialogOpened, launch, pickOption, screenshot, signInAs } from '../support/browser';

const { baseUrl } = inject('app');
const people = readScenario().people;
const demo = (role: string) => people.find((p) => p.role === role)!;
const PHONE = { viewport: { width: 360, height: 740 }, isMobile: true };

const signIn = (page: Page, role: string) => signInAs(page, baseUrl, demo(role));

const opened: Browser[] = [];
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

describe('flags on the board and the Flags screen', () => {
  it('shows a cold culture on the manager’s board without a reload, and lets the manager acknowledge it', async () => {
    const worker = await launch(PHONE);
    opened.push(worker);
    await signIn(worker.page, 'worker');
    const manager = await launch();
    opened.push(manager);
    await signIn(manager.page, 'manager');

    const board = manager.page;
    await board.goto(`${baseUrl}/`);
    await board.getByTestId('board-flags').waitFor();
    await expect.poll(() => board.getByTestId('board-live').getAttribute('data-status')).toBe('live');
    const coldC1 = board.getByTestId('board-flag-cold-culture').filter({ hasText: 'HR-C1' });
    expect(await coldC1.count()).toBe(0);
    let reloads = 0;
    board.on('framenavigated', (frame) => {
      if (frame === board.mainFrame()) reloads++;
    });

    const phone = worker.page;
    await phone.goto(`${baseUrl}/round`);
    await pickOption(phone, 'round-farm', 'Hollin Ridge');
    await phone.getByTestId('round-input-HR-C1').fill('800');
    await phone.getByTestId('round-temperature-HR-C1').fill('15');
    // A culture under its safe range is asked about before the round sends (tests/e2e/round-checks.test.ts);
    // so may be a level far from the last one, which depends on the browser tests that ran before.
    await phone.getByTestId('round-question-HR-C1').waitFor();
    for (const question of await phone.locator('[data-testid^="round-question-"]').all()) await question.getByText('Yes, this is right').click();
    await phone.getByTestId('round-submit').click();
    await expect.poll(() => phone.getByTestId('round-result-HR-C1').innerText(), { timeout: 5000 }).toBe('Stored');

    await expect.poll(() => coldC1.count(), { timeout: 5000 }).toBe(1);
    expect(reloads).toBe(0);
    expect(await coldC1.innerText()).toContain('Culture too cold');
    // The tank's own tile says it too, in words beside an icon, from the same live flags.
    await expect.poll(() => board.getByTestId('board-tile-flags-HR-C1').innerText(), { timeout: 5000 }).toContain('Culture too cold');
    await screenshot(board, 'flags-board-manager');

    await board.goto(`${baseUrl}/flags`);
    const row = board.locator('[data-testid^="flags-row-"][data-kind="cold-culture"]').filter({ hasText: 'HR-C1' });
    await row.waitFor();
    const id = (await row.getAttribute('data-testid'))!.replace('flags-row-', '');
    expect(await board.getByTestId(`flags-caution-${id}`).innerText()).toMatch(/residual-current/);
    await board.getByTestId(`flags-ack-${id}`).click();
    await dialogOpened(board, 'flags-ack-dialog');
    await board.getByTestId('flags-ack-note').fill('Heater switched back on; reading again at 16:00');
    await screenshot(board, 'flags-ack-dialog');
    await board.getByTestId('flags-ack-submit').click();
    await expect.poll(() => board.getByTestId(`flags-status-${id}`).innerText()).toBe('Seen');
    expect(await board.getByTestId(`flags-acknowledged-${id}`).innerText()).toContain('Heater switched back on');
    await screenshot(board, 'flags-manager');

    // The same screen on the worker's phone: nothing wider than 360 px.
    await phone.goto(`${baseUrl}/flags`);
    await phone.locator(`[data-testid="flags-row-${id}"]`).waitFor();
    expect(await phone.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);
    // Let the cautions' opening animation finish before the picture.
    await phone.waitForTimeout(800);
    await screenshot(phone, 'flags-worker-phone');
  });
});
