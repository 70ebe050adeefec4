import { randomUUID } from 'node:crypto';
import { createServer, type Server } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { io as connect, type Socket } from 'socket.io-client';
import { totalsOf } from '@shared/board';
import { boardDeltaSchema, type BoardDelta, type BoardStreamPosition, type StockBoard } from '@shared/schemas';
import { attachRealtime, THROTTLE_MS } from '../../server/realtime';
import { useTestApp } from '../support/db';
import { makeOrganisation, PASSWORD, type OrgFixture } from '../support/fixtures';
import { makeTank } from '../support/tanks';

const env = useTestApp();
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

/** Signs in over real HTTP and returns the cookie header and CSRF token. */
async function session(email: string) {
  const first = await fetch(`${base}/api/auth/session`);
  const cookie1 = first.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  const { csrfToken } = await first.json();
  const res = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json', cookie: cookie1, 'x-csrf-token': csrfToken }, body: JSON.stringify({ email, password: PASSWORD }) });
  const body = await res.json();
  return { cookie: res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; '), csrf: body.csrfToken as string };
}

interface Watch {
  socket: Socket;
  stream: BoardStreamPosition;
  deltas: BoardDelta[];
}

function open(cookie?: string): Promise<Watch> {
  return new Promise((resolve, reject) => {
    const socket = connect(base, { transports: ['websocket'], extraHeaders: cookie ? { cookie } : {}, reconnection: false, forceNew: true });
    sockets.push(socket);
    const deltas: BoardDelta[] = [];
    socket.on('board:delta', (d: BoardDelta) => deltas.push(boardDeltaSchema.parse(d)));
    socket.once('board:stream', (stream: BoardStreamPosition) => resolve({ socket, stream, deltas }));
    socket.once('connect_error', reject);
  });
}

async function board(who: { cookie: string }): Promise<StockBoard> {
  return (await fetch(`${base}/api/board`, { headers: { cookie: who.cookie } })).json();
}

async function round(who: { cookie: string; csrf: string }, farmId: number, tankId: number, readingMm: number) {
  const res = await fetch(`${base}/api/rounds`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', cookie: who.cookie, 'x-csrf-token': who.csrf },
    body: JSON.stringify({ farmId, entries: [{ tankId, readingMm, idempotencyKey: randomUUID().replace(/-/g, '') }] }),
  });
  expect(res.status).toBe(201);
}

const until = async (check: () => boolean, ms = 3000) => {
  const end = Date.now() + ms;
  while (!check()) {
    if (Date.now() > end) throw new Error('timed out');
    await new Promise((r) => setTimeout(r, 20));
  }
};

const farmOf = (d: BoardDelta, farmId: number) => d.farms.find((f) => f.farmId === farmId);

describe('realtime board', () => {
  let org: OrgFixture;
  let tankA: number;
  let tankA2: number;
  let tankB: number;
  beforeAll(async () => {
    org = await makeOrganisation(env);
    tankA = (await makeTank(env, org, org.farmIds[0], { code: 'A' })).id;
    tankA2 = (await makeTank(env, org, org.farmIds[0], { code: 'A2' })).id;
    tankB = (await makeTank(env, org, org.farmIds[1], { code: 'B' })).id;
  });

  it('refuses a socket without a signed-in session', async () => {
    await expect(open()).rejects.toThrow(/unauthenticated/);
  });

  it('sends a numbered delta with only the changed fields of the changed tank, from which the board\'s totals follow', async () => {
    const manager = await session(org.users.manager.email);
    await round(manager, org.farmIds[0], tankA2, 500);
    await new Promise((r) => setTimeout(r, 300));
    const watch = await open(manager.cookie);
    const before = await board(manager);
    expect(before.stream).toEqual(watch.stream);

    await round(manager, org.farmIds[0], tankA, 600);
    await until(() => watch.deltas.some((d) => farmOf(d, org.farmIds[0])?.tanks.some((t) => t.tankId === tankA)));
    // Deltas are numbered on from the stream position the socket was told (A2's use rate, worked out meanwhile, may come first).
    expect(watch.deltas.map((d) => d.seq)).toEqual(watch.deltas.map((_, i) => watch.stream.seq + 1 + i));
    const delta = watch.deltas.find((d) => farmOf(d, org.farmIds[0])?.tanks.some((t) => t.tankId === tankA))!;
    expect(delta.epoch).toBe(watch.stream.epoch);
    expect(delta.farms.map((f) => f.farmId)).toEqual([org.farmIds[0]]);
    const farm = farmOf(delta, org.farmIds[0])!;
    // Only tank A: its neighbour A2 on the same farm, read before, did not change.
    expect(farm.tanks.map((t) => t.tankId)).toEqual([tankA]);
    expect(farm.tanks[0].grossL).toBeCloseTo(600 * (Math.PI / 4), 6);
    // Only what a reading changes: not the name, code, contents or shape the client has from the board.
    for (const still of ['name', 'code', 'contents', 'capacityL', 'usableCapacityL', 'heightMm', 'outletHeightMm']) expect(farm.tanks[0]).not.toHaveProperty(still);
    // Once the use rates worked out meanwhile have followed, every delta laid over the board read before
    // gives the tiles of a board read now, and so do the totals worked out from them, for the farm and
    // for every farm the manager sees.
    await new Promise((r) => setTimeout(r, 500));
    const after = await board(manager);
    const folded = before.farms.map((f) => {
      const tanks = f.tanks.map((t) => Object.assign({ ...t }, ...watch.deltas.flatMap((d) => d.farms.find((c) => c.farmId === f.farmId)?.tanks.filter((p) => p.tankId === t.tankId) ?? [])));
      return { ...f, tanks, totals: totalsOf(tanks) };
    });
    const afterA = after.farms.find((f) => f.farmId === org.farmIds[0])!;
    const foldedA = folded.find((f) => f.farmId === org.farmIds[0])!;
    expect(foldedA.tanks.map((t) => ({ ...t, daysOfCover: null }))).toEqual(afterA.tanks.map((t) => ({ ...t, daysOfCover: null })));
    expect(foldedA.totals).toEqual(afterA.totals);
    const water = (totals: StockBoard['totals']) => totals.find((t) => t.contents === 'water')!;
    const acrossFarms = totalsOf(folded.flatMap((f) => f.tanks));
    expect(water(acrossFarms).grossL).toBeCloseTo(water(after.totals).grossL, 6);
    expect(water(acrossFarms).tanks).toBe(water(after.totals).tanks);
    expect(after.stream.seq).toBeGreaterThanOrEqual(delta.seq);
  });

  it('sends a worker of farm A nothing of farm B', async () => {
    const manager = await session(org.users.manager.email);
    const worker = await session(org.users.worker.email);
    const watchAll = await open(manager.cookie);
    const watchA = await open(worker.cookie);

    await round(manager, org.farmIds[1], tankB, 800);
    await round(manager, org.farmIds[0], tankA, 650);
    await until(() => watchAll.deltas.some((d) => farmOf(d, org.farmIds[0])) && watchAll.deltas.some((d) => farmOf(d, org.farmIds[1])));
    await until(() => watchA.deltas.some((d) => farmOf(d, org.farmIds[0])));
    await new Promise((r) => setTimeout(r, 400));
    expect(watchA.deltas.flatMap((d) => d.farms.map((f) => f.farmId)).every((id) => id === org.farmIds[0])).toBe(true);
    const tile = watchA.deltas.flatMap((d) => d.farms.flatMap((f) => f.tanks)).filter((t) => t.tankId === tankA).at(-1)!;
    expect(tile.grossL).toBeCloseTo(650 * (Math.PI / 4), 6);
  });

  it('folds a burst of readings into a handful of deltas numbered one after another', async () => {
    const manager = await session(org.users.manager.email);
    const watch = await open(manager.cookie);
    const startedAt = Date.now();
    for (let i = 0; i < 20; i++) await round(manager, org.farmIds[0], tankA, 300 + i * 10);
    const windows = Math.ceil((Date.now() - startedAt) / THROTTLE_MS);
    await new Promise((r) => setTimeout(r, 600));
    expect(watch.deltas.length).toBeGreaterThan(0);
    // At most one delta per gathering window (and one for the use rates worked out afterwards).
    expect(watch.deltas.length).toBeLessThanOrEqual(Math.min(20, windows) + 2);
    expect(watch.deltas.map((d) => d.seq)).toEqual(watch.deltas.map((_, i) => watch.stream.seq + 1 + i));
    // The last delta carrying tank A has the last reading.
    const last = watch.deltas.flatMap((d) => d.farms.flatMap((f) => f.tanks)).filter((t) => t.tankId === tankA).at(-1)!;
    expect(last.grossL).toBeCloseTo(490 * (Math.PI / 4), 6);
  });

  it('cannot be made to join another farm\'s room by asking', async () => {
    const worker = await session(org.users.worker.email);
    const manager = await session(org.users.manager.email);
    const watch = await open(worker.cookie);
    watch.socket.emit('join', `farm:${org.farmIds[1]}`);
    watch.socket.emit('subscribe', { farmId: org.farmIds[1] });
    await new Promise((r) => setTimeout(r, 100));
    await round(manager, org.farmIds[1], tankB, 700);
    await new Promise((r) => setTimeout(r, 500));
    expect(watch.deltas.filter((d) => farmOf(d, org.farmIds[1]))).toEqual([]);
  });

  it('sends the tile again once a new reading\'s use rate has been worked out in the background', async () => {
    const tankC = (await makeTank(env, org, org.farmIds[0], { code: 'C' })).id;
    const manager = await session(org.users.manager.email);
    const watch = await open(manager.cookie);
    await round(manager, org.farmIds[0], tankC, 900);
    const tilesC = () => watch.deltas.flatMap((d) => d.farms.flatMap((f) => f.tanks)).filter((t) => t.tankId === tankC);
    await until(() => tilesC().some((t) => t.grossL != null));
    // The first delta goes out at once, before the rate exists (none: null in a whole tile, or not sent as unchanged); the refreshed rate follows in a later one.
    expect(tilesC().find((t) => t.grossL != null)!.useLPerDay ?? null).toBeNull();
    await until(() => tilesC().some((t) => t.useLPerDay != null));
  });
});
