// A real MariaDB primary and GTID replica on loopback (tests/support/replica.ts): what reaches the
// replica, which reads go to it, the GTID wait that keeps a worker's just-sent reading in their
// answers, and the fall-back to the primary while the replica is stopped or not replicating.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';
import { call, makeOrganisation, signedIn, type Agent } from '../support/fixtures';
import { replicaApp, useReplicaPair, waitFor, type ReplicaApp } from '../support/replica';
import { makeTank } from '../support/tanks';

const pair = useReplicaPair();
const key = () => randomUUID().replace(/-/g, '');
type Tile = { tankId: number; levelMm: number | null; usableL: number | null };
const tileOf = (board: { farms: { tanks: Tile[] }[] }, tankId: number) => board.farms.flatMap((f) => f.tanks).find((t) => t.tankId === tankId);

/** A farm with one tank and a signed-in worker on `app`. */
async function farmWithTank(app: ReplicaApp) {
  const org = await makeOrganisation(app, { farms: 1 });
  const tank = await makeTank(app, org, org.farmIds[0], { code: 'R1' });
  const worker = await signedIn(app, org.users.worker.email);
  return { org, tank, worker };
}
const sendRound = (worker: Agent, farmId: number, tankId: number, readingMm: number) =>
  call(worker, 'post', '/api/rounds', { farmId, entries: [{ tankId, readingMm, idempotencyKey: key() }] }).expect(201);

/** Until the replica has applied everything the primary has logged. */
async function caughtUp(): Promise<number> {
  const [{ pos }] = await pair.sql<{ pos: string }[]>('primary', 'SELECT @@gtid_binlog_pos AS pos');
  return waitFor(async () => (await pair.sql<{ pos: string }[]>('replica', 'SELECT @@gtid_slave_pos AS pos'))[0].pos === pos, 5_000, `replica reaching ${pos}`);
}

describe('the replica settings', () => {
  it.each([
    ['DB_REPLICAS', { DB_REPLICAS: 'db2.internal' }, /DB_REPLICAS: host:port of each read replica/],
    ['DB_REPLICAS port', { DB_REPLICAS: 'db2.internal:70000' }, /DB_REPLICAS: port 70000 of db2.internal:70000/],
    ['DB_REPLICA_PORT', { DB_REPLICA_PORT: 'three' }, /DB_REPLICA_PORT/],
  ])('refuses a bad %s, naming it', (_name, env, message) => {
    expect(() => loadConfig(env)).toThrow(message);
  });

  it('lists DB_REPLICAS and then DB_REPLICA_PORT on DB_HOST, once each', () => {
    const config = loadConfig({ DB_HOST: '10.0.0.5', DB_REPLICAS: '10.0.0.6:3306, 10.0.0.7:3307', DB_REPLICA_PORT: '3308' });
    expect(config.db.replicas.hosts).toEqual([{ host: '10.0.0.6', port: 3306 }, { host: '10.0.0.7', port: 3307 }, { host: '10.0.0.5', port: 3308 }]);
    expect(loadConfig({}).db.replicas.hosts).toEqual([]);
  });
});

describe('MariaDB replica (GTID)', () => {
  let app: ReplicaApp;
  beforeAll(async () => {
    app = await replicaApp(pair, { DB_REPLICA_CHECK_SECONDS: '0.2' });
    await waitFor(() => app.ctx.db.replicas!.states()[0].usable, 5_000, 'replica usable');
  });
  afterAll(() => app?.close());

  it('applies a round stored on the primary, at the same GTID position', async () => {
    const { org, tank, worker } = await farmWithTank(app);
    const sent = performance.now();
    await sendRound(worker, org.farmIds[0], tank.id, 640);
    const lagMs = await waitFor(async () => (await pair.sql<{ levelMm: number }[]>('replica', 'SELECT levelMm FROM tank_latest WHERE tankId = ?', [tank.id]))[0]?.levelMm === 640, 5_000, 'the round on the replica');
    await caughtUp();
    const [p] = await pair.sql<{ pos: string; mode: number }[]>('primary', 'SELECT @@gtid_binlog_pos AS pos, @@gtid_strict_mode AS mode');
    const [r] = await pair.sql<{ pos: string; ro: number }[]>('replica', 'SELECT @@gtid_slave_pos AS pos, @@read_only AS ro');
    expect(r.pos).toBe(p.pos);
    expect(Number(p.mode)).toBe(1);
    expect(Number(r.ro)).toBe(1);
    console.log(`replication: a round seen on the replica ${lagMs.toFixed(0)} ms after it was stored (${(performance.now() - sent).toFixed(0)} ms after sending)`);
  });

  it('refuses the application account a write on the replica', async () => {
    const replicaOnly = await import('mariadb').then((m) => m.default.createConnection({ host: '127.0.0.1', port: pair.replicaPort, user: app.config.db.user, password: app.config.db.password, database: app.config.db.name }));
    try {
      await expect(replicaOnly.query('UPDATE tanks SET name = name')).rejects.toThrow(/read-only/);
    } finally {
      await replicaOnly.end();
    }
  });

  it('answers the board and its history from the replica, and a tank page from the primary', async () => {
    const { org, tank, worker } = await farmWithTank(app);
    await sendRound(worker, org.farmIds[0], tank.id, 900);
    await caughtUp();
    // A figure only the replica holds (not logged, so never replicated): whoever shows it read the replica.
    const setReplicaOnly = (usableL: number) => pair.sql('replica', 'UPDATE tank_latest SET usableL = ? WHERE tankId = ?', [usableL, tank.id], { unlogged: true });
    const [{ usableL: stored }] = await pair.sql<{ usableL: number }[]>('primary', 'SELECT usableL FROM tank_latest WHERE tankId = ?', [tank.id]);
    await setReplicaOnly(12_345);
    try {
      const before = { ...app.ctx.db.replicas!.counts };
      const board = (await worker.get('/api/board').expect(200)).body;
      expect(tileOf(board, tank.id)?.usableL).toBe(12_345);
      const history = (await worker.get('/api/board/history').expect(200)).body;
      expect(history.days).toHaveLength(14);
      expect(app.ctx.db.replicas!.counts.replica).toBeGreaterThan(before.replica);
      // The tank page is not a replica route: none of its reads go there or fall back from there.
      const counts = { ...app.ctx.db.replicas!.counts };
      await worker.get(`/api/tanks/${tank.id}`).expect(200);
      expect(app.ctx.db.replicas!.counts).toEqual(counts);
      expect(stored).not.toBe(12_345);
    } finally {
      await setReplicaOnly(stored);
    }
  });

  it('stops using a stopped replica within a check, keeps answering from the primary, and returns to it once it replicates again', async () => {
    const { org, tank, worker } = await farmWithTank(app);
    await sendRound(worker, org.farmIds[0], tank.id, 500);
    await caughtUp();
    const warningsBefore = app.warnings.length;
    let stopped = false;
    const stopping = pair.stopReplica().then(() => void (stopped = true));
    // Reads keep answering while it goes down (the history is never kept, so each one queries): through the
    // per-query fall-back, then the watch. None fails and none is slow.
    let answered = 0;
    let slowestMs = 0;
    const reading = (async () => {
      while (!stopped) {
        const t = performance.now();
        const history = (await worker.get('/api/board/history').expect(200)).body;
        slowestMs = Math.max(slowestMs, performance.now() - t);
        expect(history.days).toHaveLength(14);
        answered++;
      }
    })();
    const fallbackMs = await waitFor(() => !app.ctx.db.replicas!.states()[0].usable, 10_000, 'the watch noticing the stopped replica');
    await stopping;
    await reading;
    expect(answered).toBeGreaterThan(0);
    expect(slowestMs).toBeLessThan(5_000);
    const counts = { ...app.ctx.db.replicas!.counts };
    // A round while it is away: stored on the primary, shown on the board at once.
    await sendRound(worker, org.farmIds[0], tank.id, 720);
    const board = (await worker.get('/api/board').expect(200)).body;
    expect(tileOf(board, tank.id)?.levelMm).toBe(720);
    expect(app.ctx.db.replicas!.counts.replica).toBe(counts.replica);
    expect(app.ctx.db.replicas!.counts.fallback).toBeGreaterThan(counts.fallback);
    // One warning for the change, however many checks found it down.
    await new Promise((r) => setTimeout(r, 600));
    expect(app.warnings.slice(warningsBefore)).toEqual([expect.stringMatching(/out of use/)]);

    const restarting = pair.startReplica();
    const returnMs = await waitFor(() => app.ctx.db.replicas!.states()[0].usable, 15_000, 'the replica back in use');
    await restarting;
    // It caught up with the round sent while it was away, and the board reads it again.
    await caughtUp();
    const [row] = await pair.sql<{ levelMm: number }[]>('replica', 'SELECT levelMm FROM tank_latest WHERE tankId = ?', [tank.id]);
    expect(row.levelMm).toBe(720);
    const back = app.ctx.db.replicas!.counts.replica;
    expect(tileOf((await worker.get('/api/board').expect(200)).body, tank.id)?.levelMm).toBe(720);
    expect(app.ctx.db.replicas!.counts.replica).toBeGreaterThan(back);
    expect(app.warnings.slice(warningsBefore)).toEqual([expect.stringMatching(/out of use/), expect.stringMatching(/replicating again/)]);
    console.log(`fall-back: the watch left the replica ${fallbackMs.toFixed(0)} ms after its shutdown began; ${answered} history reads answered during the shutdown, the slowest in ${slowestMs.toFixed(0)} ms; back in use ${returnMs.toFixed(0)} ms after starting its server again`);
  }, 40_000);

  it('leaves a replica lagging over its bound (MASTER_DELAY of 5 s against the default 2 s) and takes it back once it has caught up', async () => {
    const { org, tank, worker } = await farmWithTank(app);
    await caughtUp();
    const delay = async (s: number) => {
      await pair.sql('replica', 'STOP SLAVE');
      await pair.sql('replica', `CHANGE MASTER TO MASTER_DELAY = ${s}`);
      await pair.sql('replica', 'START SLAVE');
    };
    await delay(5);
    try {
      await waitFor(() => app.ctx.db.replicas!.states()[0].usable, 5_000, 'the delayed replica replicating');
      await sendRound(worker, org.farmIds[0], tank.id, 450);
      const leftMs = await waitFor(() => !app.ctx.db.replicas!.states()[0].usable, 10_000, 'the watch leaving the lagging replica');
      expect(app.ctx.db.replicas!.states()[0].reason).toMatch(/^[3-9] s behind the primary, over the bound of 2 s$/);
      // Meanwhile the board answers from the primary, with the round.
      expect(tileOf((await worker.get('/api/board').expect(200)).body, tank.id)?.levelMm).toBe(450);
      const backMs = await waitFor(() => app.ctx.db.replicas!.states()[0].usable, 10_000, 'the replica back within its bound');
      console.log(`lag bound: a replica 5 s behind left reads ${leftMs.toFixed(0)} ms after the round, and came back ${backMs.toFixed(0)} ms later`);
    } finally {
      await delay(0);
    }
    await waitFor(() => app.ctx.db.replicas!.states()[0].usable, 10_000, 'the replica usable without delay');
  }, 30_000);

  it('leaves a replica whose replication stopped (STOP SLAVE SQL_THREAD) and takes it back after START SLAVE', async () => {
    await pair.sql('replica', 'STOP SLAVE SQL_THREAD');
    try {
      await waitFor(() => !app.ctx.db.replicas!.states()[0].usable, 5_000, 'the watch leaving the paused replica');
      expect(app.ctx.db.replicas!.states()[0].reason).toMatch(/SQL thread No/);
    } finally {
      await pair.sql('replica', 'START SLAVE SQL_THREAD');
    }
    await waitFor(() => app.ctx.db.replicas!.states()[0].usable, 5_000, 'the replica back in use');
  });
});

describe('read-your-writes through the GTID wait', () => {
  // Checks a minute apart: the watch still counts the replica usable after it pauses, so only the wait protects the reader.
  let app: ReplicaApp;
  beforeAll(async () => {
    app = await replicaApp(pair, { DB_REPLICA_CHECK_SECONDS: '60', DB_REPLICA_WAIT_SECONDS: '0.3' });
    await waitFor(() => app.ctx.db.replicas!.states()[0].usable, 5_000, 'replica usable');
  });
  afterAll(() => app?.close());

  it("shows the worker the reading they just sent while replication is paused, and the replica's copy once it has it", async () => {
    const { org, tank, worker } = await farmWithTank(app);
    await sendRound(worker, org.farmIds[0], tank.id, 610);
    await caughtUp();
    expect(tileOf((await worker.get('/api/board').expect(200)).body, tank.id)?.levelMm).toBe(610);

    await pair.sql('replica', 'STOP SLAVE SQL_THREAD');
    try {
      await sendRound(worker, org.farmIds[0], tank.id, 830);
      const [onReplica] = await pair.sql<{ levelMm: number }[]>('replica', 'SELECT levelMm FROM tank_latest WHERE tankId = ?', [tank.id]);
      expect(onReplica.levelMm).toBe(610);
      expect(app.ctx.db.replicas!.states()[0].usable).toBe(true);
      const before = { ...app.ctx.db.replicas!.counts };
      const started = performance.now();
      const board = (await worker.get('/api/board').expect(200)).body;
      const waitedMs = performance.now() - started;
      expect(tileOf(board, tank.id)?.levelMm).toBe(830);
      expect(waitedMs).toBeGreaterThanOrEqual(300);
      // A replica that missed the wait is left at once, so the next request does not wait again.
      expect(app.ctx.db.replicas!.states()[0]).toMatchObject({ usable: false, reason: "it did not reach the primary's position within 300 ms" });
      const readingsAt = performance.now();
      const series = (await worker.get(`/api/tanks/${tank.id}/readings`).expect(200)).body;
      expect(performance.now() - readingsAt).toBeLessThan(300);
      expect(JSON.stringify(series)).toContain('830');
      const after = app.ctx.db.replicas!.counts;
      expect(after.waitTimeouts).toBe(before.waitTimeouts + 1);
      expect(after.fallback).toBeGreaterThan(before.fallback);
      console.log(`read-your-writes: the board waited ${waitedMs.toFixed(0)} ms (wait bound 300 ms) for the paused replica, then answered from the primary`);
    } finally {
      await pair.sql('replica', 'START SLAVE SQL_THREAD');
    }
    await caughtUp();
    // Its next check (a minute away here; asked for now) finds it at 0 s behind and takes it back.
    await app.ctx.db.replicas!.check();
    expect(app.ctx.db.replicas!.states()[0].usable).toBe(true);
    const before = app.ctx.db.replicas!.counts.replica;
    expect(tileOf((await worker.get('/api/board').expect(200)).body, tank.id)?.levelMm).toBe(830);
    expect(app.ctx.db.replicas!.counts.replica).toBeGreaterThan(before);
  });
});
