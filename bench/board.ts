// Board and round load bench. On a throwaway MariaDB and the real server process (production
// settings, warn-level logs, 127.0.0.1 only) with 1 organisation, 50 farms × 20 tanks and
// 5,000,000 logger readings (BENCH_BOARD_READINGS shrinks it for a quick run):
//  (a) autocannon on GET /api/board as a signed-in manager, 50 connections for 20 s;
//  (b) 100 simulated workers posting rounds for 30 s while 200 socket.io clients watch the board:
//      errors, acknowledged vs stored readings, the time from a reading's insert to its delta
//      reaching each watching client (p50/p95/p99) beside the server's own share of it, and the
//      bytes pushed per second. The board's p99 is also read inside the server (request in to answer
//      written, server/timings.ts over the IPC channel) beside autocannon's.
// `npm run bench board-cluster` runs (a), gzip only, and (b) on one process and then on three behind
// haproxy on the same fixture, and prints the machine's load average beside them.
import type { ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { QueryTypes } from 'sequelize';
import { ensureDatabase, startMariaDb, type MariaDbServer } from '../scripts/lib/mariadb';
import { startHaproxy } from '../scripts/lib/haproxy';
import { freePort } from '../scripts/lib/ports';
import { startRedis } from '../scripts/lib/redis';
import { loadConfig } from '../server/config';
import { createDatabase, migrate } from '../server/db';
import { startMailCapture } from '../server/mail/capture';
import type { BenchFigure } from './calibration';
import { FARMS, TANKS_PER_FARM, buildFixture, log, signIn, sleep, startServer, warmForecasts } from './board-setup';
import { boardLoad, roundLoad, watchersProcess } from './board-load';

const READINGS = Number(process.env.BENCH_BOARD_READINGS ?? 5_000_000);

/** A throwaway MariaDB with the fixture built, the server settings for it, and what stops it all. */
async function openBench() {
  const perTank = Math.max(1, Math.round(READINGS / (FARMS * TANKS_PER_FARM)));
  const parent = process.env.DATA_DIR ? resolve(process.env.DATA_DIR) : tmpdir();
  mkdirSync(parent, { recursive: true });
  const dataDir = mkdtempSync(join(parent, 'brimstock-bench-board-'));
  let db: MariaDbServer | undefined;
  let mail: { close(): Promise<void> } | undefined;
  let counter: ReturnType<typeof createDatabase> | undefined;
  const children: ChildProcess[] = [];
  const stoppers: (() => Promise<void>)[] = [];
  const cleanUp = async () => {
    for (const stop of stoppers.reverse()) await stop().catch(() => undefined);
    for (const child of children.reverse()) await stopChild(child);
    await counter?.sequelize.close().catch(() => undefined);
    await mail?.close().catch(() => undefined);
    await db?.stop();
    rmSync(dataDir, { recursive: true, force: true });
  };
  const onSignal = () => void cleanUp().finally(() => process.exit(130));
  process.once('SIGINT', onSignal);
  process.once('SIGTERM', onSignal);
  const close = async () => {
    process.off('SIGINT', onSignal);
    process.off('SIGTERM', onSignal);
    await cleanUp();
  };
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
    const q = counter.sequelize;
    const one = async (sql: string) => Number((await q.query<{ n: number | string }>(sql, { type: QueryTypes.SELECT, plain: true }))!.n);
    /** The round readings stored since `since` (epoch ms, server clock): [tankId, takenAt, createdAt]. */
    const storedRounds = async (since = 0) => {
      const rows = await q.query<{ tankId: number; takenAt: Date; createdAt: Date }>("SELECT tankId, takenAt, createdAt FROM readings WHERE source = 'round' AND createdAt >= :since", {
        replacements: { since: new Date(since) },
        type: QueryTypes.SELECT,
      });
      return { count: rows.length, rows: rows.map((r) => [r.tankId, new Date(r.takenAt).getTime(), new Date(r.createdAt).getTime()] as [number, number, number]) };
    };
    return { dataDir, env, port, fx, one, storedRounds, own: (child: ChildProcess) => void children.push(child), onClose: (stop: () => Promise<void>) => void stoppers.push(stop), close };
  } catch (err) {
    await close();
    throw err;
  }
}

async function stopChild(child: ChildProcess | undefined) {
  if (!child || child.exitCode !== null || child.signalCode !== null) return;
  const exited = new Promise((r) => child.once('exit', r));
  child.kill('SIGTERM');
  await Promise.race([exited, sleep(10_000)]);
  if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
}

export async function runBoardBench(): Promise<BenchFigure[]> {
  const bench = await openBench();
  try {
    const { env, port, fx, one } = bench;
    const server = await startServer(env);
    bench.own(server);
    const base = `http://127.0.0.1:${port}`;
    const manager = await signIn(base, fx.managers[0]);
    await warmForecasts(base, manager, () => one('SELECT COUNT(*) AS n FROM tank_latest WHERE forecastAt IS NULL OR forecastAt < takenAt'));
    const figures = await boardLoad(base, manager, server);
    const watchers = watchersProcess();
    bench.own(watchers.child);
    figures.push(...(await roundLoad(base, fx, () => bench.storedRounds(), watchers, server)));
    for (const f of figures) f.name = `${f.name} [${fx.readings.toLocaleString('en-US')} readings]`;
    return figures;
  } finally {
    await bench.close();
  }
}

/**
 * `npm run bench board-cluster`: one server process (as `npm start`) against three on one Redis behind
 * haproxy (as `npm run start:cluster`, but balanced request by request: every load generator here has
 * the address 127.0.0.1, which `balance source` would send to one process), on the same database and
 * fixture in one run: the board's p50/p99 under autocannon and commit-to-push p50/p95/p99 with the
 * watching sockets spread over the processes. The server's own share and CPU are those of the first process.
 */
export async function runBoardClusterBench(): Promise<BenchFigure[]> {
  const bench = await openBench();
  try {
    const { env, port, fx, one } = bench;
    log(`load average before (1, 5, 15 min): ${loadavg().map((l) => l.toFixed(2)).join(', ')} on ${cpus().length} cores`);
    const figures: BenchFigure[] = [];
    for (const servers of [1, 3]) {
      const base = `http://127.0.0.1:${port}`;
      const processes: ChildProcess[] = [];
      const stops: (() => Promise<void>)[] = [];
      if (servers === 1) {
        processes.push(await startServer(env));
      } else {
        const redis = await startRedis({ baseDir: join(bench.dataDir, 'cluster'), port: await freePort() });
        stops.push(() => redis.stop());
        const ports = await Promise.all(Array.from({ length: servers }, () => freePort()));
        for (const p of ports) processes.push(await startServer({ ...env, PORT: String(p), REDIS_URL: redis.url, PUBLIC_URL: base, PROXY_HOPS: '1' }));
        const balancer = await startHaproxy({ baseDir: join(bench.dataDir, 'cluster'), host: '127.0.0.1', port, serverPorts: ports, balance: 'roundrobin' });
        stops.push(() => balancer.stop());
        // haproxy binds in its own time on a busy machine, and sends nothing on until a health check has passed.
        const until = Date.now() + 30_000;
        while ((await fetch(`${base}/api/health`).catch(() => null))?.status !== 200) {
          if (Date.now() > until) throw new Error('the balancer did not answer within 30 s');
          await sleep(200);
        }
      }
      processes.forEach((p) => bench.own(p));
      stops.forEach((s) => bench.onClose(s));
      const manager = await signIn(base, fx.managers[0]);
      await warmForecasts(base, manager, () => one('SELECT COUNT(*) AS n FROM tank_latest WHERE forecastAt IS NULL OR forecastAt < takenAt'));
      const tag = `[${servers} process${servers === 1 ? '' : 'es'}]`;
      log(`${tag} load average now: ${loadavg().map((l) => l.toFixed(2)).join(', ')}`);
      const board = await boardLoad(base, manager, processes[0], { encodings: ['gzip'] });
      const watchers = watchersProcess();
      bench.own(watchers.child);
      const since = Date.now() - 1_000;
      const rounds = await roundLoad(base, fx, () => bench.storedRounds(since), watchers, processes[0]);
      await stopChild(watchers.child);
      for (const f of [...board, ...rounds]) figures.push({ ...f, name: `${tag} ${f.name}` });
      for (const stop of stops.reverse()) await stop();
      for (const p of processes) await stopChild(p);
    }
    log(`load average after (1, 5, 15 min): ${loadavg().map((l) => l.toFixed(2)).join(', ')}`);
    // The figures compared: the board's p50/p99 and commit-to-push p50/p95/p99 of each, the rest as the board bench prints them.
    return figures.filter((f) => / p(50|99) latency|insert \(server clock\)|non-2xx|acknowledged|never reached/.test(f.name));
  } finally {
    await bench.close();
  }
}
