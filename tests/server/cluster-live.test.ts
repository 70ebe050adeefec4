// Three real server processes over one database and one Redis, behind haproxy (scripts/lib/haproxy.ts):
// a reading posted through one reaches a socket on another and the board kept on the third; a signed-out
// session's socket on another process is closed; Redis stopped for 10 s leaves the servers answering and
// the boards resync after it returns; a process killed with SIGKILL while 20 workers post rounds loses no
// acknowledged reading and its clients come back through the balancer to the board a fresh load shows;
// and when the process that builds the deltas (the lease's holder) is killed, another takes over.
// The boards are followed by the client's own board store (src/stores/board.ts) over real sockets.
import { randomUUID } from 'node:crypto';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import pino from 'pino';
import { createPinia, setActivePinia } from 'pinia';
import { io as connect, type Socket } from 'socket.io-client';
import type { BoardDelta, BoardStreamPosition, FarmBoard, RoundSubmitAnswer, StockBoard } from '@shared/schemas';
import { useBoardStore } from '@/stores/board';
import { startHaproxy, type Haproxy } from '../../scripts/lib/haproxy';
import { freePort } from '../../scripts/lib/ports';
import { startRedis, type RedisServer } from '../../scripts/lib/redis';
import { connectRedis } from '../../server/cluster/redis';
import type { Database } from '../../server/db';
import { clusterMember, type ClusterMember } from '../support/cluster-processes';
import { makeOrganisation, type OrgFixture } from '../support/fixtures';
import { Client, fixtureEnv, freshDatabase, waitFor, type DbServer } from '../support/server-process';
import { makeTank } from '../support/tanks';

const remote = vi.hoisted(() => ({ base: '', cookie: '' }));

// The board store's API module, speaking to the balancer with the signed-in cookie (a browser sends it by itself).
vi.mock('@/api/board', () => ({
  fetchBoardIfChanged: async (etag: string | null) => {
    const res = await fetch(`${remote.base}/api/board`, { headers: { cookie: remote.cookie, ...(etag ? { 'if-none-match': etag } : {}) } });
    if (res.status === 304) return { notModified: true, etag: etag! };
    if (res.status !== 200) throw new Error(`GET /api/board answered ${res.status}`);
    return { notModified: false, body: (await res.json()) as StockBoard, etag: res.headers.get('etag') };
  },
  fetchBoard: vi.fn(),
  fetchBoardHistory: vi.fn(),
}));

let dbServer: DbServer;
let db: Database;
let redis: RedisServer;
let redisDir: string;
let redisPort: number;
let members: ClusterMember[] = [];
let haproxy: Haproxy;
let balancer = '';
const sockets: Socket[] = [];

beforeAll(async () => {
  dbServer = inject('database');
  const fresh = await freshDatabase(dbServer, 'brimtest_live');
  db = fresh.db;
  redisDir = mkdtempSync(join(tmpdir(), 'brimstock-redis-'));
  redisPort = await freePort();
  redis = await startRedis({ baseDir: redisDir, port: redisPort });
  const port = await freePort();
  balancer = `http://127.0.0.1:${port}`;
  // PUBLIC_URL is the balancer's address, as npm run start:cluster sets it.
  members = await Promise.all([0, 1, 2].map(() => clusterMember(dbServer, fresh.name, redis.url, { PUBLIC_URL: balancer, PROXY_HOPS: '1' })));
  haproxy = await startHaproxy({ baseDir: mkdtempSync(join(tmpdir(), 'brimstock-haproxy-')), host: '127.0.0.1', port, serverPorts: members.map((m) => Number(new URL(m.baseUrl).port)) });
  await waitFor('the balancer', async () => ((await fetch(`${balancer}/api/health`).catch(() => null))?.status === 200 ? true : undefined), 20_000);
}, 240_000);

afterAll(async () => {
  for (const s of sockets) s.close();
  await haproxy?.stop();
  await Promise.all(members.map((m) => m.stop()));
  await redis?.stop();
  await db?.sequelize.close();
}, 60_000);

/** The same browser on another address: its cookie and token. */
function sameBrowserOn(client: Client, baseUrl: string): Client {
  const other = new Client(baseUrl);
  other.cookie = client.cookie;
  other.csrf = client.csrf;
  return other;
}

/** A round of one tank through `client`; the keys of the readings it acknowledged (stored now or before). */
async function postRound(client: Client, farmId: number, tankId: number, readingMm: number, key = randomUUID().replace(/-/g, '')): Promise<string[]> {
  const res = await client.request('POST', '/api/rounds', { farmId, entries: [{ tankId, readingMm, idempotencyKey: key }] });
  if (res.status !== 201 && res.status !== 200) return [];
  return (res.body as RoundSubmitAnswer).results.some((r) => r.status === 'stored' || r.status === 'duplicate') ? [key] : [];
}

/** A farm's tiles by tank, without days of cover (counted to the moment each board was built). */
const shown = (farms: readonly FarmBoard[]) =>
  Object.fromEntries(farms.map((f) => [f.farmId, { name: f.name, totals: f.totals, tanks: Object.fromEntries(f.tanks.map((t) => [t.tankId, { ...t, daysOfCover: null }])) }]));

/** A browser tab's board: the client's store, fed by a socket to `socketUrl` that reconnects by itself. */
async function follower(socketUrl: string, cookie: string) {
  setActivePinia(createPinia());
  const store = useBoardStore();
  const socket = connect(socketUrl, { transports: ['websocket'], extraHeaders: { cookie }, forceNew: true, reconnectionDelay: 100, reconnectionDelayMax: 500 });
  sockets.push(socket);
  let disconnects = 0;
  socket.on('disconnect', () => void disconnects++);
  socket.on('board:stream', (p: BoardStreamPosition) => store.connected(p));
  socket.on('board:delta', (d: BoardDelta) => store.applyDelta(d));
  await waitFor('the follower socket', async () => (socket.connected ? true : undefined), 10_000);
  await store.load();
  return { store, socket, disconnects: () => disconnects };
}

/** Waits until every follower's board is the one a fresh GET /api/board answers. */
async function boardsMatch(followers: Awaited<ReturnType<typeof follower>>[], client: Client, ms: number): Promise<void> {
  await waitFor(
    'the followers to show the fresh board',
    async () => {
      const fresh = (await client.request('GET', '/api/board')).body as StockBoard;
      return followers.every((f) => JSON.stringify(shown(f.store.farms)) === JSON.stringify(shown(fresh.farms))) ? true : undefined;
    },
    ms,
    200,
  );
}

/** How many of the readings under `keys` are stored. */
const storedCount = (keys: string[]) => db.models.Reading.count({ where: { idempotencyKey: keys } });

/** Established TCP connections to each port on 127.0.0.1 (from /proc/net/tcp): which process the balancer sends this machine to. */
function connectionsTo(ports: number[]): number[] {
  const rows = readFileSync('/proc/net/tcp', 'utf8').split('\n').slice(1);
  return ports.map((port) => rows.filter((row) => {
    const cols = row.trim().split(/\s+/);
    return cols[3] === '01' && Number.parseInt(cols[1]?.split(':')[1] ?? '', 16) === port;
  }).length);
}

async function orgWithTanks(count: number): Promise<{ org: OrgFixture; tanks: { id: number; farmId: number }[] }> {
  const env = fixtureEnv(db);
  const org = await makeOrganisation(env);
  const tanks: { id: number; farmId: number }[] = [];
  for (let i = 0; i < count; i++) {
    const farmId = org.farmIds[i % org.farmIds.length];
    tanks.push({ id: (await makeTank(env, org, farmId, { code: `K${i + 1}` })).id, farmId });
  }
  return { org, tanks };
}

describe('three server processes on one Redis', () => {
  it('pushes a reading posted through process A to a socket on process B within 1 s, and the board kept on C is rebuilt', async () => {
    const [a, b, c] = members;
    const { org, tanks } = await orgWithTanks(2);
    const onA = await Client.signIn(a.baseUrl, org.users.manager.email);
    const onC = sameBrowserOn(onA, c.baseUrl);
    const socket = await sameBrowserOn(onA, b.baseUrl).socket();
    sockets.push(socket);
    const deltas: BoardDelta[] = [];
    socket.on('board:delta', (d: BoardDelta) => deltas.push(d));
    // C keeps the board: asked again, it answers the same bytes (the same entity tag).
    const tagOnC = async () => (await fetch(`${c.baseUrl}/api/board`, { headers: { cookie: onC.cookie } })).headers.get('etag');
    const beforeTag = await tagOnC();
    expect(beforeTag).toMatch(/^"board-/);
    expect(await tagOnC()).toBe(beforeTag);

    const { id: tankId, farmId } = tanks[0];
    expect(await postRound(onA, farmId, tankId, 640)).toHaveLength(1);
    const answeredAt = Date.now();
    const tile = await waitFor('the delta on B', async () => deltas.flatMap((d) => d.farms.flatMap((f) => f.tanks)).find((t) => t.tankId === tankId && t.levelMm === 640), 1_000, 5);
    expect(Date.now() - answeredAt).toBeLessThan(1_000);

    const after = await fetch(`${c.baseUrl}/api/board`, { headers: { cookie: onC.cookie } });
    expect(after.status).toBe(200);
    expect(after.headers.get('etag')).not.toBe(beforeTag);
    const onBoard = ((await after.json()) as StockBoard).farms.flatMap((f) => f.tanks).find((t) => t.tankId === tankId)!;
    // The reading's own figures (the use rate may have been worked out again in the background meanwhile).
    const figures = (t: typeof tile) => ({ levelMm: t.levelMm, grossL: t.grossL, usableL: t.usableL, takenAt: t.takenAt });
    expect(figures(onBoard)).toEqual(figures(tile));
    socket.close();
  }, 60_000);

  it('closes the socket on process B of a session signed out on process A within 1 s, and refuses the session there', async () => {
    const [a, b] = members;
    const { org } = await orgWithTanks(1);
    const onA = await Client.signIn(a.baseUrl, org.users.worker.email);
    const onB = sameBrowserOn(onA, b.baseUrl);
    const socket = await onB.socket();
    sockets.push(socket);
    const closed = new Promise<number>((r) => socket.once('disconnect', () => r(Date.now())));
    expect((await onB.request('GET', '/api/auth/me')).status).toBe(200);
    expect((await onA.request('POST', '/api/auth/sign-out')).status).toBeLessThan(300);
    const signedOutAt = Date.now();
    const closedAt = await Promise.race([closed, new Promise<number>((r) => setTimeout(() => r(Infinity), 2_000))]);
    expect(closedAt - signedOutAt).toBeLessThan(1_000);
    await waitFor('B to refuse the session', async () => ((await onB.request('GET', '/api/auth/me')).status === 401 ? true : undefined), 1_000 - (Date.now() - signedOutAt), 20);
  }, 60_000);

  it('keeps answering while Redis is stopped for 10 s, then pushes again and the boards resync, with every acknowledged reading stored', async () => {
    const { org, tanks } = await orgWithTanks(4);
    const manager = await Client.signIn(balancer, org.users.manager.email);
    remote.base = balancer;
    remote.cookie = manager.cookie;
    // One board on each process's sockets.
    const followers = await Promise.all(members.map((m) => follower(m.baseUrl, manager.cookie)));
    const direct = members.map((m) => sameBrowserOn(manager, m.baseUrl));
    const acknowledged: string[] = [];
    acknowledged.push(...(await postRound(direct[0], tanks[0].farmId, tanks[0].id, 500)));
    await boardsMatch(followers, manager, 5_000);
    const refetchesBefore = followers.map((f) => f.store.refetches);

    await redis.stop();
    const stoppedAt = Date.now();
    let i = 0;
    while (Date.now() - stoppedAt < 10_000) {
      const client = direct[i % 3];
      const tank = tanks[i % tanks.length];
      const keys = await postRound(client, tank.farmId, tank.id, 300 + 10 * i);
      expect(keys, `round ${i} through process ${(i % 3) + 1} while Redis is away`).toHaveLength(1);
      acknowledged.push(...keys);
      expect((await client.request('GET', '/api/board')).status).toBe(200);
      if (i % 3 === 0) expect((await Client.signIn(members[(i / 3) % 3].baseUrl, org.users.worker.email)).cookie).not.toBe('');
      i++;
      await new Promise((r) => setTimeout(r, 400));
    }
    expect(i).toBeGreaterThan(5);

    redis = await startRedis({ baseDir: redisDir, port: redisPort });
    // A reading after Redis is back, again until the processes have reconnected and it reaches every board.
    let last = { tank: tanks[1], mm: 0 };
    await waitFor(
      'a push after Redis returned',
      async () => {
        last = { tank: tanks[1], mm: 900 + (i++ % 50) };
        acknowledged.push(...(await postRound(direct[1], last.tank.farmId, last.tank.id, last.mm)));
        await new Promise((r) => setTimeout(r, 700));
        return followers.every((f) => f.store.farms.flatMap((x) => x.tanks).some((t) => t.tankId === last.tank.id && t.levelMm === last.mm)) ? true : undefined;
      },
      30_000,
      0,
    );
    await boardsMatch(followers, manager, 10_000);
    // Each board saw a new stream (Redis came back empty, or the processes started one) and fetched again.
    followers.forEach((f, n) => expect(f.store.refetches, `follower ${n + 1}`).toBeGreaterThan(refetchesBefore[n]));
    expect(await storedCount(acknowledged)).toBe(acknowledged.length);
    for (const f of followers) f.socket.close();
  }, 120_000);

  it('loses no acknowledged reading when one of three processes is killed while 20 workers post rounds, and the clients come back through the balancer', async () => {
    const { org, tanks } = await orgWithTanks(20);
    const manager = await Client.signIn(balancer, org.users.manager.email);
    remote.base = balancer;
    remote.cookie = manager.cookie;
    const followers = await Promise.all([0, 1, 2].map(() => follower(balancer, manager.cookie)));
    const acknowledged: string[] = [];
    let attempts = 0;
    let stop = false;
    const workers = tanks.map(async (tank, w) => {
      for (let round = 0; !stop; round++) {
        attempts++;
        const keys = await postRound(manager, tank.farmId, tank.id, 200 + ((w * 37 + round * 11) % 1000)).catch(() => []);
        acknowledged.push(...keys);
        await new Promise((r) => setTimeout(r, 250));
      }
    });
    await new Promise((r) => setTimeout(r, 2_500));
    // The process the balancer sends this machine to (balance source): the workers' and the followers'.
    const ports = members.map((m) => Number(new URL(m.baseUrl).port));
    const counts = connectionsTo(ports);
    const victim = members[counts.indexOf(Math.max(...counts))];
    const ackedBeforeKill = acknowledged.length;
    victim.process.child.kill('SIGKILL');
    await new Promise((r) => setTimeout(r, 6_000));
    stop = true;
    await Promise.all(workers);

    expect(ackedBeforeKill).toBeGreaterThan(20);
    // Rounds kept being acknowledged after the kill, through the other processes.
    expect(acknowledged.length).toBeGreaterThan(ackedBeforeKill + 20);
    expect(await storedCount(acknowledged)).toBe(acknowledged.length);
    expect(attempts).toBeGreaterThanOrEqual(acknowledged.length);
    // Every board was on the killed process: each lost its socket, came back through the balancer and shows what a fresh load shows.
    await waitFor('the followers to reconnect', async () => (followers.every((f) => f.socket.connected) ? true : undefined), 15_000);
    for (const f of followers) expect(f.disconnects()).toBeGreaterThan(0);
    await boardsMatch(followers, manager, 15_000);
    members = members.filter((m) => m !== victim);
  }, 120_000);

  it('goes on pushing through another process within 5 s when the process that builds the deltas is killed', async () => {
    const { org, tanks } = await orgWithTanks(2);
    const leases = await connectRedis(redis.url, pino({ level: 'silent' }), 'test');
    try {
      const holderPid = async () => Number(String(await leases.get('brimstock:lease:board-builder')).split(':')[0]);
      // One of the running processes holds the lease (a holder killed before has had time to lapse).
      const builder = await waitFor('the lease to name a running process', async () => {
        const pid = await holderPid();
        return members.find((m) => m.process.child.pid === pid);
      }, 5_000, 100);
      const survivor = members.find((m) => m !== builder)!;
      const client = await Client.signIn(survivor.baseUrl, org.users.manager.email);
      remote.base = survivor.baseUrl;
      remote.cookie = client.cookie;
      const board = await follower(survivor.baseUrl, client.cookie);

      builder.process.child.kill('SIGKILL');
      const killedAt = Date.now();
      members = members.filter((m) => m !== builder);
      // Readings keep coming; the survivor takes the lease once the dead holder's lapses, and pushes them.
      let mm = 400;
      const tank = tanks[0];
      await waitFor(
        'a push from the new builder',
        async () => {
          mm += 5;
          await postRound(client, tank.farmId, tank.id, mm);
          await new Promise((r) => setTimeout(r, 250));
          return board.store.farms.flatMap((f) => f.tanks).some((t) => t.tankId === tank.id && t.levelMm === mm) ? true : undefined;
        },
        8_000,
        0,
      );
      expect(Date.now() - killedAt).toBeLessThan(5_000);
      expect(await holderPid()).toBe(survivor.process.child.pid);
      await boardsMatch([board], client, 5_000);
      board.socket.close();
    } finally {
      leases.destroy();
    }
  }, 60_000);
});
