// `npm start`'s supervisor: a server process killed with -9 (exitCode null, signalCode SIGKILL) is
// started again after a back-off; past the restart limit everything stops and it exits non-zero;
// either way nothing is left holding the ports, so the next start works.
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { createConnection } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, inject, it } from 'vitest';
import { freePort } from '../../scripts/lib/ports';

const root = resolve(import.meta.dirname, '../..');
const dataDirs: string[] = [];
afterAll(() => dataDirs.forEach((dir) => rmSync(dir, { recursive: true, force: true })));

interface Started {
  child: ChildProcess;
  lines: string[];
  waitFor(pattern: RegExp, timeoutMs?: number): Promise<RegExpExecArray>;
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
}

function npmStart(env: Record<string, string>): Started {
  const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'scripts/tasks.ts'), 'start'], { cwd: root, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
  const lines: string[] = [];
  const waiters: { pattern: RegExp; done: (m: RegExpExecArray, index: number) => void }[] = [];
  // Each wait looks only at lines after the one the previous wait matched.
  let seen = 0;
  const check = () => {
    for (const w of [...waiters]) {
      for (let i = seen; i < lines.length; i++) {
        const m = w.pattern.exec(lines[i]!);
        if (m) {
          waiters.splice(waiters.indexOf(w), 1);
          w.done(m, i);
          break;
        }
      }
    }
  };
  for (const stream of [child.stdout!, child.stderr!]) {
    let rest = '';
    stream.on('data', (chunk: Buffer) => {
      const parts = (rest + chunk.toString()).split('\n');
      rest = parts.pop()!;
      lines.push(...parts);
      check();
    });
  }
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((r) => child.once('exit', (code, signal) => r({ code, signal })));
  return {
    child,
    lines,
    exited,
    waitFor(pattern, timeoutMs = 90_000) {
      return new Promise((ok, fail) => {
        const timer = setTimeout(() => fail(new Error(`no line like ${pattern} in ${timeoutMs} ms:\n${lines.join('\n')}`)), timeoutMs);
        waiters.push({
          pattern,
          done: (m, index) => {
            clearTimeout(timer);
            seen = index + 1;
            ok(m);
          },
        });
        check();
      });
    },
  };
}

const portOpen = (port: number) =>
  new Promise<boolean>((r) => {
    const s = createConnection({ port, host: '127.0.0.1' });
    s.once('connect', () => (s.destroy(), r(true)));
    s.once('error', () => r(false));
  });

async function settings(restarts: number) {
  const dataDir = mkdtempSync(join(tmpdir(), 'brimstock-supervisor-'));
  dataDirs.push(dataDir);
  return {
    NODE_ENV: 'test',
    DATA_DIR: dataDir,
    CLIENT_DIR: join(inject('app').dataDir, 'client'),
    PORT: String(await freePort()),
    DB_PORT: String(await freePort()),
    SMTP_PORT: String(await freePort()),
    LOG_LEVEL: 'warn',
    SERVER_RESTARTS: String(restarts),
  };
}

describe('npm start supervisor', () => {
  it('starts a server killed with -9 again, then stops everything on SIGTERM with exit code 0', async () => {
    const env = await settings(2);
    const run = npmStart(env);
    const first = Number((await run.waitFor(/Started the server \(process (\d+)\)/))[1]);
    await run.waitFor(/Brimstock is ready/);
    process.kill(first, 'SIGKILL');
    await run.waitFor(/The server was killed by SIGKILL; starting it again/);
    const second = Number((await run.waitFor(/Started the server \(process (\d+)\)/))[1]);
    expect(second).not.toBe(first);
    await run.waitFor(/Brimstock is ready/);
    const health = await fetch(`http://127.0.0.1:${env.PORT}/api/health`);
    expect(health.status).toBe(200);
    run.child.kill('SIGTERM');
    expect(await run.exited).toEqual({ code: 0, signal: null });
    expect(await portOpen(Number(env.PORT))).toBe(false);
    expect(await portOpen(Number(env.DB_PORT))).toBe(false);
    expect(await portOpen(Number(env.SMTP_PORT))).toBe(false);
  }, 180_000);

  it('past the restart limit stops MariaDB and the mail receiver and exits non-zero; the next start works', async () => {
    const env = await settings(0);
    const run = npmStart(env);
    const pid = Number((await run.waitFor(/Started the server \(process (\d+)\)/))[1]);
    await run.waitFor(/Brimstock is ready/);
    process.kill(pid, 'SIGKILL');
    const { code } = await run.exited;
    expect(code).not.toBe(0);
    expect(run.lines.join('\n')).toMatch(/The server was killed by SIGKILL; it was restarted 0 time\(s\) already, so everything stops/);
    expect(await portOpen(Number(env.DB_PORT))).toBe(false);
    expect(await portOpen(Number(env.SMTP_PORT))).toBe(false);

    const again = npmStart(env);
    await again.waitFor(/Brimstock is ready/);
    expect((await fetch(`http://127.0.0.1:${env.PORT}/api/health`)).status).toBe(200);
    again.child.kill('SIGTERM');
    expect((await again.exited).code).toBe(0);
  }, 180_000);
});
