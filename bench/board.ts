// Board and round load bench. On a throwaway MariaDB and the real server process (production
// settings, warn-level logs, 127.0.0.1 only) with 1 organisation, 50 farms × 20 tanks and
// 5,000,000 logger readings (BENCH_BOARD_READINGS shrinks it for a quick run):
//  (a) autocannon on GET /api/board as a signed-in manager, 50 connections for 20 s;
//  (b) 100 simulated workers posting rounds for 30 s while 200 socket.io clients watch the board:
//      errors, acknowledged vs stored readings, the time from a reading's insert to its delta
//      reaching each watching client (p50/p95/p99) beside the server's own share of it, and the
//      bytes pushed per second. The board's p99 is also read inside the server (request in to answer
//      written, server/timings.ts over the IPC channel) beside autocannon's.
import type { ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { QueryTypes } from 'sequelize';
import { ensureDatabase, startMariaDb, type MariaDbServer } from '../scripts/lib/mariadb';
import { freePort } from '../scripts/lib/ports';
import { loadConfig } from '../server/config';
import { createDatabase, migrate } from '../server/db';
import { startMailCapture } from '../server/mail/capture';
import type { BenchFigure } from './calibration';
import { FARMS, TANKS_PER_FARM, buildFixture, log, signIn, sleep, startServer, warmForecasts } from './board-setup';
import { boardLoad, roundLoad, watchersProcess } from './board-load';

const READINGS = Number(process.env.BENCH_BOARD_READINGS ?? 5_000_000);

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
    const figures = await boardLoad(base, manager, server);
    watchers = watchersProcess();
    const storedRounds = async () => {
      const rows = await q.query<{ tankId: number; takenAt: Date; createdAt: Date }>("SELECT tankId, takenAt, createdAt FROM readings WHERE source = 'round'", { type: QueryTypes.SELECT });
      return { count: rows.length, rows: rows.map((r) => [r.tankId, new Date(r.takenAt).getTime(), new Date(r.createdAt).getTime()] as [number, number, number]) };
    };
    figures.push(...(await roundLoad(base, fx, storedRounds, watchers, server)));
    for (const f of figures) f.name = `${f.name} [${fx.readings.toLocaleString('en-US')} readings]`;
    return figures;
  } finally {
    process.off('SIGINT', onSignal);
    process.off('SIGTERM', onSignal);
    await cleanUp();
  }
}
