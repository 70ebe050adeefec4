import { randomUUID } from 'node:crypto';
import { createServer, type Server } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { io as connect, type Socket } from 'socket.io-client';
import type { FarmBoard, StockBoard } from '@shared/schemas';
import { attachRealtime } from '../../server/realtime';
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

function open(cookie?: string): Promise<{ socket: Socket; board: StockBoard; farms: FarmBoard[] }> {
  return new Promise((resolve, reject) => {
    const socket = connect(base, { transports: ['websocket'], extraHeaders: cookie ? { cookie } : {}, reconnection: false, forceNew: true });
    sockets.push(socket);
    const farms: FarmBoard[] = [];
    socket.on('board:farms', (fs: FarmBoard[]) => farms.push(...fs));
    socket.once('board', (board: StockBoard) => resolve({ socket, board, farms }));
    socket.once('connect_error', reject);
  });
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

describe('realtime board', () => {
  let org: OrgFixture;
  let tankA: number;
  let tankB: number;
  beforeAll(async () => {
    org = await makeOrganisation(env);
    tankA = (await makeTank(env, org, org.farmIds[0], { code: 'A' })).id;
    tankB = (await makeTank(env, org, org.farmIds[1], { code: 'B' })).id;
  });

  it('refuses a socket without a signed-in session', async () => {
    await expect(open()).rejects.toThrow(/unauthenticated/);
  });

  it('pushes a farm\'s new totals to its watchers and nothing of farm B to a worker of farm A', async () => {
    const manager = await session(org.users.manager.email);
    const worker = await session(org.users.worker.email);
    const watchAll = await open(manager.cookie);
    const watchA = await open(worker.cookie);
    expect(watchA.board.farms.map((f) => f.farmId)).toEqual([org.farmIds[0]]);

    await round(manager, org.farmIds[1], tankB, 800);
    await round(manager, org.farmIds[0], tankA, 600);
    await until(() => watchAll.farms.some((f) => f.farmId === org.farmIds[0]) && watchAll.farms.some((f) => f.farmId === org.farmIds[1]));
    await until(() => watchA.farms.length > 0);
    await new Promise((r) => setTimeout(r, 400));
    expect(watchA.farms.every((f) => f.farmId === org.farmIds[0])).toBe(true);
    const tile = watchA.farms.at(-1)!.tanks.find((t) => t.tankId === tankA)!;
    expect(tile.grossL).toBeCloseTo(600 * (Math.PI / 4), 6);
  });

  it('folds a burst of readings into a handful of pushes', async () => {
    const manager = await session(org.users.manager.email);
    const watch = await open(manager.cookie);
    for (let i = 0; i < 20; i++) await round(manager, org.farmIds[0], tankA, 300 + i * 10);
    await new Promise((r) => setTimeout(r, 600));
    const pushes = watch.farms.filter((f) => f.farmId === org.farmIds[0]);
    expect(pushes.length).toBeGreaterThan(0);
    expect(pushes.length).toBeLessThan(20);
    // The last push carries the last reading.
    expect(pushes.at(-1)!.tanks.find((t) => t.tankId === tankA)!.grossL).toBeCloseTo(490 * (Math.PI / 4), 6);
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
    expect(watch.farms.filter((f) => f.farmId === org.farmIds[1])).toEqual([]);
  });

  it('pushes a farm again once a new tank reading\'s use rate has been worked out in the background', async () => {
    const tankC = (await makeTank(env, org, org.farmIds[0], { code: 'C' })).id;
    const manager = await session(org.users.manager.email);
    const watch = await open(manager.cookie);
    await round(manager, org.farmIds[0], tankC, 900);
    const tileC = (f: FarmBoard) => f.tanks.find((t) => t.tankId === tankC);
    await until(() => watch.farms.some((f) => tileC(f)?.grossL != null));
    // The first push answers at once, before the rate exists; the refreshed rate follows in a later push.
    expect(tileC(watch.farms.find((f) => tileC(f)?.grossL != null)!)!.useLPerDay).toBeNull();
    await until(() => watch.farms.some((f) => tileC(f)?.useLPerDay != null));
  });

  it('sends the whole board again when a client asks to resync', async () => {
    const manager = await session(org.users.manager.email);
    const watch = await open(manager.cookie);
    const again = new Promise<StockBoard>((r) => watch.socket.once('board', r));
    watch.socket.emit('board:resync');
    const board = await again;
    expect(board.farms.map((f) => f.farmId).sort()).toEqual([...org.farmIds].sort());
  });
});
