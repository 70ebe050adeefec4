// Browser tests of the foundation: each demo role signs in and sees its navigation; a worker
// gets no People screen and a 403 from its API; an invitation mail's link sets a password.
import { afterEach, beforeEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { type Browser, dialogOpened, launch, reachableNav, screenshot } from '../support/browser';
import { tokenFrom, waitForMail } from '../support/mail';

const { baseUrl, outboxDir } = inject('app');
const people = readScenario().people;
const demo = (role: string) => people.find((p) => p.role === role)!;

async function signIn(page: Page, email: string, password: string) {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByTestId('signin-email').fill(email);
  await page.getByTestId('signin-password').locator('input').or(page.locator('[data-testid="signin-password"] input, input[data-testid="signin-password"]')).first().fill(password);
  await page.getByTestId('signin-submit').click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
}

let browser: Browser;
beforeEach(async () => {
  browser = await launch();
});
afterEach(async () => {
  await browser.close();
});

describe('navigation by role', () => {
  it.each([
    ['owner', true],
    ['manager', false],
    ['worker', false],
    ['buyer', false],
  ])('shows the %s the screens of that role (People: %s)', async (role, seesPeople) => {
    const { page } = browser;
    const who = demo(role);
    await signIn(page, who.email, who.password);
    const reachable = await reachableNav(page);
    expect(reachable).toContain('nav-farms');
    expect(reachable.includes('nav-people')).toBe(seesPeople);
    await screenshot(page, `home-${role}`);
  });

  it('gives a worker no People screen and a 403 from the people API', async () => {
    const { page } = browser;
    const who = demo('worker');
    await signIn(page, who.email, who.password);
    await page.goto(`${baseUrl}/people`);
    await page.waitForLoadState('networkidle');
    expect(new URL(page.url()).pathname).not.toBe('/people');
    const status = await page.evaluate(async () => (await fetch('/api/people')).status);
    expect(status).toBe(403);
  });
});

describe('invitation', () => {
  it('sends an invitation whose link sets a password that then signs in', async () => {
    const { page } = browser;
    const owner = demo('owner');
    await signIn(page, owner.email, owner.password);
    await page.goto(`${baseUrl}/people`);
    await page.getByTestId('people-invite').click();
    await dialogOpened(page, 'invite-dialog');
    const email = `invitee-${Date.now()}@tallowbrook.example`;
    await page.getByTestId('invite-email').fill(email);
    await page.getByTestId('invite-name').fill('Ines Morrow');
    await page.getByTestId('invite-submit').click();
    const mail = await waitForMail(outboxDir, email, 10_000);

    await page.goto(`${baseUrl}/outbox`);
    await expect.poll(() => page.getByTestId('outbox-message').count()).toBeGreaterThan(0);
    await screenshot(page, 'outbox');

    const visitor = await launch();
    try {
      const p = visitor.page;
      await p.goto(`${baseUrl}/set-password?token=${tokenFrom(mail)}`);
      await p.locator('[data-testid="setpw-password"] input, input[data-testid="setpw-password"]').first().fill('ines-new-password');
      await p.getByTestId('setpw-submit').click();
      await p.waitForURL((url) => !url.pathname.startsWith('/set-password'));
      await screenshot(p, 'invitee-signed-in');
      await p.evaluate(async () => {
        const s = await (await fetch('/api/auth/session')).json();
        await fetch('/api/auth/sign-out', { method: 'POST', headers: { 'x-csrf-token': s.csrfToken } });
      });
      await signIn(p, email, 'ines-new-password');
      const me = await p.evaluate(async () => (await fetch('/api/auth/me')).json());
      expect(me).toMatchObject({ email, role: 'worker' });
    } finally {
      await visitor.close();
    }
  });
});
