// `npm run start:cluster` end to end: its own MariaDB, Redis, three server processes and haproxy in a
// temporary data folder; /api/health answers through PORT from every process, and SIGTERM stops it all.
import { spawn } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { createConnection } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { freePort } from '../../scripts/lib/ports';
import { waitFor } from '../support/server-process';

const root = resolve(import.meta.dirname, '../..');

/** True while something accepts connections on 127.0.0.1:`port`. */
const listening = (port: number) =>
  new Promise<boolean>((ok) => {
    const s = createConnection({ host: '127.0.0.1', port }, () => {
      s.destroy();
      ok(true);
    });
    s.once('error', () => ok(false));
  });

describe('npm run start:cluster', () => {
  it('serves /api/health through PORT from three processes behind haproxy and stops cleanly', async () => {
    const dataDir = mkdtempSync(join(tmpdir(), 'brimstock-cluster-'));
    // A built client newer than the sources, so the task does not build one: only the API is checked.
    const clientDir = join(dataDir, 'client');
    mkdirSync(clientDir);
    writeFileSync(join(clientDir, 'index.html'), '<!doctype html><title>t</title>');
    const port = await freePort();
    const env = {
      PATH: process.env.PATH ?? '',
      HOME: process.env.HOME ?? '',
      NODE_ENV: 'test',
      DEMO: 'false',
      HOST: '127.0.0.1',
      PORT: String(port),
      DATA_DIR: dataDir,
      CLIENT_DIR: clientDir,
      DB_PORT: String(await freePort()),
      REDIS_PORT: String(await freePort()),
      SMTP_PORT: String(await freePort()),
      LOG_LEVEL: 'warn',
    };
    let output = '';
    const task = spawn(process.execPath, ['--import', 'tsx', join(root, 'scripts/tasks.ts'), 'start:cluster'], { cwd: root, env, stdio: ['ignore', 'pipe', 'pipe'] });
    task.stdout.on('data', (c: Buffer) => (output += c.toString()));
    task.stderr.on('data', (c: Buffer) => (output += c.toString()));
    const exited = new Promise<number | null>((r) => task.once('exit', (code) => r(code)));
    try {
      // haproxy answers once a process is up; wait until all three have said they are ready.
      await waitFor('three ready lines', async () => ((output.match(/"event":"ready"/g) ?? []).length >= 3 ? true : undefined), 150_000, 200);
      const cfg = readFileSync(join(dataDir, 'haproxy', 'haproxy.cfg'), 'utf8');
      expect(cfg).toContain('balance source');
      for (const p of [port + 1, port + 2, port + 3]) {
        expect(cfg).toContain(`127.0.0.1:${p}`);
        expect((await fetch(`http://127.0.0.1:${p}/api/health`)).status).toBe(200);
      }
      const health = await waitFor('health through PORT', async () => {
        const res = await fetch(`http://127.0.0.1:${port}/api/health`);
        return res.status === 200 ? ((await res.json()) as Record<string, unknown>) : undefined;
      }, 20_000, 200);
      expect(health).toBeTruthy();
    } finally {
      task.kill('SIGTERM');
    }
    expect(await exited, output).toBe(0);
    for (const p of [port, port + 1, port + 2, port + 3, Number(env.REDIS_PORT)]) expect(await listening(p), `port ${p} after stop`).toBe(false);
    expect(output).toContain('Stopped the 3 server processes');
  }, 200_000);
});
