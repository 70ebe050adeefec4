// The client's board store against the real server: deltas applied in order, one dropped on
// purpose, and the store recovering (one ETag fetch of GET /api/board) to the board a fresh load shows.
import { randomUUID } from 'node:crypto';
import { createServer, type Server } from 'node:http';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { io as connect, type Socket } from 'socket.io-client';
import type { BoardDelta, BoardStreamPosition, FarmBoard, StockBoard } from '@shared/schemas';
import { useBoardStore } from '@/stores/board';
import { attachRealtime } from '../../server/realtime';
import { useTestApp } from '../support/db';
import { makeOrganisation, PASSWORD } from '../support/fixtures';
import { makeTank } from '../support/tanks';

const remote = vi.hoisted(() => ({ base: '', cookie: '', fetches: [] as { ifNoneMatch: string | null; status: number }[] }));

// The store's API module, speaking to the test server with the signed-in cookie (a browser sends it by itself).
vi.mock('@/api/board', () => ({
  fetchBoardIfChanged: async (etag: string | null) => {
    const res = await fetch(`${remote.base}/api/board`, { headers: { cookie: remote.cookie, ...(etag ? { 'if-none-match': etag } : {}) } });
    remote.fetches.push({ ifNoneMatch: etag, status: res.status });
    if (res.status === 304) return { notModified: true, etag: etag! };
    return { notModified: false, body: (await res.json()) as StockBoard, etag: res.headers.get('etag') };
  },
  fetchBoard: vi.fn(),
  fetchBoardHistory: vi.fn(),
}));

const env = useTestApp();
let http: Server;
const sockets: Socket[] = [];

beforeAll(async () => {
  http = createServer(env.app);
  attachRealtime(env.ctx, http, env.app.locals.sessionMiddleware);
  await new Promise<void>((r) => http.listen(0, '127.0.0.1', () => r()));
  const addr = http.address();
  remote.base = `http://127.0.0.1:${typeof addr === 'object' && addr ? addr.port : 0}`;
});
afterAll(async () => {
  for (const s of sockets) s.disconnect();
  http.closeAllConnections();
  await new Promise((r) => http.close(r));
});

async function signIn(email: string) {
  const first = await fetch(`${remote.base}/api/auth/session`);
  const cookie1 = first.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  const { csrfToken } = await first.json();
  const res = await fetch(`${remote.base}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json', cookie: cookie1, 'x-csrf-token': csrfToken }, body: JSON.stringify({ email, password: PASSWORD }) });
  const body = await res.json();
  return { cookie: res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; '), csrf: body.csrfToken as string };
}

const until = async (check: () => boolean, ms = 5000) => {
  const end = Date.now() + ms;
  while (!check()) {
    if (Date.now() > end) throw new Error('timed out');
    await new Promise((r) => setTimeout(r, 20));
  }
};

/** A farm's tiles by tank, without days of cover (counted to the moment each board was built). */
const shown = (farms: FarmBoard[]) =>
  Object.fromEntries(farms.map((f) => [f.farmId, { name: f.name, totals: f.totals, tanks: Object.fromEntries(f.tanks.map((t) => [t.tankId, { ...t, daysOfCover: null }])) }]));

describe('board store on the live stream', () => {
  it('applies deltas in order, fetches the board once with its entity tag when one is dropped, and ends equal to a fresh load', async () => {
    const org = await makeOrganisation(env);
    const tanks = [
      { farmId: org.farmIds[0], id: (await makeTank(env, org, org.farmIds[0], { code: 'S1' })).id },
      { farmId: org.farmIds[0], id: (await makeTank(env, org, org.farmIds[0], { code: 'S2' })).id },
      { farmId: org.farmIds[1], id: (await makeTank(env, org, org.farmIds[1], { code: 'S3' })).id },
    ];
    const manager = await signIn(org.users.manager.email);
    remote.cookie = manager.cookie;
    setActivePinia(createPinia());
    const store = useBoardStore();

    const received: BoardDelta[] = [];
    const dropped: number[] = [];
    let dropNext = false;
    const socket = connect(remote.base, { transports: ['websocket'], extraHeaders: { cookie: manager.cookie }, reconnection: false, forceNew: true });
    sockets.push(socket);
    socket.on('board:stream', (p: BoardStreamPosition) => store.connected(p));
    socket.on('board:delta', (d: BoardDelta) => {
      received.push(d);
      // One delta is lost on purpose.
      if (dropNext) {
        dropNext = false;
        return void dropped.push(d.seq);
      }
      store.applyDelta(d);
    });
    await store.load();
    await until(() => socket.connected);
    const firstFetches = remote.fetches.length;

    const post = async (i: number) => {
      const t = tanks[i % tanks.length];
      const res = await fetch(`${remote.base}/api/rounds`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', cookie: manager.cookie, 'x-csrf-token': manager.csrf },
        body: JSON.stringify({ farmId: t.farmId, entries: [{ tankId: t.id, readingMm: 400 + i * 25, idempotencyKey: randomUUID().replace(/-/g, '') }] }),
      });
      expect(res.status).toBe(201);
      // Apart, so that each round is its own delta.
      await new Promise((r) => setTimeout(r, 250));
    };
    for (let i = 0; i < 2; i++) await post(i);
    await until(() => received.length >= 2);
    await new Promise((r) => setTimeout(r, 500));
    // Each applied in order, numbered one after another, and no fetch so far.
    expect(received.map((d) => d.seq)).toEqual(received.map((_, i) => received[0].seq + i));
    expect(store.stream!.seq).toBe(received.at(-1)!.seq);
    expect(store.refetches).toBe(0);
    expect(remote.fetches.length).toBe(firstFetches);

    dropNext = true;
    const before = received.length;
    for (let i = 2; i < 6; i++) await post(i);
    await until(() => dropped.length === 1 && received.length >= before + 4);
    // Settled: the last delta received is applied and no fetch is under way.
    await until(() => store.stream!.seq >= received.at(-1)!.seq && remote.fetches.length > firstFetches);
    await new Promise((r) => setTimeout(r, 300));

    expect(store.refetches).toBeGreaterThanOrEqual(1);
    const gapFetch = remote.fetches[firstFetches];
    // The board fetched again after the gap, with the tag of the one fetched before.
    expect(gapFetch.ifNoneMatch).toMatch(/^"board-/);
    expect(gapFetch.status).toBe(200);

    const fresh = (await (await fetch(`${remote.base}/api/board`, { headers: { cookie: manager.cookie } })).json()) as StockBoard;
    expect(shown(store.farms)).toEqual(shown(fresh.farms));
    for (const t of fresh.totals) {
      const mine = store.totals.find((x) => x.contents === t.contents)!;
      expect(mine.grossL).toBeCloseTo(t.grossL, 6);
      expect(mine.usableL).toBeCloseTo(t.usableL, 6);
      expect(mine.tanks).toBe(t.tanks);
    }
    // The last reading of each tank is on the board.
    const tile = store.farms.flatMap((f) => f.tanks).find((x) => x.tankId === tanks[5 % 3].id)!;
    expect(tile.levelMm).toBeCloseTo(400 + 5 * 25, 6);
  }, 30_000);
});
