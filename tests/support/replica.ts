// A MariaDB primary and its GTID replica for one test file (scripts/lib/mariadb.ts, the same start-up
// `SERVERS=3 npm start` uses), a migrated database on them, and apps whose Sequelize reads through
// the replica. Everything lives in a temporary folder removed at the end.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { EventEmitter } from 'node:events';
import mariadb from 'mariadb';
import { afterAll, beforeAll } from 'vitest';
import { ensureDatabase, startMariaDb, startReplica, type MariaDbServer } from '../../scripts/lib/mariadb';
import { freePort } from '../../scripts/lib/ports';
import { loadConfig } from '../../server/config';
import type { AppContext } from '../../server/context';
import { createApp } from '../../server/app';
import { createDatabase, migrate } from '../../server/db';
import { settleDeferred } from '../../server/deferred';
import { createLogger } from '../../server/logger';
import { createMailer } from '../../server/mail/mailer';
import { createTextSender } from '../../server/sms/sender';
import type { TestEnv } from './db';

const DB = { name: 'brimrep', user: 'brimrep', password: 'brimrep-pw' };

export interface ReplicaPair {
  baseDir: string;
  primary: MariaDbServer;
  replica: MariaDbServer;
  replicaPort: number;
  /** Runs SQL as root on the primary or the replica (over its socket), in the test database; `unlogged`: kept out of that server's binary log (sql_log_bin=0). */
  sql<T = Record<string, unknown>[]>(on: 'primary' | 'replica', query: string, values?: unknown[], opts?: { unlogged?: boolean }): Promise<T>;
  /** Stops the replica's server (its data stays). */
  stopReplica(): Promise<void>;
  /** Starts the replica's server again on the same port and folder; it carries on replicating from its own position. */
  startReplica(): Promise<void>;
}

/** Registers hooks that start a primary and a replica for this file and migrate one database on them. */
export function useReplicaPair(): ReplicaPair {
  const pair = {} as ReplicaPair;
  beforeAll(async () => {
    pair.baseDir = mkdtempSync(join(tmpdir(), 'brimstock-replica-'));
    pair.primary = await startMariaDb({ baseDir: pair.baseDir, port: await freePort(), replication: { serverId: 1 } });
    pair.replicaPort = await freePort();
    pair.replica = await startReplica(pair.primary, { baseDir: pair.baseDir, port: pair.replicaPort });
    await ensureDatabase(pair.primary.socketPath, DB);
    pair.sql = async <T>(on: 'primary' | 'replica', query: string, values?: unknown[], opts: { unlogged?: boolean } = {}) => {
      const conn = await mariadb.createConnection({ socketPath: (on === 'primary' ? pair.primary : pair.replica).socketPath, user: 'root', database: DB.name });
      try {
        if (opts.unlogged) await conn.query('SET SESSION sql_log_bin = 0');
        return (await conn.query(query, values)) as T;
      } finally {
        await conn.end();
      }
    };
    pair.stopReplica = () => pair.replica.stop();
    pair.startReplica = async () => {
      pair.replica = await startReplica(pair.primary, { baseDir: pair.baseDir, port: pair.replicaPort });
    };
    // Migrated on the primary alone (they reach the replica by replication).
    const db = createDatabase({ db: { ...replicaConfig(pair).db, replicas: { ...replicaConfig(pair).db.replicas, hosts: [] } } });
    await migrate(db.sequelize);
    await db.sequelize.close();
  }, 60_000);
  afterAll(async () => {
    await pair.replica?.stop();
    await pair.primary?.stop();
    if (pair.baseDir) rmSync(pair.baseDir, { recursive: true, force: true });
  }, 30_000);
  return pair;
}

/** Settings for a server on the pair: the primary over TCP, the replica as DB_REPLICA_PORT; `overrides` add or replace. */
export function replicaConfig(pair: ReplicaPair, overrides: Record<string, string> = {}) {
  return loadConfig({
    NODE_ENV: 'test',
    DB_PORT: String(pair.primary.port),
    DB_REPLICA_PORT: String(pair.replicaPort),
    DB_NAME: DB.name,
    DB_USER: DB.user,
    DB_PASSWORD: DB.password,
    DATA_DIR: join(pair.baseDir, 'app'),
    LOG_LEVEL: 'silent',
    SESSION_SECRET: 'replica-test-secret-replica-test-secret',
    ...overrides,
  });
}

export interface ReplicaApp extends TestEnv {
  /** What the replica watch warned, in order. */
  warnings: string[];
  close(): Promise<void>;
}

/** An app (for supertest) whose database reads through the pair's replica; mail and texts go nowhere (none are sent by these tests). */
export async function replicaApp(pair: ReplicaPair, overrides: Record<string, string> = {}): Promise<ReplicaApp> {
  const config = replicaConfig(pair, { SMTP_PORT: String(await freePort()), SMS_API_URL: `http://127.0.0.1:${await freePort()}`, ...overrides });
  const warnings: string[] = [];
  const db = createDatabase(config, { logger: { warn: (_details, message) => void warnings.push(message), info: () => undefined } });
  const ctx: AppContext = { config, db, logger: createLogger(config), mailer: createMailer(config), texts: createTextSender(config), events: new EventEmitter() };
  const app = createApp(ctx, { staticDir: join(pair.baseDir, 'no-client') });
  return {
    ctx,
    app,
    config,
    sms: undefined as unknown as TestEnv['sms'],
    warnings,
    async close() {
      await settleDeferred(ctx);
      ctx.mailer.close();
      await db.sequelize.close();
    },
  };
}

/** Waits until `test` holds, checking every 20 ms, for at most `ms`; returns the milliseconds it took. */
export async function waitFor(test: () => boolean | Promise<boolean>, ms: number, what: string): Promise<number> {
  const started = performance.now();
  while (!(await test())) {
    if (performance.now() - started > ms) throw new Error(`${what}: not within ${ms} ms`);
    await new Promise((r) => setTimeout(r, 20));
  }
  return performance.now() - started;
}
