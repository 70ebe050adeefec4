// Fault tests drive the real server as a child process (so it can be killed with SIGKILL and started
// again) against a database prepared here, and talk to it over HTTP and socket.io like a browser.
import type { ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { join } from 'node:path';
import mariadb from 'mariadb';
import { io as connect, type Socket } from 'socket.io-client';
import { freePort } from '../../scripts/lib/ports';
import { startServerProcess } from '../../scripts/lib/server-process';
import { loadConfig } from '../../server/config';
import { createDatabase, migrate, type Database } from '../../server/db';
import type { TestEnv } from './db';
import { PASSWORD } from './fixtures';


export interface DbServer {
  socketPath: string;
  port: number;
  user: string;
  password: string;
}

/** Makes an empty database `<prefix>_<random>` on `server` (as root over the socket) and migrates it; returns a handle to it. */
export async function freshDatabase(server: DbServer, prefix: string): Promise<{ name: string; db: Database }> {
  const name = `${prefix}_${randomBytes(5).toString('hex')}`;
  const admin = await mariadb.createConnection({ socketPath: server.socketPath, user: 'root' });
  try {
    await admin.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  } finally {
    await admin.end();
  }
  const db = createDatabase(loadConfig({ DB_PORT: String(server.port), DB_NAME: name, DB_USER: server.user, DB_PASSWORD: server.password }));
  await migrate(db.sequelize);
  return { name, db };
}

/** The fixtures in tests/support only use `ctx.db`, so a bare database handle serves them. */
export const fixtureEnv = (db: Database) => ({ ctx: { db } }) as unknown as TestEnv;

export interface ServerProcess {
  baseUrl: string;
  /** Starts the process (again) and waits until it says it is ready. */
  start(): Promise<void>;
  /** Sends SIGKILL and waits for the process to be gone: no shutdown code runs. */
  kill9(): Promise<void>;
  /** SIGTERM and wait (the normal shutdown). */
  stop(): Promise<void>;
  /** What the process wrote to stderr, for failure messages. */
  stderr(): string;
}

/** The real server (server/index.ts under tsx) on a free 127.0.0.1 port against database `dbName` of `server`. */
export async function serverProcess(server: DbServer, dbName: string, dataDir: string): Promise<ServerProcess> {
  const port = await freePort();
  const env: Record<string, string> = {
    PATH: process.env.PATH ?? '',
    HOME: process.env.HOME ?? '',
    NODE_ENV: 'test',
    HOST: '127.0.0.1',
    PORT: String(port),
    DATA_DIR: dataDir,
    CLIENT_DIR: join(dataDir, 'no-client'),
    DB_HOST: '127.0.0.1',
    DB_PORT: String(server.port),
    DB_NAME: dbName,
    DB_USER: server.user,
    DB_PASSWORD: server.password,
    SMTP_PORT: String(await freePort()),
    LOG_LEVEL: process.env.TEST_LOG_LEVEL ?? 'error',
    SESSION_SECRET: 'fault-test-secret-fault-test-secret',
  };
  let child: ChildProcess | null = null;
  let stderrOf = () => '';
  const gone = (c: ChildProcess) => new Promise<void>((r) => (c.exitCode !== null || c.signalCode !== null ? r() : c.once('exit', () => r())));
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    stderr: () => stderrOf(),
    async start() {
      const started = await startServerProcess({ env, captureStderr: true, timeoutMs: 45_000 });
      child = started.child;
      stderrOf = started.stderr;
    },
    async kill9() {
      if (!child) return;
      child.kill('SIGKILL');
      await gone(child);
      child = null;
    },
    async stop() {
      if (!child) return;
      child.kill('SIGTERM');
      await gone(child);
      child = null;
    },
  };
}

/** A signed-in browser-like HTTP client: the session cookie and CSRF token on every request. */
export class Client {
  cookie = '';
  csrf = '';
  constructor(readonly baseUrl: string) {}

  private keepCookies(res: Response) {
    const set = res.headers.getSetCookie().map((c) => c.split(';')[0]);
    if (set.length) this.cookie = set.join('; ');
  }

  static async signIn(baseUrl: string, email: string): Promise<Client> {
    const c = new Client(baseUrl);
    const first = await fetch(`${baseUrl}/api/auth/session`);
    c.keepCookies(first);
    c.csrf = ((await first.json()) as { csrfToken: string }).csrfToken;
    const res = await c.request('POST', '/api/auth/sign-in', { email, password: PASSWORD });
    if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
    c.csrf = (res.body as { csrfToken: string }).csrfToken;
    return c;
  }

  /** Sends a JSON (or multipart) request; never throws on an error status. */
  async request(method: string, path: string, body?: object | FormData): Promise<{ status: number; body: unknown }> {
    const headers: Record<string, string> = { cookie: this.cookie, 'x-csrf-token': this.csrf };
    if (body !== undefined && !(body instanceof FormData)) headers['content-type'] = 'application/json';
    const res = await fetch(`${this.baseUrl}${path}`, { method, headers, body: body instanceof FormData ? body : body === undefined ? undefined : JSON.stringify(body) });
    this.keepCookies(res);
    const text = await res.text();
    let parsed: unknown = text;
    try {
      parsed = JSON.parse(text);
    } catch {
      // not JSON: keep the text
    }
    return { status: res.status, body: parsed };
  }

  /** POST /api/imports with one CSV file. */
  upload(tankId: number, name: string, content: Buffer, mapping: object) {
    const form = new FormData();
    form.set('tankId', String(tankId));
    form.set('mapping', JSON.stringify(mapping));
    form.append('files', new Blob([new Uint8Array(content)], { type: 'text/csv' }), name);
    return this.request('POST', '/api/imports', form);
  }

  /** A socket.io connection with this client's session; resolves once it is in its rooms (told its board stream's position). */
  socket(opts: { reconnection?: boolean } = {}): Promise<Socket> {
    return new Promise((ok, fail) => {
      const s = connect(this.baseUrl, { transports: ['websocket'], extraHeaders: { cookie: this.cookie }, forceNew: true, reconnection: opts.reconnection ?? false });
      s.once('board:stream', () => ok(s));
      s.once('connect_error', (err) => {
        s.close();
        fail(err);
      });
    });
  }
}

/** Polls `check` every `everyMs` until it returns a value other than undefined, or fails after `ms`. */
export async function waitFor<T>(what: string, check: () => Promise<T | undefined>, ms = 30_000, everyMs = 50): Promise<T> {
  const end = Date.now() + ms;
  let last: unknown;
  for (;;) {
    try {
      const v = await check();
      if (v !== undefined) return v;
    } catch (err) {
      last = err;
    }
    if (Date.now() > end) throw new Error(`timed out after ${ms} ms waiting for ${what}${last ? ` (last error: ${String(last)})` : ''}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}
