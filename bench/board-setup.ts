// Set-up helpers of the board bench: the shared sizes, sign-in, the SQL-built fixture, the server start and the forecast warm-up.
import type { ChildProcess } from 'node:child_process';
import { resolve } from 'node:path';
import mariadb from 'mariadb';
import { calibrationVersion, type TankGeometry } from '../shared/calibration/index';
import { readingToVolumes } from '../shared/readings/index';
import { startServerProcess } from '../scripts/lib/server-process';
import { hashPassword } from '../server/services/passwords';
import type { TimingName, TimingSummary } from '../server/timings';

export const FARMS = 50;
export const TANKS_PER_FARM = 20;
export const WORKERS = 100;
/** Manager sessions the watching sockets share (10 sockets per session). */
export const WATCHER_SESSIONS = 20;
/** Logger interval of the fixture readings. */
const STEP_S = 15 * 60;
/** A draw cycle: a tank is drawn from full to 300 mm over 7 days of logger readings, then refilled. */
const CYCLE = (7 * 86_400) / STEP_S;
const OUTLET_MM = 100;
const PASSWORD = 'bench-password-bench';

export const log = (msg: string) => console.error(`  [board] ${new Date().toISOString().slice(11, 19)} ${msg}`);
export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export interface BenchTank {
  id: number;
  farmId: number;
  geometry: Extract<TankGeometry, { shape: 'vertical-cylinder' }>;
  safeFillLevelMm: number;
  /** Litres per mm of level (a vertical cylinder is linear). */
  lPerMm: number;
}

/** Cookie header and CSRF token of a signed-in session. */
export interface Session {
  cookie: string;
  csrf: string;
}

function cookiesOf(res: Response): string {
  return res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
}

export async function signIn(base: string, email: string): Promise<Session> {
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
export async function pool<T, R>(items: T[], n: number, fn: (item: T) => Promise<R>): Promise<R[]> {
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
export async function buildFixture(socketPath: string, dbName: string, perTank: number) {
  const conn = await mariadb.createConnection({ socketPath, user: 'root', database: dbName, timezone: 'Z', multipleStatements: false });
  try {
    await conn.query("SET time_zone = '+00:00'");
    const now = new Date();
    const hash = await hashPassword(PASSWORD);
    const org = await conn.query('INSERT INTO organisations (name, code, createdAt, updatedAt) VALUES (?, ?, ?, ?)', ['Lowland growers bench co-op', 'LGB', now, now]);
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

export async function startServer(env: Record<string, string>): Promise<ChildProcess> {
  // BENCH_BOARD_CPU_PROF=<folder> writes a V8 CPU profile of the server there when it stops.
  const nodeArgs = process.env.BENCH_BOARD_CPU_PROF ? ['--cpu-prof', `--cpu-prof-dir=${resolve(process.env.BENCH_BOARD_CPU_PROF)}`] : [];
  return (await startServerProcess({ env, nodeArgs, ipc: true })).child;
}

/** The server's own timings so far (server/timings.ts, over the IPC channel), then emptied. */
export function serverTimings(server: ChildProcess): Promise<Partial<Record<TimingName, TimingSummary>>> {
  return new Promise((ok, fail) => {
    const timer = setTimeout(() => fail(new Error('the server did not answer with its timings')), 10_000);
    const onMessage = (m: { type?: string; summaries?: Partial<Record<TimingName, TimingSummary>> }) => {
      if (m?.type !== 'timings') return;
      clearTimeout(timer);
      server.off('message', onMessage);
      ok(m.summaries ?? {});
    };
    server.on('message', onMessage);
    server.send({ type: 'timings', reset: true });
  });
}

/** Waits until every tank's cached use rate is at least as new as its latest reading (bounded). */
export async function warmForecasts(base: string, manager: Session, staleCount: () => Promise<number>) {
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
