// Board and round load bench. On a throwaway MariaDB and the real server process (production
// settings, warn-level logs, 127.0.0.1 only) with 1 organisation, 50 farms × 20 tanks and
// 5,000,000 logger readings (BENCH_BOARD_READINGS shrinks it for a quick run):
//  (a) autocannon on GET /api/board as a signed-in manager, 50 connections for 20 s;
//  (b) 100 simulated workers posting rounds for 30 s while 200 socket.io clients watch the board:
//      errors, acknowledged vs stored readings, and the time from a reading's insert to its push
//      reaching each watching client.
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import autocannon from 'autocannon';
import mariadb from 'mariadb';
import { QueryTypes } from 'sequelize';
import { calibrationVersion, type TankGeometry } from '../shared/calibration/index';
import { readingToVolumes } from '../shared/readings/index';
import { ensureDatabase, startMariaDb, type MariaDbServer } from '../scripts/lib/mariadb';
import { freePort } from '../scripts/lib/ports';
import { startServerProcess } from '../scripts/lib/server-process';
import { loadConfig } from '../server/config';
import { createDatabase, migrate } from '../server/db';
import { startMailCapture } from '../server/mail/capture';
import { hashPassword } from '../server/services/passwords';
import type { BenchFigure } from './calibration';
import type { FromWatchers } from './board-watchers';

const FARMS = 50;
const TANKS_PER_FARM = 20;
const WORKERS = 100;
const WATCHERS = 200;
/** Manager sessions the watching sockets share (10 sockets per session). */
const WATCHER_SESSIONS = 20;
const BOARD_CONNECTIONS = 50;
const BOARD_SECONDS = 20;
const ROUND_SECONDS = 30;
/** A worker's pause between two rounds (ms); override with BENCH_BOARD_THINK_MS. */
const THINK_MS = Number(process.env.BENCH_BOARD_THINK_MS ?? 1000);
const READINGS = Number(process.env.BENCH_BOARD_READINGS ?? 5_000_000);
/** Logger interval of the fixture readings. */
const STEP_S = 15 * 60;
/** A draw cycle: a tank is drawn from full to 300 mm over 7 days of logger readings, then refilled. */
const CYCLE = (7 * 86_400) / STEP_S;
const OUTLET_MM = 100;
const PASSWORD = 'bench-password-bench';

const BOARD_P99_MS = 50;
const PUSH_P95_MS = 250;

const root = resolve(import.meta.dirname, '..');
const log = (msg: string) => console.error(`  [board] ${new Date().toISOString().slice(11, 19)} ${msg}`);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

interface BenchTank {
  id: number;
  farmId: number;
  geometry: Extract<TankGeometry, { shape: 'vertical-cylinder' }>;
  safeFillLevelMm: number;
  /** Litres per mm of level (a vertical cylinder is linear). */
  lPerMm: number;
}

/** Cookie header and CSRF token of a signed-in session. */
interface Session {
  cookie: string;
  csrf: string;
}

function cookiesOf(res: Response): string {
  return res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
}

async function signIn(base: string, email: string): Promise<Session> {
  const first = await fetch(`${base}/api/auth/session`);
  const { csrfToken } = (await first.json()) as { csrfToken: string };
  const res = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', cookie: cookiesOf(first), 'x-csrf-token': csrfToken },
    body: JSON.stringify({ email, password: PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${await res.text()}`);
  const body = (await res.json()) as { csrfToken: string };
  return { cookie: cookiesOf(res), csrf: body.csrfToken };
}

/** Runs `fn` over `items` with at most `n` at a time. */
async function pool<T, R>(items: T[], n: number, fn: (item: T) => Promise<R>): Promise<R[]> {
  const out: R[] = new Array(items.length);
  let next = 0;
  await Promise.all(Array.from({ length: n }, async () => {
    while (next < items.length) {
      const i = next++;
      out[i] = await fn(items[i]);
    }
  }));
  return out;
}

const sqlTime = (d: Date) => d.toISOString().replace('T', ' ').replace('Z', '');

/**
 * Builds the fixture with set-based SQL: organisation, farms, users, tanks (with calibration and
 * contents rows), the logger readings from MariaDB's sequence engine, then tank_latest and
 * tank_days from those readings. Returns the tanks and the users' e-mails.
 */
async function buildFixture(socketPath: string, dbName: string, perTank: number) {
  const conn = await mariadb.createConnection({ socketPath, user: 'root', database: dbName, timezone: 'Z', multipleStatements: false });
  try {
    await conn.query("SET time_zone = '+00:00'");
    const now = new Date();
    const hash = await hashPassword(PASSWORD);
    const org = await conn.query('INSERT INTO organisations (name, createdAt, updatedAt) VALUES (?, ?, ?)', ['Lowland growers bench co-op', now, now]);
    const organisationId = Number(org.insertId);
    const farmIds: number[] = [];
    for (let f = 0; f < FARMS; f++) {
      // UTC farms, so a reading's local day is its UTC date and tank_days can be filled in SQL.
      const r = await conn.query('INSERT INTO farms (organisationId, name, timeZone, location, archivedAt, createdAt, updatedAt) VALUES (?, ?, ?, ?, NULL, ?, ?)', [organisationId, `Bench farm ${String(f + 1).padStart(2, '0')}`, 'UTC', '', now, now]);
      farmIds.push(Number(r.insertId));
    }
    const user = async (email: string, role: string) =>
      Number((await conn.query('INSERT INTO users (organisationId, email, name, role, passwordHash, active, unitSystem, lastSignInAt, createdAt, updatedAt) VALUES (?, ?, ?, ?, ?, 1, ?, NULL, ?, ?)', [organisationId, email, email.split('@')[0], role, hash, 'metric', now, now])).insertId);
    const managers: string[] = [];
    for (let i = 0; i <= WATCHER_SESSIONS; i++) {
      managers.push(`manager-${i}@bench.example`);
      await user(managers[i], 'manager');
    }
    const workers: { email: string; farmIndex: number; half: number }[] = [];
    for (let w = 0; w < WORKERS; w++) {
      const email = `worker-${w}@bench.example`;
      const farmIndex = Math.floor(w / 2) % FARMS;
      const id = await user(email, 'worker');
      await conn.query('INSERT INTO farm_access (userId, farmId, organisationId) VALUES (?, ?, ?)', [id, farmIds[farmIndex], organisationId]);
      workers.push({ email, farmIndex, half: w % 2 });
    }

    const contents = (i: number) => (i < 12 ? 'water' : i < 16 ? 'fertilizer' : i < 18 ? 'pest-solution' : 'culture');
    const tanks: BenchTank[] = [];
    for (const [fi, farmId] of farmIds.entries()) {
      for (let i = 0; i < TANKS_PER_FARM; i++) {
        const geometry = { shape: 'vertical-cylinder' as const, diameterMm: 1000 + 100 * ((fi + i) % 15), heightMm: 1500 + 100 * ((fi * 3 + i) % 16) };
        const safeFillLevelMm = geometry.heightMm - 100;
        // The fixture's litres come from the same shared function the server uses; a vertical
        // cylinder is linear in level, which the check below confirms before SQL relies on it.
        const setup = { geometry, datumOffsetMm: 0, outletHeightMm: OUTLET_MM, safeFillLevelMm, specificGravity: 1 };
        const at = (levelMm: number) => {
          const v = readingToVolumes(setup, { kind: 'level', levelMm });
          if (!v.ok) throw new Error(`fixture tank setup refused: ${v.reason}`);
          return v;
        };
        const lPerMm = at(1000).grossL / 1000;
        const probe = at(1234.5);
        if (Math.abs(probe.grossL - lPerMm * 1234.5) > 1e-6 || Math.abs(probe.usableL - lPerMm * (1234.5 - OUTLET_MM)) > 1e-6) throw new Error('fixture volume formula disagrees with readingToVolumes');
        const version = calibrationVersion(geometry, 0);
        const r = await conn.query(
          `INSERT INTO tanks (organisationId, farmId, name, code, contents, contentsNote, geometry, datumOffsetMm, outletHeightMm, safeFillLevelMm, lowStockL, specificGravity, sensorHeightMm, walkOrder, calibrationVersion, archivedAt, createdAt, updatedAt)
           VALUES (?, ?, ?, ?, ?, '', ?, 0, ?, ?, ?, 1, NULL, ?, ?, NULL, ?, ?)`,
          [organisationId, farmId, `Tank ${i + 1}`, `T${String(i + 1).padStart(2, '0')}`, contents(i), JSON.stringify(geometry), OUTLET_MM, safeFillLevelMm, Math.round(lPerMm * 150), i, version, now, now],
        );
        const id = Number(r.insertId);
        await conn.query('INSERT INTO tank_calibrations (organisationId, tankId, version, geometry, datumOffsetMm, createdAt) VALUES (?, ?, ?, ?, 0, ?)', [organisationId, id, version, JSON.stringify(geometry), now]);
        await conn.query('INSERT INTO tank_contents_periods (organisationId, tankId, contents, contentsNote, specificGravity, fromAt, toAt, changedById) VALUES (?, ?, ?, ?, 1, ?, NULL, NULL)', [organisationId, id, contents(i), '', new Date(now.getTime() - 400 * 86_400_000)]);
        tanks.push({ id, farmId, geometry, safeFillLevelMm, lPerMm });
      }
    }

    // Logger readings every 15 min, the newest 30 min ago: a 7-day draw from safe fill to 300 mm,
    // then a refill, each tank at its own phase; water temperature on a daily swing.
    const end = new Date(Math.floor((now.getTime() - 30 * 60_000) / 1000) * 1000);
    const started = Date.now();
    await conn.query('SET SESSION unique_checks = 0, foreign_key_checks = 0');
    for (const farmId of farmIds) {
      await conn.query(
        `INSERT INTO readings (organisationId, farmId, tankId, takenAt, source, revision, levelMm, grossL, usableL, temperatureC, calibrationVersion, enteredById, importId, note, idempotencyKey, correctedById, correctsId, createdAt)
         SELECT x.organisationId, x.farmId, x.id, TIMESTAMPADD(SECOND, -? * (? - 1 - CAST(x.seq AS SIGNED)), ?), 'logger', 0, x.lvl,
                x.lvl * x.lPerMm, (x.lvl - ?) * x.lPerMm, ROUND(14 + 5 * SIN(2 * PI() * CAST(x.seq AS SIGNED) / 96), 1), x.calibrationVersion, NULL, NULL, '', NULL, NULL, NULL, ?
           FROM (SELECT t.organisationId, t.farmId, t.id, t.calibrationVersion, s.seq,
                        PI() / 4 * POW(JSON_VALUE(t.geometry, '$.diameterMm'), 2) / 1e6 AS lPerMm,
                        ROUND(300 + (t.safeFillLevelMm - 300) * (1 - MOD(CAST(s.seq AS SIGNED) + t.id * 97, ?) / ?), 1) AS lvl
                   FROM tanks t JOIN seq_0_to_${perTank - 1} s
                  WHERE t.farmId = ?) x
          ORDER BY x.id, x.seq`,
        [STEP_S, perTank, sqlTime(end), OUTLET_MM, sqlTime(end), CYCLE, CYCLE, farmId],
      );
    }
    await conn.query('SET SESSION unique_checks = 1, foreign_key_checks = 1');
    log(`${(perTank * tanks.length).toLocaleString('en-US')} readings inserted in ${((Date.now() - started) / 1000).toFixed(1)} s`);
    await conn.query(
      `INSERT INTO tank_latest (tankId, organisationId, farmId, readingId, takenAt, levelMm, grossL, usableL, temperatureC, source)
       SELECT r.tankId, r.organisationId, r.farmId, r.id, r.takenAt, r.levelMm, r.grossL, r.usableL, r.temperatureC, r.source
         FROM readings r JOIN (SELECT tankId, MAX(takenAt) AS m FROM readings GROUP BY tankId) x ON x.tankId = r.tankId AND x.m = r.takenAt`,
    );
    await conn.query(
      `INSERT INTO tank_days (tankId, day, organisationId, farmId, takenAt, grossL, usableL)
       SELECT r.tankId, DATE(r.takenAt), r.organisationId, r.farmId, r.takenAt, r.grossL, r.usableL
         FROM readings r JOIN (SELECT tankId, MAX(takenAt) AS m FROM readings GROUP BY tankId, DATE(takenAt)) x ON x.tankId = r.tankId AND x.m = r.takenAt`,
    );
    const latest = new Map<number, number>((await conn.query('SELECT tankId, levelMm FROM tank_latest')).map((r: { tankId: number; levelMm: number }) => [r.tankId, r.levelMm]));
    const [counts] = await conn.query('SELECT (SELECT COUNT(*) FROM readings) AS readings, (SELECT COUNT(*) FROM tank_latest) AS latest, (SELECT COUNT(*) FROM tank_days) AS days');
    log(`fixture ready in ${((Date.now() - started) / 1000).toFixed(1)} s: ${Number(counts.readings).toLocaleString('en-US')} readings, ${counts.latest} tank_latest rows, ${Number(counts.days).toLocaleString('en-US')} tank_days rows`);
    return { organisationId, farmIds, tanks, managers, workers, latest, readings: Number(counts.readings) };
  } finally {
    await conn.end();
  }
}

async function startServer(env: Record<string, string>): Promise<ChildProcess> {
  // BENCH_BOARD_CPU_PROF=<folder> writes a V8 CPU profile of the server there when it stops.
  const nodeArgs = process.env.BENCH_BOARD_CPU_PROF ? ['--cpu-prof', `--cpu-prof-dir=${resolve(process.env.BENCH_BOARD_CPU_PROF)}`] : [];
  return (await startServerProcess({ env, nodeArgs })).child;
}

/** Waits until every tank's cached use rate is at least as new as its latest reading (bounded). */
async function warmForecasts(base: string, manager: Session, staleCount: () => Promise<number>) {
  const started = Date.now();
  for (;;) {
    const res = await fetch(`${base}/api/board`, { headers: { cookie: manager.cookie } });
    if (res.status !== 200) throw new Error(`board warm-up answered ${res.status}`);
    await res.arrayBuffer();
    const stale = await staleCount();
    if (stale === 0) break;
    if (Date.now() - started > 15 * 60_000) throw new Error(`forecasts still stale for ${stale} tanks after 15 min`);
    await sleep(500);
  }
  log(`forecasts cached for every tank in ${((Date.now() - started) / 1000).toFixed(1)} s`);
}

/** (a) autocannon against the board data endpoint. */
/** CPU seconds used so far by a process (from /proc) and by this one, with the wall clock. */
function cpuNow(pid: number | undefined) {
  let server = NaN;
  try {
    // Fields 14 and 15 of /proc/<pid>/stat: user and system time in clock ticks (100 a second on Linux).
    const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
    server = (Number(fields[11]) + Number(fields[12])) / 100;
  } catch {
    // Not Linux, or the process is gone: the share prints as NaN.
  }
  const self = process.cpuUsage();
  return { server, self: (self.user + self.system) / 1e6, wall: performance.now() / 1000 };
}

/** Per cent of one core each used between two `cpuNow` readings. */
function cpuShares(from: ReturnType<typeof cpuNow>, to: ReturnType<typeof cpuNow>) {
  const wallS = to.wall - from.wall;
  return { wallS, server: (100 * (to.server - from.server)) / wallS, self: (100 * (to.self - from.self)) / wallS };
}

async function boardLoad(base: string, manager: Session, serverPid: number | undefined): Promise<BenchFigure[]> {
  const figures: BenchFigure[] = [];
  // As a browser asks (gzip accepted), then uncompressed, as a plain HTTP client would.
  for (const [encoding, how] of [['gzip, deflate, br', 'gzip, as browsers ask'], ['identity', 'uncompressed']] as const) {
    const opts = { url: `${base}/api/board`, headers: { cookie: manager.cookie, 'accept-encoding': encoding } };
    // Warm-up, not a figure: one connection shows what a single request costs with no queueing.
    const single = await autocannon({ ...opts, connections: 1, duration: 5 });
    log(`board (${how}) warm-up, 1 connection: ${single.requests.total} requests, ${single.latency.p50} ms p50, ${single.latency.p99} ms p99, ${Math.round(single.throughput.average / 1024)} kB/s`);
    const cpuFrom = cpuNow(serverPid);
    const r = await autocannon({ ...opts, connections: BOARD_CONNECTIONS, duration: BOARD_SECONDS });
    const cpu = cpuShares(cpuFrom, cpuNow(serverPid));
    log(`CPU during that run (2 cores = 200 %): server ${cpu.server.toFixed(0)} %, autocannon (this process) ${cpu.self.toFixed(0)} %; server CPU per request ${((10 * cpu.server * cpu.wallS) / r.requests.total).toFixed(2)} ms`);
    const label = `GET /api/board (manager, ${FARMS * TANKS_PER_FARM} tanks, ${how}), ${BOARD_CONNECTIONS} connections, ${BOARD_SECONDS} s`;
    const failed = r.non2xx + r.errors + r.timeouts;
    log(`board (${how}): ${r.requests.total} requests, ${r.latency.p50} ms p50, ${r.latency.p99} ms p99, ${r.requests.average} req/s, ${Math.round(r.throughput.average / 1024)} kB/s, ${failed} failed`);
    figures.push(
      { name: `${label}: p50 latency`, value: r.latency.p50, unit: 'ms', target: BOARD_P99_MS, pass: 'below', ok: r.latency.p50 < BOARD_P99_MS },
      { name: `${label}: p99 latency`, value: r.latency.p99, unit: 'ms', target: BOARD_P99_MS, pass: 'below', ok: r.latency.p99 < BOARD_P99_MS },
      // 50 connections each answered within 50 ms means at least 50 / 0.05 s = 1,000 requests a second.
      { name: `${label}: throughput (target follows from the p99 target: ${BOARD_CONNECTIONS} / ${BOARD_P99_MS} ms)`, value: r.requests.average, unit: 'req/s', target: (BOARD_CONNECTIONS * 1000) / BOARD_P99_MS, pass: 'above', ok: r.requests.average > (BOARD_CONNECTIONS * 1000) / BOARD_P99_MS },
      { name: `${label}: non-2xx, errors and timeouts of ${r.requests.total.toLocaleString('en-US')} requests`, value: failed, unit: 'requests', target: 1, pass: 'below', ok: failed < 1 },
    );
  }
  return figures;
}

function watchersProcess() {
  const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'bench/board-watchers.ts')], { cwd: root, stdio: ['ignore', 'inherit', 'inherit', 'ipc'] });
  const waitFor = <T extends FromWatchers['type']>(type: T) =>
    new Promise<Extract<FromWatchers, { type: T }>>((ok, fail) => {
      const onMessage = (m: FromWatchers) => {
        if (m.type === 'failed') fail(new Error(`watchers: ${m.message}`));
        else if (m.type === type) ok(m as Extract<FromWatchers, { type: T }>);
        else return;
        child.off('message', onMessage);
      };
      child.on('message', onMessage);
      child.once('exit', (code) => fail(new Error(`watchers exited with ${code}`)));
    });
  return { child, waitFor, send: (m: object) => child.send(m) };
}

/** (b) workers posting rounds while sockets watch the board. */
async function roundLoad(base: string, fx: Awaited<ReturnType<typeof buildFixture>>, storedRounds: () => Promise<{ count: number; rows: [number, number, number][] }>, watchers: ReturnType<typeof watchersProcess>, serverPid: number | undefined): Promise<BenchFigure[]> {
  const managerSessions = await pool(fx.managers.slice(1, 1 + WATCHER_SESSIONS), 4, (email) => signIn(base, email));
  watchers.send({ type: 'open', base, cookies: managerSessions.map((s) => s.cookie), clients: WATCHERS });
  const ready = await watchers.waitFor('ready');
  log(`${ready.clients} watching sockets open in ${(ready.openMs / 1000).toFixed(1)} s`);
  const workerSessions = await pool(fx.workers, 4, async (w) => ({ ...w, session: await signIn(base, w.email) }));
  log(`${workerSessions.length} workers signed in`);

  const tanksOfFarm = new Map<number, BenchTank[]>();
  for (const t of fx.tanks) tanksOfFarm.set(t.farmId, [...(tanksOfFarm.get(t.farmId) ?? []), t]);
  // Each worker walks half of a farm's tanks; levels start at the tank's latest logger reading and
  // fall 3–19 mm a round, refilling to near safe fill when they reach 300 mm.
  const levels = new Map(fx.tanks.map((t) => [t.id, fx.latest.get(t.id) ?? t.safeFillLevelMm / 2]));
  let acknowledged = 0;
  let rounds = 0;
  const errors: string[] = [];
  let errorCount = 0;
  const fail = (msg: string) => {
    errorCount++;
    if (errors.length < 10) errors.push(msg);
  };
  const deadline = Date.now() + ROUND_SECONDS * 1000;
  const cpuFrom = cpuNow(serverPid);
  watchers.send({ type: 'mark' });
  const roundMs: number[] = [];
  await Promise.all(workerSessions.map(async (w, wi) => {
    const farmId = fx.farmIds[w.farmIndex];
    const mine = tanksOfFarm.get(farmId)!.filter((_, i) => i % 2 === w.half);
    await sleep((wi * THINK_MS) / WORKERS); // spread the first rounds out
    while (Date.now() < deadline) {
      const entries = mine.map((t) => {
        let level = levels.get(t.id)! - (3 + ((t.id * 13 + rounds) % 17));
        if (level < 300) level = t.safeFillLevelMm - 20;
        levels.set(t.id, level);
        return { tankId: t.id, readingMm: Math.round(level), temperatureC: 15, idempotencyKey: randomBytes(16).toString('hex') };
      });
      const t0 = performance.now();
      try {
        const res = await fetch(`${base}/api/rounds`, {
          method: 'POST',
          headers: { 'content-type': 'application/json', cookie: w.session.cookie, 'x-csrf-token': w.session.csrf },
          body: JSON.stringify({ farmId, entries }),
        });
        const body = (await res.json()) as { results?: { status: string; reason?: string }[] };
        roundMs.push(performance.now() - t0);
        rounds++;
        if (res.status !== 201) fail(`round answered ${res.status}: ${JSON.stringify(body).slice(0, 200)}`);
        for (const r of body.results ?? []) {
          if (r.status === 'stored') acknowledged++;
          else fail(`entry ${r.status}${r.reason ? `: ${r.reason}` : ''}`);
        }
      } catch (err) {
        fail(`round failed: ${(err as Error).message}`);
      }
      await sleep(THINK_MS);
    }
  }));
  // Let the last gathered pushes (100 ms window) go out before the watchers stop.
  await sleep(2000);
  const cpu = cpuShares(cpuFrom, cpuNow(serverPid));
  watchers.send({ type: 'stop' });
  const stopped = await watchers.waitFor('stopped');
  const stored = await storedRounds();
  watchers.send({ type: 'match', readings: stored.rows });
  const matched = await watchers.waitFor('matched');
  roundMs.sort((a, b) => a - b);
  const roundP95 = roundMs.length ? roundMs[Math.ceil(0.95 * roundMs.length) - 1] : NaN;
  log(`rounds: ${rounds} posted (p95 answer ${roundP95.toFixed(0)} ms), ${acknowledged} readings acknowledged, ${stored.count} stored; ${stopped.pushes.toLocaleString('en-US')} pushes received; ${matched.delivered.toLocaleString('en-US')} of ${matched.expected.toLocaleString('en-US')} reading arrivals; latency p50 ${matched.p50Ms} ms, p95 ${matched.p95Ms} ms, p99 ${matched.p99Ms} ms, max ${matched.maxMs} ms`);
  log(`CPU while the rounds ran (${cpu.wallS.toFixed(1)} s, 2 cores = 200 %): server ${cpu.server.toFixed(0)} %, workers (this process) ${cpu.self.toFixed(0)} %, watchers ${((100 * stopped.cpuMs) / 1000 / cpu.wallS).toFixed(0)} %`);
  for (const e of [...errors, ...stopped.errors]) log(`error: ${e}`);
  const label = `${WORKERS} workers posting rounds for ${ROUND_SECONDS} s (${THINK_MS} ms between rounds) while ${ready.clients} sockets watch`;
  const lost = Math.abs(acknowledged - stored.count);
  const undelivered = matched.expected - matched.delivered;
  return [
    { name: `${label}: errors (failed rounds, refused or duplicate entries, socket disconnects)`, value: errorCount + stopped.disconnects, unit: 'errors', target: 1, pass: 'below', ok: errorCount + stopped.disconnects < 1 },
    { name: `${label}: |acknowledged − stored| readings (${acknowledged.toLocaleString('en-US')} acknowledged, ${stored.count.toLocaleString('en-US')} stored, ${rounds} rounds)`, value: lost, unit: 'readings', target: 1, pass: 'below', ok: lost < 1 && acknowledged > 0 },
    { name: `${label}: stored readings that never reached a watching socket (of ${matched.expected.toLocaleString('en-US')} reading × socket pairs)`, value: undelivered, unit: 'arrivals', target: 1, pass: 'below', ok: undelivered < 1 },
    { name: `${label}: p95 from a reading's insert (server clock) to its push reaching a watching socket`, value: matched.p95Ms, unit: 'ms', target: PUSH_P95_MS, pass: 'below', ok: matched.p95Ms < PUSH_P95_MS },
  ];
}

export async function runBoardBench(): Promise<BenchFigure[]> {
  const perTank = Math.max(1, Math.round(READINGS / (FARMS * TANKS_PER_FARM)));
  const parent = process.env.DATA_DIR ? resolve(process.env.DATA_DIR) : tmpdir();
  mkdirSync(parent, { recursive: true });
  const dataDir = mkdtempSync(join(parent, 'brimstock-bench-board-'));
  let db: MariaDbServer | undefined;
  let mail: { close(): Promise<void> } | undefined;
  let server: ChildProcess | undefined;
  let watchers: ReturnType<typeof watchersProcess> | undefined;
  let counter: ReturnType<typeof createDatabase> | undefined;
  const stopChild = async (child: ChildProcess | undefined) => {
    if (!child || child.exitCode !== null || child.signalCode !== null) return;
    const exited = new Promise((r) => child.once('exit', r));
    child.kill('SIGTERM');
    await Promise.race([exited, sleep(10_000)]);
    if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
  };
  const cleanUp = async () => {
    await stopChild(watchers?.child);
    await stopChild(server);
    await counter?.sequelize.close().catch(() => undefined);
    await mail?.close().catch(() => undefined);
    await db?.stop();
    rmSync(dataDir, { recursive: true, force: true });
  };
  const onSignal = () => void cleanUp().finally(() => process.exit(130));
  process.once('SIGINT', onSignal);
  process.once('SIGTERM', onSignal);
  try {
    // MariaDB puts its temporary tables in TMPDIR; a private one keeps other processes' clean-ups of /tmp away from them.
    const mariaTmp = join(dataDir, 'tmp');
    mkdirSync(mariaTmp);
    const tmpBefore = process.env.TMPDIR;
    process.env.TMPDIR = mariaTmp;
    try {
      db = await startMariaDb({ baseDir: dataDir, port: await freePort() });
    } finally {
      if (tmpBefore === undefined) delete process.env.TMPDIR;
      else process.env.TMPDIR = tmpBefore;
    }
    const port = await freePort();
    const smtpPort = await freePort();
    const env: Record<string, string> = {
      ...(process.env as Record<string, string>),
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(port),
      DATA_DIR: dataDir,
      CLIENT_DIR: join(dataDir, 'no-client'),
      DB_HOST: '127.0.0.1',
      DB_PORT: String(db.port),
      DB_SOCKET: db.socketPath,
      DB_NAME: 'brimstock_bench',
      SMTP_PORT: String(smtpPort),
      LOG_LEVEL: 'warn',
      SESSION_SECRET: randomBytes(24).toString('hex'),
    };
    const config = loadConfig(env);
    await ensureDatabase(db.socketPath, config.db);
    mail = await startMailCapture({ port: smtpPort, outboxDir: config.outboxDir });
    counter = createDatabase(config);
    await migrate(counter.sequelize);
    log(`building the fixture: ${FARMS} farms × ${TANKS_PER_FARM} tanks, ${perTank.toLocaleString('en-US')} readings per tank`);
    const fx = await buildFixture(db.socketPath, config.db.name, perTank);
    server = await startServer(env);
    const base = `http://127.0.0.1:${port}`;
    const manager = await signIn(base, fx.managers[0]);
    const q = counter.sequelize;
    const one = async (sql: string) => Number((await q.query<{ n: number | string }>(sql, { type: QueryTypes.SELECT, plain: true }))!.n);
    await warmForecasts(base, manager, () => one('SELECT COUNT(*) AS n FROM tank_latest WHERE forecastAt IS NULL OR forecastAt < takenAt'));
    const figures = await boardLoad(base, manager, server.pid);
    watchers = watchersProcess();
    const storedRounds = async () => {
      const rows = await q.query<{ tankId: number; takenAt: Date; createdAt: Date }>("SELECT tankId, takenAt, createdAt FROM readings WHERE source = 'round'", { type: QueryTypes.SELECT });
      return { count: rows.length, rows: rows.map((r) => [r.tankId, new Date(r.takenAt).getTime(), new Date(r.createdAt).getTime()] as [number, number, number]) };
    };
    figures.push(...(await roundLoad(base, fx, storedRounds, watchers, server.pid)));
    for (const f of figures) f.name = `${f.name} [${fx.readings.toLocaleString('en-US')} readings]`;
    return figures;
  } finally {
    process.off('SIGINT', onSignal);
    process.off('SIGTERM', onSignal);
    await cleanUp();
  }
}
