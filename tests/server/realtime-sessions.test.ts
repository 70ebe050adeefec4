// A live socket lasts no longer than the session it was opened with: sign-out, a password reset,
// deactivation and expiry close it within a second, and only the app's own origin may open one.
import { randomUUID } from 'node:crypto';
import { createServer, type Server } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { io as connect, type Socket } from 'socket.io-client';
import type { BoardDelta, FarmDelta } from '@shared/schemas';
import { attachRealtime } from '../../server/realtime';
import { useTestApp, type TestEnv } from '../support/db';
import { makeOrganisation, PASSWORD, type OrgFixture } from '../support/fixtures';
import { tokenFrom, waitForMail } from '../support/mail';
import { makeTank } from '../support/tanks';

interface Browser {
  cookie: string;
  csrf: string;
}

interface Watch {
  socket: Socket;
  farms: FarmDelta[];
  flags: unknown[];
  /** When the server closed the socket (ms since the epoch), once it has. */
  closedAt: () => number | null;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

const until = async (check: () => boolean, ms = 3000) => {
  const end = Date.now() + ms;
  while (!check()) {
    if (Date.now() > end) throw new Error('timed out');
    await sleep(20);
  }
};

/** A real listening server for one test app, and a browser's view of it: cookies, CSRF token, sockets. */
function useLiveServer(env: TestEnv) {
  let http: Server;
  let base = '';
  const sockets: Socket[] = [];
  beforeAll(async () => {
    http = createServer(env.app);
    attachRealtime(env.ctx, http, env.app.locals.sessionMiddleware);
    await new Promise<void>((r) => http.listen(0, '127.0.0.1', () => r()));
    const addr = http.address();
    base = `http://127.0.0.1:${typeof addr === 'object' && addr ? addr.port : 0}`;
  });
  afterAll(async () => {
    for (const s of sockets) s.disconnect();
    http.closeAllConnections();
    await new Promise((r) => http.close(r));
  });

  const cookieOf = (res: Response, before = '') => res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ') || before;

  /** A fresh browser with a session but nobody signed in. */
  async function visitor(): Promise<Browser> {
    const res = await fetch(`${base}/api/auth/session`);
    return { cookie: cookieOf(res), csrf: (await res.json()).csrfToken };
  }

  async function post(who: Browser, path: string, body: object, method = 'POST') {
    return fetch(`${base}${path}`, { method, headers: { 'content-type': 'application/json', cookie: who.cookie, 'x-csrf-token': who.csrf }, body: JSON.stringify(body) });
  }

  /** Signs in over real HTTP, as a browser of its own. */
  async function signIn(email: string, password = PASSWORD): Promise<Browser> {
    const who = await visitor();
    const res = await post(who, '/api/auth/sign-in', { email, password });
    expect(res.status).toBe(200);
    return { cookie: cookieOf(res, who.cookie), csrf: (await res.json()).csrfToken };
  }

  /** Opens a socket with the browser's cookie; resolves once the first board has arrived. */
  function open(who?: Browser, opts: { origin?: string } = {}): Promise<Watch> {
    return new Promise((resolve, reject) => {
      const headers: Record<string, string> = {};
      if (who) headers.cookie = who.cookie;
      if (opts.origin) headers.origin = opts.origin;
      const socket = connect(base, { transports: ['websocket'], extraHeaders: headers, reconnection: false, forceNew: true });
      sockets.push(socket);
      const farms: FarmDelta[] = [];
      const flags: unknown[] = [];
      let closedAt: number | null = null;
      socket.on('board:delta', (d: BoardDelta) => farms.push(...d.farms));
      socket.on('flags:farm', (f: unknown) => flags.push(f));
      socket.on('disconnect', (reason) => {
        if (reason === 'io server disconnect' || reason === 'transport close') closedAt ??= Date.now();
      });
      socket.once('board:stream', () => resolve({ socket, farms, flags, closedAt: () => closedAt }));
      socket.once('connect_error', reject);
    });
  }

  async function round(who: Browser, farmId: number, tankId: number, readingMm: number) {
    const res = await post(who, '/api/rounds', { farmId, entries: [{ tankId, readingMm, idempotencyKey: randomUUID().replace(/-/g, '') }] });
    expect(res.status).toBe(201);
  }

  return { visitor, post, signIn, open, round };
}

describe('live sockets and their sessions', () => {
  const env = useTestApp();
  const live = useLiveServer(env);
  let org: OrgFixture;
  let tankA: number;
  beforeAll(async () => {
    org = await makeOrganisation(env);
    tankA = (await makeTank(env, org, org.farmIds[0], { code: 'A' })).id;
  });

  it('closes the socket of a session within a second of its sign-out, and pushes nothing more to it', async () => {
    const signingOut = await live.signIn(org.users.manager.email);
    const otherBrowser = await live.signIn(org.users.manager.email);
    const watch = await live.open(signingOut);
    const stays = await live.open(otherBrowser);

    const at = Date.now();
    expect((await live.post(signingOut, '/api/auth/sign-out', {})).status).toBe(204);
    await until(() => watch.closedAt() !== null, 1000);
    expect(watch.closedAt()! - at).toBeLessThanOrEqual(1000);

    // The same person's other browser keeps its socket and still hears the board and flags.
    await live.round(otherBrowser, org.farmIds[0], tankA, 500);
    env.ctx.events.emit('flags', { organisationId: org.organisationId, farmIds: [org.farmIds[0]] });
    await until(() => stays.farms.length > 0 && stays.flags.length > 0);
    await sleep(300);
    expect(watch.farms).toEqual([]);
    expect(watch.flags).toEqual([]);
    expect(stays.socket.connected).toBe(true);
  });

  it('closes another browser\'s socket within a second of a password reset by link, and the resetting browser\'s new socket lives on', async () => {
    const elsewhere = await live.signIn(org.users.worker.email);
    const watch = await live.open(elsewhere);

    const resetting = await live.visitor();
    expect((await live.post(resetting, '/api/auth/password-reset', { email: org.users.worker.email })).status).toBe(202);
    const token = tokenFrom(await waitForMail(env.config.outboxDir, org.users.worker.email));
    const at = Date.now();
    const set = await live.post(resetting, '/api/auth/set-password', { token, password: 'quartz-tadpole-meadow-71' });
    expect(set.status).toBe(200);
    await until(() => watch.closedAt() !== null, 1000);
    expect(watch.closedAt()! - at).toBeLessThanOrEqual(1000);

    const fresh = { cookie: set.headers.getSetCookie().map((c) => c.split(';')[0]).join('; '), csrf: (await set.json()).csrfToken as string };
    const mine = await live.open(fresh);
    await live.round(fresh, org.farmIds[0], tankA, 520);
    await until(() => mine.farms.length > 0);
    await sleep(1200);
    expect(mine.socket.connected).toBe(true);
    expect(watch.farms).toEqual([]);
  });

  it('closes the sockets of a person the owner deactivates within a second', async () => {
    const person = await makeOrganisation(env);
    const owner = await live.signIn(person.users.owner.email);
    const buyer = await live.signIn(person.users.buyer.email);
    const watch = await live.open(buyer);
    const at = Date.now();
    expect((await live.post(owner, `/api/people/${person.users.buyer.id}`, { active: false }, 'PATCH')).status).toBe(200);
    await until(() => watch.closedAt() !== null, 1000);
    expect(watch.closedAt()! - at).toBeLessThanOrEqual(1000);
    await expect(live.open(buyer)).rejects.toThrow(/unauthenticated/);
  });

  it('refuses a handshake from another origin and accepts the app\'s own', async () => {
    const manager = await live.signIn(org.users.manager.email);
    await expect(live.open(manager, { origin: 'http://evil.example' })).rejects.toThrow();
    await expect(live.open(manager, { origin: 'http://127.0.0.1:1' })).rejects.toThrow();
    const own = await live.open(manager, { origin: new URL(env.config.publicUrl).origin });
    expect(own.socket.connected).toBe(true);
  });
});

describe('live sockets of sessions that expire', () => {
  // Idle expiry 2.4 s after the last HTTP use, absolute expiry 5.4 s after signing in.
  const env = useTestApp({ SESSION_IDLE_MINUTES: '0.04', SESSION_ABSOLUTE_HOURS: '0.0015' });
  const absoluteMs = 5_400;
  const live = useLiveServer(env);
  let org: OrgFixture;
  beforeAll(async () => {
    org = await makeOrganisation(env);
  });

  const sessionRow = async (who: Browser) => {
    const rows = await env.ctx.db.models.Session.findAll({ where: { userId: org.users.manager.id } });
    const row = rows.find((r) => who.cookie.includes(encodeURIComponent(`s:${r.sid}.`)));
    if (!row) throw new Error('no session row for this browser');
    return row;
  };

  it('closes a socket within a second of its session\'s idle expiry and refuses a new one with that cookie', async () => {
    const manager = await live.signIn(org.users.manager.email);
    const watch = await live.open(manager);
    const expires = (await sessionRow(manager)).expires!.getTime();
    expect(expires - Date.now()).toBeGreaterThan(800);
    await sleep(Math.max(0, expires - Date.now() - 300));
    expect(watch.socket.connected).toBe(true);
    await until(() => watch.closedAt() !== null, 2500);
    expect(watch.closedAt()! - expires).toBeLessThanOrEqual(1000);
    await expect(live.open(manager)).rejects.toThrow(/unauthenticated/);
  });

  it('keeps a socket whose session was used meanwhile, and closes it within a second of the absolute expiry', async () => {
    const manager = await live.signIn(org.users.manager.email);
    const watch = await live.open(manager);
    await sleep(200);
    // The browser's HTTP requests (another tab) roll the idle expiry on.
    const row = await sessionRow(manager);
    const signedInAt = (JSON.parse(row.data!) as { signedInAt: number }).signedInAt;
    await row.update({ expires: new Date(Date.now() + 3_600_000) });
    await sleep(Math.max(0, signedInAt + absoluteMs - 400 - Date.now()));
    expect(watch.socket.connected).toBe(true);
    await until(() => watch.closedAt() !== null, 2500);
    expect(watch.closedAt()! - (signedInAt + absoluteMs)).toBeLessThanOrEqual(1000);
  });
});
