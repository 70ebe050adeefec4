// Ingest bench: an invented logger file (timestamp, level, temperature; BENCH_INGEST_ROWS rows, default
// 1,000,000) is imported three ways against one throwaway MariaDB, and each way is timed:
//   real path  — HTTP multipart upload to the real server process → stored file → streaming parse →
//                validation → conversion → readings in one transaction → latest reading and daily snapshots;
//   floor      — MariaDB's LOAD DATA LOCAL INFILE of the same rows, already converted, into a copy of the
//                readings table (CREATE TABLE … LIKE readings), in one transaction;
//   bulkCreate — what most code would do: read the file line by line, convert each row with the same
//                shared reader, and Sequelize bulkCreate (ignoreDuplicates) every 5,000 rows into another
//                copy, in one transaction.
// The server's peak resident memory (VmHWM of its process) is read from /proc at the end of the import.
// Run: npm run bench ingest   (BENCH_INGEST_ROWS=100000 npm run bench ingest for a quick run)
import type { ChildProcess } from 'node:child_process';
import { createReadStream, createWriteStream, mkdtempSync, openAsBlob, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { createInterface } from 'node:readline';
import { once } from 'node:events';
import mariadb from 'mariadb';
import type { ModelAttributes } from 'sequelize';
import { calibrationVersion, type TankGeometry } from '../shared/calibration/index';
import { createImportReader, importMappingSchema, type ImportMappingInput } from '../shared/imports/index';
import { tankSetupOf, type TankSetup } from '../shared/readings/index';
import { ensureDatabase, startMariaDb } from '../scripts/lib/mariadb';
import { freePort } from '../scripts/lib/ports';
import { startServerProcess } from '../scripts/lib/server-process';
import { loadConfig } from '../server/config';
import { createDatabase, migrate } from '../server/db';
import { startMailCapture } from '../server/mail/capture';
import { hashPassword } from '../server/services/passwords';
import type { BenchFigure } from './calibration';

const ROWS = Number(process.env.BENCH_INGEST_ROWS ?? 1_000_000);
const STEP_MS = 30_000;
const BULK_ROWS = 5_000;
const FLOOR_RATIO_TARGET = 2;
const RSS_TARGET_MB = 400;
const PASSWORD = 'bench-password-bench';
const GEOMETRY: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 2400, heightMm: 3000 };
const MAPPING: ImportMappingInput = {
  delimiter: ',',
  hasHeader: true,
  timestamp: { column: 'timestamp', format: 'iso8601' },
  value: { column: 'level_mm', kind: 'level', unit: 'mm' },
  temperature: { column: 'temperature_c', unit: 'C' },
};
const COLUMNS = ['organisationId', 'farmId', 'tankId', 'takenAt', 'source', 'revision', 'levelMm', 'grossL', 'usableL', 'temperatureC', 'calibrationVersion', 'enteredById', 'importId', 'note', 'idempotencyKey', 'createdAt'];

/** Writes the invented logger file as a stream (never held whole): a slow fill-and-draw cycle with noise, every 30 s up to an hour ago. */
async function writeLoggerFile(path: string, rows: number): Promise<void> {
  const out = createWriteStream(path);
  const start = Math.floor((Date.now() - 3_600_000 - rows * STEP_MS) / 1000) * 1000;
  let seed = 20261202;
  const noise = () => {
    seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
    return seed / 2 ** 32 - 0.5;
  };
  const write = async (s: string) => {
    if (!out.write(s)) await once(out, 'drain');
  };
  await write('timestamp,level_mm,temperature_c\n');
  let chunk = '';
  for (let i = 0; i < rows; i++) {
    const t = start + i * STEP_MS;
    const hours = (i * STEP_MS) / 3_600_000;
    const level = 1500 + 900 * Math.sin(hours / 36) + 4 * noise();
    const temp = 14 + 6 * Math.sin((hours / 24) * 2 * Math.PI) + 0.2 * noise();
    chunk += `${new Date(t).toISOString()},${level.toFixed(1)},${temp.toFixed(2)}\n`;
    if (chunk.length > 256 * 1024) {
      await write(chunk);
      chunk = '';
    }
  }
  await write(chunk);
  out.end();
  await once(out, 'finish');
}

const mb = (kb: number) => kb / 1024;
function procStatusKb(pid: number, field: 'VmHWM' | 'VmRSS'): number {
  const m = new RegExp(`^${field}:\\s+(\\d+) kB`, 'm').exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
  return m ? Number(m[1]) : NaN;
}

/** A tiny cookie-carrying client for the real API. */
function apiClient(baseUrl: string) {
  let cookie = '';
  let csrf = '';
  const keep = (res: Response) => {
    const set = res.headers.getSetCookie();
    if (set.length) cookie = set.map((c) => c.split(';')[0]).join('; ');
  };
  return {
    async signIn(email: string, password: string) {
      const s = await fetch(`${baseUrl}/api/auth/session`);
      keep(s);
      csrf = ((await s.json()) as { csrfToken: string }).csrfToken;
      const r = await fetch(`${baseUrl}/api/auth/sign-in`, { method: 'POST', headers: { cookie, 'x-csrf-token': csrf, 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) });
      keep(r);
      if (r.status !== 200) throw new Error(`sign-in failed: ${r.status} ${await r.text()}`);
      csrf = ((await r.json()) as { csrfToken: string }).csrfToken;
    },
    async upload(tankId: number, filePath: string) {
      const form = new FormData();
      form.set('tankId', String(tankId));
      form.set('mapping', JSON.stringify(MAPPING));
      form.set('policy', 'reject-file');
      form.set('files', await openAsBlob(filePath, { type: 'text/csv' }), 'logger-bench.csv');
      const r = await fetch(`${baseUrl}/api/imports`, { method: 'POST', headers: { cookie, 'x-csrf-token': csrf }, body: form });
      const body = await r.text();
      if (r.status !== 201) throw new Error(`upload failed: ${r.status} ${body}`);
      return JSON.parse(body) as { imports: { id: number; status: string; rowsTotal: number; rowsNew: number; rowsDuplicate: number; error: string | null }[] };
    },
  };
}

async function startServer(env: Record<string, string>): Promise<{ child: ChildProcess; lines: string[] }> {
  // BENCH_SERVER_NODE_ARGS passes options to the server's node, e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof" to see where its time goes.
  const nodeArgs = (process.env.BENCH_SERVER_NODE_ARGS ?? '').split(/\s+/).filter(Boolean);
  const lines: string[] = [];
  // Keep only the import's own summary line; request logs are dropped.
  const { child } = await startServerProcess({ env, nodeArgs, onLine: (line) => void (line.includes('logger import finished') && lines.push(line)) });
  return { child, lines };
}

/** Converts the logger file with the shared reader, row by row, handing each reading to `use`. */
async function convertFile(path: string, setup: TankSetup, use: (r: { takenAtMs: number; levelMm: number; grossL: number; usableL: number; temperatureC: number | null }) => Promise<void> | void) {
  const reader = createImportReader({ mapping: importMappingSchema.parse(MAPPING), tank: setup, nowMs: Date.now() });
  const lines = createInterface({ input: createReadStream(path, { encoding: 'utf8' }), crlfDelay: Infinity });
  for await (const line of lines) {
    const r = reader.feed(line.split(','));
    if (r.kind === 'reading') await use(r.reading);
    else if (r.kind === 'rejected' || r.kind === 'fatal') throw new Error(`bench file row refused: ${JSON.stringify(r)}`);
  }
}

const sqlDate = (ms: number) => {
  const s = new Date(ms).toISOString();
  return `${s.slice(0, 10)} ${s.slice(11, 23)}`;
};

export async function runIngestBench(): Promise<BenchFigure[]> {
  if (!Number.isInteger(ROWS) || ROWS < 1000) throw new Error('BENCH_INGEST_ROWS must be a whole number of at least 1,000');
  const dir = mkdtempSync(join(process.env.DATA_DIR ? resolve(process.env.DATA_DIR) : tmpdir(), 'brimstock-ingest-'));
  const db = await startMariaDb({ baseDir: dir, port: await freePort() });
  const port = await freePort();
  const smtpPort = await freePort();
  const env: Record<string, string> = {
    ...(process.env as Record<string, string>),
    NODE_ENV: 'production',
    HOST: '127.0.0.1',
    PORT: String(port),
    DATA_DIR: dir,
    CLIENT_DIR: join(dir, 'no-client'),
    DB_PORT: String(db.port),
    DB_SOCKET: db.socketPath,
    DB_NAME: 'brimstock_bench',
    SMTP_PORT: String(smtpPort),
    LOG_LEVEL: 'info',
    SESSION_SECRET: 'bench-secret-bench-secret-bench-secret',
  };
  const config = loadConfig(env);
  const mail = await startMailCapture({ port: smtpPort, outboxDir: config.outboxDir });
  let server: ChildProcess | undefined;
  const database = createDatabase(config);
  const figures: BenchFigure[] = [];
  // Side figures are printed as they come, so a run that breaks off still shows how far it got.
  const extra = { push: (line: string) => console.log(`  ${line}`) };
  let phase = 'set-up';
  try {
    await ensureDatabase(db.socketPath, config.db);
    await migrate(database.sequelize);
    const { Organisation, Farm, User, Tank, TankCalibration, TankContentsPeriod, Reading } = database.models;
    const org = await Organisation.create({ name: 'Bench co-op' });
    const farm = await Farm.create({ organisationId: org.id, name: 'Bench farm', timeZone: 'Europe/Dublin', location: '', archivedAt: null });
    const email = 'manager@bench.example';
    await User.create({ organisationId: org.id, email, name: 'Bench manager', role: 'manager', passwordHash: await hashPassword(PASSWORD), lastSignInAt: null });
    const version = calibrationVersion(GEOMETRY, 0);
    const tank = await Tank.create({
      organisationId: org.id, farmId: farm.id, name: 'Bench tank', code: 'BT', contents: 'water', contentsNote: '', geometry: GEOMETRY, datumOffsetMm: 0, outletHeightMm: 100,
      safeFillLevelMm: 2900, lowStockL: 200, specificGravity: 1, sensorHeightMm: null, walkOrder: 0, calibrationVersion: version, archivedAt: null,
    });
    await TankCalibration.create({ organisationId: org.id, tankId: tank.id, version, geometry: GEOMETRY, datumOffsetMm: 0 });
    await TankContentsPeriod.create({ organisationId: org.id, tankId: tank.id, contents: 'water', contentsNote: '', specificGravity: 1, fromAt: new Date(Date.now() - 5 * 365 * 86_400_000), toAt: null, changedById: null });

    const loggerFile = join(dir, 'logger.csv');
    let t0 = performance.now();
    await writeLoggerFile(loggerFile, ROWS);
    const fileMb = statSync(loggerFile).size / 1_048_576;
    extra.push(`generated ${ROWS.toLocaleString('en-US')} rows (${fileMb.toFixed(1)} MB) in ${((performance.now() - t0) / 1000).toFixed(1)} s`);

    // 1. The real path, through the server process.
    phase = 'real path';
    const started = await startServer(env);
    server = started.child;
    const api = apiClient(`http://127.0.0.1:${port}`);
    await api.signIn(email, PASSWORD);
    const rssBeforeMb = mb(procStatusKb(server.pid!, 'VmRSS'));
    t0 = performance.now();
    const { imports } = await api.upload(tank.id, loggerFile);
    const realS = (performance.now() - t0) / 1000;
    const peakMb = mb(procStatusKb(server.pid!, 'VmHWM'));
    const [imp] = imports;
    if (imp.status !== 'imported' || imp.rowsNew !== ROWS) throw new Error(`real import ended ${imp.status} with ${imp.rowsNew} new rows: ${imp.error}`);
    const stored = await Reading.count({ where: { tankId: tank.id } });
    const days = await database.models.TankDay.count({ where: { tankId: tank.id } });
    if (stored !== ROWS) throw new Error(`real import stored ${stored} rows, expected ${ROWS}`);
    extra.push(`real path: import ${imp.id} ${imp.status}, ${imp.rowsNew.toLocaleString('en-US')} new rows, ${days} daily snapshots; server RSS before upload ${rssBeforeMb.toFixed(0)} MB`);
    await new Promise((r) => setTimeout(r, 200));
    for (const line of started.lines) {
      const log = JSON.parse(line) as { timings?: Record<string, number> };
      const t = log.timings;
      if (!t) continue;
      const s = (ms: number) => `${(ms / 1000).toFixed(1)} s`;
      extra.push(`real path split: upload, store, content check, hash and bookkeeping ${s(realS * 1000 - t.totalMs)}; import ${s(t.totalMs)}, of which`);
      extra.push(`  reading the file (parse, validate, convert, format rows) ${s(t.readMs - t.waitForDatabaseMs)} busy + ${s(t.waitForDatabaseMs)} waiting for MariaDB to take a chunk;`);
      extra.push(`  MariaDB busy on the LOAD DATA chunks ${s(t.loadStatementsMs)} (alongside the reading); after the last row: last chunk, snapshots (${s(t.snapshotsMs)}) and commit ${s(t.totalMs - t.readMs)}`);
    }
    server.kill('SIGTERM');
    await new Promise((r) => (server!.exitCode === null ? server!.once('exit', r) : r(null)));
    server = undefined;

    // 2. The floor: the same rows, converted beforehand, loaded by MariaDB itself.
    phase = 'floor';
    const setup = tankSetupOf(tank);
    const floorFile = join(dir, 'floor.tsv');
    const out = createWriteStream(floorFile);
    const now = sqlDate(Date.now());
    let buf = '';
    await convertFile(loggerFile, setup, async (r) => {
      buf += `${org.id}\t${farm.id}\t${tank.id}\t${sqlDate(r.takenAtMs)}\tlogger\t0\t${r.levelMm}\t${r.grossL}\t${r.usableL}\t${r.temperatureC ?? '\\N'}\t${version}\t\\N\t\\N\t\t\\N\t${now}\n`;
      if (buf.length > 256 * 1024) {
        if (!out.write(buf)) await once(out, 'drain');
        buf = '';
      }
    });
    out.end(buf);
    await once(out, 'finish');
    await database.sequelize.query('CREATE TABLE readings_floor LIKE readings');
    // A file over 16 MB goes to the server in several full-size packets; the stock limit refuses them.
    const admin = await mariadb.createConnection({ socketPath: db.socketPath, user: 'root' });
    await admin.query('SET GLOBAL max_allowed_packet = 1073741824');
    await admin.end();
    const conn = await mariadb.createConnection({ host: '127.0.0.1', port: db.port, user: config.db.user, password: config.db.password, database: config.db.name, permitLocalInfile: true });
    let floorS: number;
    try {
      t0 = performance.now();
      await conn.beginTransaction();
      const res = (await conn.query(`LOAD DATA LOCAL INFILE '${floorFile}' IGNORE INTO TABLE readings_floor FIELDS TERMINATED BY '\\t' LINES TERMINATED BY '\\n' (${COLUMNS.join(',')})`)) as { affectedRows: number };
      await conn.commit();
      floorS = (performance.now() - t0) / 1000;
      if (res.affectedRows !== ROWS) throw new Error(`floor loaded ${res.affectedRows} rows, expected ${ROWS}`);
      extra.push(`floor: ${floorS.toFixed(1)} s; real path so far ${((realS / floorS) * 100).toFixed(0)} % of it`);
    } finally {
      await conn.end();
    }

    // 3. Plain bulkCreate, in batches of 5,000, after the same line-by-line conversion.
    phase = 'bulkCreate';
    await database.sequelize.query('CREATE TABLE readings_bulk LIKE readings');
    const ReadingBulk = database.sequelize.define('ReadingBulk', Reading.getAttributes() as ModelAttributes, { tableName: 'readings_bulk', updatedAt: false });
    let insertMs = 0;
    t0 = performance.now();
    await database.sequelize.transaction(async (transaction) => {
      let batch: Record<string, unknown>[] = [];
      const flush = async () => {
        const s = performance.now();
        await ReadingBulk.bulkCreate(batch, { transaction, ignoreDuplicates: true });
        insertMs += performance.now() - s;
        batch = [];
      };
      await convertFile(loggerFile, setup, async (r) => {
        batch.push({ organisationId: org.id, farmId: farm.id, tankId: tank.id, takenAt: new Date(r.takenAtMs), source: 'logger', revision: 0, levelMm: r.levelMm, grossL: r.grossL, usableL: r.usableL, temperatureC: r.temperatureC, calibrationVersion: version, enteredById: null, importId: null, note: '', idempotencyKey: null });
        if (batch.length >= BULK_ROWS) await flush();
      });
      if (batch.length) await flush();
    });
    const bulkS = (performance.now() - t0) / 1000;
    const bulkStored = await ReadingBulk.count();
    if (bulkStored !== ROWS) throw new Error(`bulkCreate stored ${bulkStored} rows, expected ${ROWS}`);
    extra.push(`bulkCreate: ${(insertMs / 1000).toFixed(1)} s of its ${bulkS.toFixed(1)} s inside bulkCreate calls, the rest reading and converting`);

    const n = ROWS.toLocaleString('en-US');
    const rate = (s: number) => ROWS / s;
    const realOk = realS <= floorS * FLOOR_RATIO_TARGET;
    figures.push({ name: `real path (HTTP upload → stored file → parse → convert → load → snapshots), ${n} rows`, value: rate(realS), unit: 'rows/s', target: rate(floorS * FLOOR_RATIO_TARGET), pass: 'above', ok: realOk });
    figures.push({ name: `floor (reference): LOAD DATA LOCAL INFILE of the converted rows, ${n} rows`, value: rate(floorS), unit: 'rows/s', target: 0, pass: 'above', ok: true });
    figures.push({ name: `Sequelize bulkCreate per ${BULK_ROWS.toLocaleString('en-US')} rows after line-by-line conversion, ${n} rows (target: slower than the real path)`, value: rate(bulkS), unit: 'rows/s', target: rate(realS), pass: 'below', ok: bulkS > realS });
    figures.push({ name: 'real path time (target: 2 × floor time)', value: realS * 1000, unit: 'ms', target: floorS * FLOOR_RATIO_TARGET * 1000, pass: 'below', ok: realOk });
    figures.push({ name: 'floor time (reference)', value: floorS * 1000, unit: 'ms', target: 0, pass: 'above', ok: true });
    figures.push({ name: 'bulkCreate time (target: longer than the real path)', value: bulkS * 1000, unit: 'ms', target: realS * 1000, pass: 'above', ok: bulkS > realS });
    figures.push({ name: 'real path time as % of floor time (aim 150 %)', value: (realS / floorS) * 100, unit: '%', target: FLOOR_RATIO_TARGET * 100, pass: 'below', ok: realOk });
    figures.push({ name: 'real path time as % of bulkCreate time', value: (realS / bulkS) * 100, unit: '%', target: 100, pass: 'below', ok: realS < bulkS });
    figures.push({ name: 'server peak resident memory (VmHWM) at the end of the import', value: peakMb, unit: 'MB', target: RSS_TARGET_MB, pass: 'below', ok: peakMb < RSS_TARGET_MB });
    return figures;
  } catch (err) {
    throw new Error(`ingest bench broke off in the ${phase} phase: ${err instanceof Error ? err.message : String(err)}`, { cause: err });
  } finally {
    if (server) {
      server.kill('SIGTERM');
      await new Promise((r) => (server!.exitCode === null ? server!.once('exit', r) : r(null)));
    }
    await database.sequelize.close().catch(() => undefined);
    await mail.close();
    await db.stop();
    if (!process.env.BENCH_KEEP) rmSync(dir, { recursive: true, force: true });
  }
}
