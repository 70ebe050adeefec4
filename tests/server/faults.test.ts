// Faults with real processes: the server killed with SIGKILL in the middle of a logger import, its
// MariaDB killed the same way, the same file uploaded twice at one moment, and a board socket lost
// during a burst of readings. The server runs as a child process (tests/support/server-process.ts).
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { randomUUID } from 'node:crypto';
import { createServer, type Socket as TcpSocket } from 'node:net';
import mariadb from 'mariadb';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Socket } from 'socket.io-client';
import type { ImportMappingInput } from '@shared/imports';
import type { ImportProgress, LoggerImportDetail, StockBoard } from '@shared/schemas';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import type { Database } from '../../server/db';
import { HEALTH_DB_TIMEOUT_MS } from '../../server/services/health';
import { createContext } from '../../server/start';
import { ensureDatabase, startMariaDb, type MariaDbServer } from '../../scripts/lib/mariadb';
import { freePort } from '../../scripts/lib/ports';
import { makeOrganisation, type OrgFixture } from '../support/fixtures';
import { Client, fixtureEnv, freshDatabase, serverProcess, waitFor, type DbServer, type ServerProcess } from '../support/server-process';
import { makeTank } from '../support/tanks';

const L_PER_MM = Math.PI / 4; // the 1,000 mm test cylinder: π/4 · (1 m)² = 785.398 L per metre of level
const MAPPING: ImportMappingInput = { delimiter: ',', hasHeader: true, timestamp: { column: 'time', format: 'iso8601' }, value: { column: 'level_mm', kind: 'level', unit: 'mm' } };
/** Rows in the file a kill lands in: enough that the import runs for seconds, so the kill falls inside it. */
const KILL_FILE_ROWS = 80_000;

/** A level file of `n` rows a minute apart from `startIso`, levels 300–1,299 mm, with a header row. */
function levelFile(startIso: string, n: number): Buffer {
  const t0 = Date.parse(startIso);
  const lines = ['time,level_mm'];
  for (let i = 0; i < n; i++) lines.push(`${new Date(t0 + i * 60_000).toISOString()},${300 + (i % 1000)}`);
  return Buffer.from(`${lines.join('\n')}\n`, 'utf8');
}

/** One query as root over the MariaDB socket (independent of the server's and the test's pools). */
async function sql<T = Record<string, unknown>>(socketPath: string, dbName: string, text: string, params: unknown[] = []): Promise<T[]> {
  const conn = await mariadb.createConnection({ socketPath, user: 'root', database: dbName });
  try {
    return (await conn.query({ sql: text, bigIntAsNumber: true, decimalAsNumber: true }, params)) as T[];
  } finally {
    await conn.end();
  }
}

interface Stage {
  dbServer: DbServer;
  dbName: string;
  dataDir: string;
  server: ServerProcess;
  org: OrgFixture;
  /** The test's own handle, for making fixtures. */
  db: Database;
}

/** A migrated database with an organisation, and the server process over it (started). */
async function stage(dbServer: DbServer, prefix: string): Promise<Stage> {
  const { name, db } = await freshDatabase(dbServer, prefix);
  const org = await makeOrganisation(fixtureEnv(db));
  const dataDir = mkdtempSync(join(tmpdir(), 'brimstock-fault-'));
  const server = await serverProcess(dbServer, name, dataDir);
  await server.start();
  return { dbServer, dbName: name, dataDir, server, org, db };
}

const newTank = async (s: Stage, code: string) => (await makeTank(fixtureEnv(s.db), s.org, s.org.farmIds[0], { code })).id;

/** Collects the `import:progress` events a socket receives. */
function progressOf(socket: Socket): ImportProgress[] {
  const seen: ImportProgress[] = [];
  socket.on('import:progress', (p: ImportProgress) => seen.push(p));
  return seen;
}

/** Starts an upload and waits until the server says a fifth of the rows were read; the upload's promise never rejects. */
async function uploadUntilMidway(client: Client, socket: Socket, tankId: number, file: Buffer, rows: number) {
  const seen = progressOf(socket);
  const response = client.upload(tankId, 'long-logger.csv', file, MAPPING).catch((err: unknown) => ({ status: 0, body: String(err) }));
  const midway = await waitFor(
    'the import to be a fifth of the way through',
    async () => seen.find((p) => p.status === 'importing' && p.rowsRead >= rows / 5),
    40_000,
    10,
  );
  return { importId: midway.importId, rowsReadAtKill: midway.rowsRead, response };
}

const readingsOfTank = async (s: Pick<Stage, 'dbServer' | 'dbName'>, tankId: number) =>
  (await sql<{ n: number; instants: number }>(s.dbServer.socketPath, s.dbName, 'SELECT COUNT(*) AS n, COUNT(DISTINCT takenAt) AS instants FROM readings WHERE tankId = ?', [tankId]))[0];
const importRow = async (s: Pick<Stage, 'dbServer' | 'dbName'>, id: number) =>
  (await sql<{ status: string; error: string | null; rowsNew: number }>(s.dbServer.socketPath, s.dbName, 'SELECT status, error, rowsNew FROM logger_imports WHERE id = ?', [id]))[0];

describe('faults on the shared test database', () => {
  let s: Stage;
  beforeAll(async () => {
    const info = inject('database');
    s = await stage({ socketPath: info.socketPath, port: info.port, user: info.user, password: info.password }, info.prefix);
  }, 90_000);
  afterAll(async () => {
    await s?.server.stop();
    await s?.db.sequelize.close();
    if (s?.dataDir) rmSync(s.dataDir, { recursive: true, force: true });
  });

  it('rolls a file back when the server is killed mid-import, marks it failed at restart and imports every row once on retry', async () => {
    const tankId = await newTank(s, 'K9');
    const worker = await Client.signIn(s.server.baseUrl, s.org.users.worker.email);
    const socket = await worker.socket();
    const file = levelFile('2021-01-01T00:00:00Z', KILL_FILE_ROWS);
    const { importId, rowsReadAtKill, response } = await uploadUntilMidway(worker, socket, tankId, file, KILL_FILE_ROWS);
    await s.server.kill9();
    socket.close();
    expect(rowsReadAtKill).toBeLessThan(KILL_FILE_ROWS);
    expect((await response).status).toBe(0); // the connection died with the server
    // The dead server left the record saying importing; its open transaction died with its connection.
    expect((await importRow(s, importId)).status).toBe('importing');
    expect((await readingsOfTank(s, tankId)).n).toBe(0);

    await s.server.start();
    const failed = await importRow(s, importId);
    expect(failed.status).toBe('failed');
    expect(failed.error).toMatch(/server stopped while this file was being imported/);
    expect((await readingsOfTank(s, tankId)).n).toBe(0);

    // The session lives in the database, so the same client is still signed in.
    const retry = await worker.request('POST', `/api/imports/${importId}/retry`);
    expect(retry.status, JSON.stringify(retry.body)).toBe(200);
    expect(retry.body).toMatchObject({ id: importId, status: 'imported', rowsTotal: KILL_FILE_ROWS, rowsNew: KILL_FILE_ROWS, rowsDuplicate: 0, rowsRejected: 0, error: null });
    expect(await readingsOfTank(s, tankId)).toEqual({ n: KILL_FILE_ROWS, instants: KILL_FILE_ROWS });
    const again = await worker.request('POST', `/api/imports/${importId}/retry`);
    expect(again.status).toBe(409);
  }, 120_000);

  it('imports a file once and reports the other as a duplicate when it is uploaded twice at the same moment', async () => {
    const tankId = await newTank(s, 'TW');
    const worker = await Client.signIn(s.server.baseUrl, s.org.users.worker.email);
    const manager = await Client.signIn(s.server.baseUrl, s.org.users.manager.email);
    // Several rounds, each a different file sent by two people at once, so the race is run more than once.
    let total = 0;
    for (let round = 0; round < 4; round++) {
      const rows = 2_000;
      const file = levelFile(`2022-0${round + 1}-01T00:00:00Z`, rows);
      const [a, b] = await Promise.all([worker.upload(tankId, 'twice.csv', file, MAPPING), manager.upload(tankId, 'twice.csv', file, MAPPING)]);
      expect([a.status, b.status], JSON.stringify([a.body, b.body])).toEqual([201, 201]);
      const outcomes = [a, b].map((r) => (r.body as { imports: LoggerImportDetail[] }).imports[0]);
      const imported = outcomes.filter((o) => o.status === 'imported');
      const duplicate = outcomes.filter((o) => o.status === 'duplicate');
      expect(imported).toHaveLength(1);
      expect(duplicate).toHaveLength(1);
      expect(imported[0]).toMatchObject({ rowsNew: rows, rowsTotal: rows });
      expect(duplicate[0]).toMatchObject({ rowsNew: 0, duplicateOfId: imported[0].id });
      expect(duplicate[0].error).toMatch(/(being imported into this tank by another upload right now|imported into this tank already) \(import \d+/);
      total += rows;
      expect(await readingsOfTank(s, tankId)).toEqual({ n: total, instants: total });
    }
    const records = await sql<{ status: string; n: number }>(s.dbServer.socketPath, s.dbName, 'SELECT status, COUNT(*) AS n FROM logger_imports WHERE tankId = ? GROUP BY status', [tankId]);
    expect(Object.fromEntries(records.map((r) => [r.status, r.n]))).toEqual({ imported: 4, duplicate: 4 });
  }, 60_000);

  it('refuses to retry a failed import when the same file was imported into the tank since', async () => {
    const tankId = await newTank(s, 'RC');
    const worker = await Client.signIn(s.server.baseUrl, s.org.users.worker.email);
    const file = levelFile('2022-06-01T00:00:00Z', 500);
    const first = (await worker.upload(tankId, 'june.csv', file, MAPPING)).body as { imports: LoggerImportDetail[] };
    const firstId = first.imports[0].id;
    // As if that import had failed: its rows gone with the transaction, the record failed (it then holds no claim on the file).
    await sql(s.dbServer.socketPath, s.dbName, 'DELETE FROM readings WHERE importId = ?', [firstId]);
    await sql(s.dbServer.socketPath, s.dbName, "UPDATE logger_imports SET status = 'failed', rowsNew = 0 WHERE id = ?", [firstId]);
    const second = await worker.upload(tankId, 'june again.csv', file, MAPPING);
    expect((second.body as { imports: LoggerImportDetail[] }).imports[0]).toMatchObject({ status: 'imported', rowsNew: 500 });
    const retry = await worker.request('POST', `/api/imports/${firstId}/retry`);
    expect(retry.status).toBe(409);
    expect(retry.body).toEqual({ error: { code: 'already_imported', message: expect.stringMatching(/imported into this tank since \(import \d+\)/) } });
    expect((await importRow(s, firstId)).status).toBe('failed');
    expect(await readingsOfTank(s, tankId)).toEqual({ n: 500, instants: 500 });
  }, 30_000);

  it('gives a client that lost its socket during a burst of readings the right totals when it fetches the board again', async () => {
    const tanks = [await newTank(s, 'R1'), await newTank(s, 'R2'), await newTank(s, 'R3')];
    const farmId = s.org.farmIds[0];
    const manager = await Client.signIn(s.server.baseUrl, s.org.users.manager.email);
    const socket = await manager.socket();
    const pushes: number[] = [];
    socket.on('board:delta', (d: { farms: { farmId: number }[] }) => pushes.push(...d.farms.map((f) => f.farmId)));
    const last = new Map<number, number>();
    let postedWhileDown = 0;
    for (let i = 0; i < 30; i++) {
      // The socket drops its transport a third of the way into the burst and stays away until it ends.
      if (i === 10) {
        await waitFor('a first board push', async () => (pushes.length ? true : undefined), 10_000);
        const down = new Promise((r) => socket.once('disconnect', r));
        socket.io.engine.close();
        await down;
      }
      const tankId = tanks[i % 3];
      const readingMm = 200 + ((i * 37) % 1100);
      const res = await manager.request('POST', '/api/rounds', { farmId, entries: [{ tankId, readingMm, idempotencyKey: randomUUID().replace(/-/g, '') }] });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      last.set(tankId, readingMm);
      if (!socket.connected) postedWhileDown++;
    }
    expect(postedWhileDown).toBe(20);

    // Back: the socket is told where the stream stands, and the client fetches the board (deltas sent meanwhile are lost).
    const told = new Promise<{ seq: number }>((r) => socket.once('board:stream', r));
    socket.connect();
    const position = await told;
    const board = (await manager.request('GET', '/api/board')).body as StockBoard;
    socket.close();
    expect(board.stream.seq).toBeGreaterThanOrEqual(position.seq);

    const farm = board.farms.find((f) => f.farmId === farmId)!;
    for (const tankId of tanks) expect(farm.tanks.find((t) => t.tankId === tankId)!.grossL).toBeCloseTo(last.get(tankId)! * L_PER_MM, 6);
    // The farm's water total is the sum of every water tank's latest reading, as stored.
    const stored = await sql<{ grossL: number }>(s.dbServer.socketPath, s.dbName, "SELECT SUM(l.grossL) AS grossL FROM tank_latest l JOIN tanks t ON t.id = l.tankId WHERE t.farmId = ? AND t.contents = 'water' AND t.archivedAt IS NULL", [farmId]);
    const water = farm.totals.find((t) => t.contents === 'water')!;
    expect(water.grossL).toBeCloseTo(stored[0].grossL, 6);
  }, 60_000);
});

describe('faults of MariaDB itself', () => {
  let baseDir = '';
  let mariaDb: MariaDbServer | undefined;
  let s: Stage;
  let port = 0;
  const pidOf = () => Number(readFileSync(join(baseDir, 'run', 'mariadb.pid'), 'utf8').trim());
  beforeAll(async () => {
    baseDir = mkdtempSync(join(tmpdir(), 'brimstock-fault-db-'));
    port = await freePort();
    mariaDb = await startMariaDb({ baseDir, port });
    const account = { name: 'brimfault', user: 'brimfault', password: 'brimfault-pw' };
    await ensureDatabase(mariaDb.socketPath, account);
    s = await stage({ socketPath: mariaDb.socketPath, port, user: account.user, password: account.password }, account.name);
  }, 120_000);
  afterAll(async () => {
    await s?.server.stop();
    await s?.db.sequelize.close();
    await mariaDb?.stop();
    if (s?.dataDir) rmSync(s.dataDir, { recursive: true, force: true });
    if (baseDir) rmSync(baseDir, { recursive: true, force: true });
  });

  it('rolls a file back when MariaDB is killed mid-import, reports the database down meanwhile, and recovers without a restart', async () => {
    const tankId = await newTank(s, 'DB');
    const worker = await Client.signIn(s.server.baseUrl, s.org.users.worker.email);
    const socket = await worker.socket();
    const seen = progressOf(socket);
    const file = levelFile('2023-01-01T00:00:00Z', KILL_FILE_ROWS);
    const { importId, rowsReadAtKill, response } = await uploadUntilMidway(worker, socket, tankId, file, KILL_FILE_ROWS);
    process.kill(pidOf(), 'SIGKILL');
    expect(rowsReadAtKill).toBeLessThan(KILL_FILE_ROWS);

    // The upload gets a clear answer, not a hang or a stack trace.
    const answer = await response;
    expect(answer.status, JSON.stringify(answer.body)).toBe(503);
    expect(answer.body).toMatchObject({ error: { code: 'database_down' } });
    expect(JSON.stringify(answer.body)).not.toMatch(/ at |\.ts:/);
    // Health answers promptly with the database down.
    const asked = Date.now();
    const health = await fetch(`${s.server.baseUrl}/api/health`);
    expect(health.status).toBe(503);
    expect(await health.json()).toEqual({ status: 'degraded', database: 'down' });
    expect(Date.now() - asked).toBeLessThan(5_000);

    mariaDb = await startMariaDb({ baseDir, port });
    // The same server process finds the database again.
    await waitFor('health to report the database up', async () => {
      const res = await fetch(`${s.server.baseUrl}/api/health`);
      return res.status === 200 ? ((await res.json()) as { database: string }) : undefined;
    }, 40_000, 200).then((body) => expect(body).toEqual({ status: 'ok', database: 'up' }));
    // The import the dead database cut off: nothing of it kept, marked failed by the server itself.
    const failed = await waitFor('the cut-off import to be marked failed', async () => {
      const row = await importRow(s, importId);
      return row.status === 'failed' ? row : undefined;
    }, 30_000, 200);
    expect(failed.error).toMatch(/database stopped answering/);
    expect((await readingsOfTank(s, tankId)).n).toBe(0);
    await waitFor('the uploader to hear it failed', async () => seen.find((p) => p.importId === importId && p.status === 'failed'), 10_000);
    socket.close();

    const retry = await worker.request('POST', `/api/imports/${importId}/retry`);
    expect(retry.status, JSON.stringify(retry.body)).toBe(200);
    expect(retry.body).toMatchObject({ id: importId, status: 'imported', rowsTotal: KILL_FILE_ROWS, rowsNew: KILL_FILE_ROWS, rowsDuplicate: 0, error: null });
    expect(await readingsOfTank(s, tankId)).toEqual({ n: KILL_FILE_ROWS, instants: KILL_FILE_ROWS });
  }, 150_000);
});

describe('GET /api/health against a database that never answers', () => {
  it('answers 503 within its time limit when the database accepts connections but says nothing', async () => {
    // A TCP listener that takes connections and never speaks: the connector would wait its whole connect timeout.
    const held: TcpSocket[] = [];
    const silent = createServer((sock) => void held.push(sock));
    await new Promise<void>((r) => silent.listen(0, '127.0.0.1', () => r()));
    const addr = silent.address();
    const dataDir = mkdtempSync(join(tmpdir(), 'brimstock-fault-health-'));
    const ctx = createContext(loadConfig({ NODE_ENV: 'test', DB_PORT: String(typeof addr === 'object' && addr ? addr.port : 0), DATA_DIR: dataDir, LOG_LEVEL: 'silent' }));
    try {
      const app = createApp(ctx, { staticDir: join(dataDir, 'no-client') });
      const asked = Date.now();
      const res = await request(app).get('/api/health');
      const took = Date.now() - asked;
      expect(res.status).toBe(503);
      expect(res.body).toEqual({ status: 'degraded', database: 'down' });
      expect(took).toBeGreaterThanOrEqual(HEALTH_DB_TIMEOUT_MS - 50);
      expect(took).toBeLessThan(HEALTH_DB_TIMEOUT_MS + 1_500);
    } finally {
      for (const sock of held) sock.destroy();
      await new Promise((r) => silent.close(r));
      ctx.mailer.close();
      await ctx.db.sequelize.close().catch(() => undefined);
      rmSync(dataDir, { recursive: true, force: true });
    }
  }, 30_000);
});
