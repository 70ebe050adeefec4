// A production server on an empty database: no demo, a set-up link printed on the console; the
// sign-in screen says where it is, and opening it makes the first owner, who lands on the home screen.
import type { ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { ensureDatabase, startMariaDb, type MariaDbServer } from '../../scripts/lib/mariadb';
import { freePort } from '../../scripts/lib/ports';
import { startServerProcess } from '../../scripts/lib/server-process';
import { launch, screenshot } from '../support/browser';

const LINK_LINE = /No organisation exists yet: open (\S+) to make the first owner/;

let dataDir = '';
let mariadb: MariaDbServer | undefined;
let server: ChildProcess | undefined;
let baseUrl = '';
const printed: string[] = [];

beforeAll(async () => {
  dataDir = mkdtempSync(join(tmpdir(), 'brimstock-first-owner-'));
  mariadb = await startMariaDb({ baseDir: dataDir, port: await freePort() });
  const port = await freePort();
  const env: Record<string, string> = {
    ...(process.env as Record<string, string>),
    NODE_ENV: 'production',
    SESSION_SECRET: 'first-owner-e2e-secret-first-owner',
    PORT: String(port),
    DATA_DIR: dataDir,
    // The client the browser tests' global set-up built.
    CLIENT_DIR: join(inject('app').dataDir, 'client'),
    DB_PORT: String(mariadb.port),
    DB_SOCKET: mariadb.socketPath,
    DB_NAME: 'brimstock_first_owner',
    SMTP_PORT: String(await freePort()),
    LOG_LEVEL: 'warn',
  };
  delete env.DEMO;
  await ensureDatabase(mariadb.socketPath, { name: env.DB_NAME!, user: 'brimstock', password: 'brimstock-dev' });
  server = (await startServerProcess({ env, onLine: (line) => printed.push(line) })).child;
  baseUrl = `http://127.0.0.1:${port}`;
});

afterAll(async () => {
  if (server && server.exitCode === null) {
    server.kill('SIGTERM');
    await new Promise((r) => server!.once('exit', r));
  }
  await mariadb?.stop();
  if (dataDir) rmSync(dataDir, { recursive: true, force: true });
});

describe('first owner of an empty production server', () => {
  it('prints a set-up link whose form makes the owner and lands on the home screen', async () => {
    const line = printed.find((l) => LINK_LINE.test(l));
    expect(line, printed.join('\n')).toBeDefined();
    const link = LINK_LINE.exec(line!)![1]!;
    expect(link).toMatch(new RegExp(`^${baseUrl}/first-owner\\?token=[A-Za-z0-9_-]{43}$`));

    const browser = await launch();
    try {
      const { page } = browser;
      await page.goto(`${baseUrl}/sign-in`);
      await expect.poll(() => page.getByTestId('signin-first-owner').textContent()).toContain("printed in the server's console");
      await screenshot(page, 'first-owner-sign-in');

      await page.goto(link);
      await page.getByTestId('firstowner-form').waitFor();
      await page.getByTestId('firstowner-organisation').fill('Tarn Ridge Growers');
      await page.getByTestId('firstowner-name').fill('Morwenna Lisle');
      await page.getByTestId('firstowner-email').fill('morwenna@tarnridge.test');
      await page.locator('input[data-testid="firstowner-password"]').fill('kettle heron basalt plum');
      await expect.poll(() => page.getByTestId('firstowner-strength').textContent()).toBe('Hard enough to guess.');
      await screenshot(page, 'first-owner-form');
      await page.getByTestId('firstowner-submit').click();

      await page.waitForURL((url) => url.pathname === '/');
      await page.getByText('No tanks on the board yet').waitFor();
      await page.getByTestId('nav-sign-out').first().waitFor();
      const me = await page.evaluate(async () => (await fetch('/api/auth/me')).json());
      expect(me).toMatchObject({ role: 'owner', email: 'morwenna@tarnridge.test', organisationName: 'Tarn Ridge Growers' });
      await screenshot(page, 'first-owner-home');

      // The link worked once: opened again, it says so.
      await page.goto(link);
      await page.getByTestId('firstowner-done').waitFor();
    } finally {
      await browser.close();
    }
  });
});
