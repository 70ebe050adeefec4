// Runs a private MariaDB server for development and tests: its own data folder, socket and
// port, bound to 127.0.0.1, started and stopped by us (no system service). For several server
// processes the same server also runs as a GTID replication primary, and `startReplica` runs a
// second one from the same package as its read-only replica.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import mariadb from 'mariadb';

export interface MariaDbServer {
  port: number;
  socketPath: string;
  dataDir: string;
  logFile: string;
  /** Stops the server and waits until it has shut down. */
  stop(): Promise<void>;
}

const bin = (name: string) => (existsSync(`/usr/sbin/${name}`) ? `/usr/sbin/${name}` : existsSync(`/usr/bin/${name}`) ? `/usr/bin/${name}` : name);
const runAsRoot = typeof process.getuid === 'function' && process.getuid() === 0;

function initialise(dataDir: string, logFile: string): void {
  mkdirSync(dataDir, { recursive: true });
  const args = ['--no-defaults', `--datadir=${dataDir}`, '--auth-root-authentication-method=socket', '--skip-test-db'];
  if (runAsRoot) args.push('--user=root');
  const out = spawnSync(bin('mariadb-install-db'), args, { encoding: 'utf8' });
  if (out.status !== 0) {
    writeFileSync(logFile, `${out.stdout}\n${out.stderr}`);
    throw new Error(`mariadb-install-db failed; see ${logFile}`);
  }
}

async function ping(socketPath: string): Promise<boolean> {
  try {
    const conn = await mariadb.createConnection({ socketPath, user: 'root', connectTimeout: 500 });
    await conn.end();
    return true;
  } catch {
    return false;
  }
}

/** Binary logging for GTID replication: each server of a pair has its own `serverId`. */
export interface ReplicationSettings {
  serverId: number;
  /** A replica refuses writes from the application (read_only; root and the replication thread still write). */
  readOnly?: boolean;
}

function replicationArgs(r: ReplicationSettings): string[] {
  return [
    `--server-id=${r.serverId}`, '--log-bin=mariadb-bin', '--binlog-format=ROW', '--gtid-strict-mode=1',
    // A replica logs what it applies, so it could take over as primary; its relay logs keep their own names.
    '--log-slave-updates=1', '--relay-log=mariadb-relay', '--binlog-expire-logs-seconds=604800',
    ...(r.readOnly ? ['--read-only=1'] : []),
  ];
}

async function adminQuery<T = unknown>(socketPath: string, sql: string, values?: unknown[]): Promise<T> {
  const conn = await mariadb.createConnection({ socketPath, user: 'root' });
  try {
    return (await conn.query(sql, values)) as T;
  } finally {
    await conn.end();
  }
}

/**
 * Starts MariaDB with its data in `baseDir/<name>` (default `mariadb`; initialised on first use). A server
 * already running on the same folder (left by an earlier run) is reused, unless `replication` asks for a
 * binary log it was started without: then it is restarted with one.
 */
export async function startMariaDb(opts: { baseDir: string; port: number; quiet?: boolean; name?: string; replication?: ReplicationSettings }): Promise<MariaDbServer> {
  const base = resolve(opts.baseDir);
  const name = opts.name ?? 'mariadb';
  const dataDir = join(base, name);
  const runDir = join(base, 'run');
  mkdirSync(runDir, { recursive: true });
  const socketPath = join(runDir, `${name}.sock`);
  const pidFile = join(runDir, `${name}.pid`);
  const logFile = join(base, `${name}.log`);
  if (!existsSync(join(dataDir, 'mysql'))) initialise(dataDir, logFile);

  const shutdown = () => spawnSync(bin('mariadb-admin'), ['--no-defaults', `--socket=${socketPath}`, '-uroot', 'shutdown'], { stdio: 'ignore' });
  if (opts.replication && (await ping(socketPath))) {
    const [row] = await adminQuery<{ logBin: number; serverId: number }[]>(socketPath, 'SELECT @@log_bin AS logBin, @@server_id AS serverId');
    if (!Number(row.logBin) || Number(row.serverId) !== opts.replication.serverId) shutdown();
  }

  let child: ChildProcess | undefined;
  if (!(await ping(socketPath))) {
    const args = [
      '--no-defaults', `--datadir=${dataDir}`, `--socket=${socketPath}`, `--pid-file=${pidFile}`,
      `--port=${opts.port}`, '--bind-address=127.0.0.1', '--skip-name-resolve', `--log-error=${logFile}`,
      '--innodb-buffer-pool-size=256M', '--max-connections=500', '--local-infile=1',
      '--character-set-server=utf8mb4', '--collation-server=utf8mb4_unicode_ci',
      ...(opts.replication ? replicationArgs(opts.replication) : []),
    ];
    if (runAsRoot) args.push('--user=root');
    child = spawn(bin('mariadbd'), args, { stdio: 'ignore', detached: false });
    const started = Date.now();
    while (!(await ping(socketPath))) {
      if (child.exitCode !== null) throw new Error(`MariaDB exited while starting; see ${logFile}`);
      if (Date.now() - started > 30_000) throw new Error(`MariaDB did not start in 30 s; see ${logFile}`);
      await new Promise((r) => setTimeout(r, 100));
    }
  }
  return {
    port: opts.port,
    socketPath,
    dataDir,
    logFile,
    async stop() {
      shutdown();
      if (child && child.exitCode === null) await new Promise((r) => child!.once('exit', r));
    },
  };
}

/** What `SHOW SLAVE STATUS` says of a replica's two threads and its lag (null: not replicating). */
export interface ReplicaStatus {
  ioRunning: string;
  sqlRunning: string;
  secondsBehind: number | null;
  lastError: string;
  gtidSlavePos: string;
}

/** The replication state of the server on `socketPath`; null when it has no primary configured. */
export async function replicaStatus(socketPath: string): Promise<ReplicaStatus | null> {
  const conn = await mariadb.createConnection({ socketPath, user: 'root' });
  try {
    const rows = (await conn.query('SHOW SLAVE STATUS')) as Record<string, unknown>[];
    if (!rows.length) return null;
    const r = rows[0];
    const [pos] = (await conn.query('SELECT @@gtid_slave_pos AS pos')) as { pos: string }[];
    return {
      ioRunning: String(r.Slave_IO_Running),
      sqlRunning: String(r.Slave_SQL_Running),
      secondsBehind: r.Seconds_Behind_Master === null ? null : Number(r.Seconds_Behind_Master),
      lastError: String(r.Last_IO_Error || r.Last_SQL_Error || ''),
      gtidSlavePos: pos.pos,
    };
  } finally {
    await conn.end();
  }
}

const SYSTEM_SCHEMAS = new Set(['mysql', 'information_schema', 'performance_schema', 'sys']);
const REPLICATION_USER = 'brimstock_repl';

/**
 * Starts a second MariaDB (`baseDir/mariadb-replica`, port `port`) as a read-only GTID replica of
 * `primary`, which must run with `replication` settings. A replica set up by an earlier run carries on
 * from its own position. A new one is seeded from a `mariadb-dump --gtid` of the primary (its accounts
 * and every database, in one consistent snapshot, empty or not) and replicates from the GTID position
 * the dump was taken at. Resolves once both replication threads run.
 */
export async function startReplica(primary: MariaDbServer, opts: { baseDir: string; port: number; serverId?: number }): Promise<MariaDbServer> {
  const base = resolve(opts.baseDir);
  const password = persistentSecret(base, 'replication-secret', () => randomBytes(24).toString('hex'));
  for (const host of ['127.0.0.1', 'localhost']) {
    await adminQuery(primary.socketPath, 'CREATE USER IF NOT EXISTS ?@? IDENTIFIED BY ?', [REPLICATION_USER, host, password]);
    await adminQuery(primary.socketPath, 'ALTER USER ?@? IDENTIFIED BY ?', [REPLICATION_USER, host, password]);
    await adminQuery(primary.socketPath, 'GRANT REPLICATION SLAVE ON *.* TO ?@?', [REPLICATION_USER, host]);
  }
  const replica = await startMariaDb({ baseDir: base, port: opts.port, name: 'mariadb-replica', replication: { serverId: opts.serverId ?? 2, readOnly: true } });
  try {
    if (!(await replicaStatus(replica.socketPath))) await seedReplica(primary, replica);
    await adminQuery(
      replica.socketPath,
      `CHANGE MASTER TO MASTER_HOST='127.0.0.1', MASTER_PORT=?, MASTER_USER=?, MASTER_PASSWORD=?, MASTER_USE_GTID=slave_pos, MASTER_CONNECT_RETRY=1`,
      [primary.port, REPLICATION_USER, password],
    ).catch(async (err: { errno?: number }) => {
      // 1198: a running replica cannot be pointed elsewhere; stop it, point it, start it below.
      if (err.errno !== 1198) throw err;
      await adminQuery(replica.socketPath, 'STOP SLAVE');
      await adminQuery(replica.socketPath, `CHANGE MASTER TO MASTER_HOST='127.0.0.1', MASTER_PORT=?, MASTER_USER=?, MASTER_PASSWORD=?, MASTER_USE_GTID=slave_pos, MASTER_CONNECT_RETRY=1`, [primary.port, REPLICATION_USER, password]);
    });
    await adminQuery(replica.socketPath, 'START SLAVE');
    const started = Date.now();
    for (;;) {
      const status = await replicaStatus(replica.socketPath);
      if (status?.ioRunning === 'Yes' && status.sqlRunning === 'Yes') break;
      if (Date.now() - started > 15_000) throw new Error(`The MariaDB replica did not start replicating in 15 s (${status?.lastError || `IO ${status?.ioRunning}, SQL ${status?.sqlRunning}`}); see ${replica.logFile}`);
      await new Promise((r) => setTimeout(r, 100));
    }
  } catch (err) {
    await replica.stop();
    throw err;
  }
  return replica;
}

/** Loads a consistent dump of the primary into a new replica without logging it there, and sets the position to replicate from. */
async function seedReplica(primary: MariaDbServer, replica: MariaDbServer): Promise<void> {
  const schemas = (await adminQuery<{ name: string }[]>(primary.socketPath, 'SELECT SCHEMA_NAME AS name FROM information_schema.SCHEMATA')).map((r) => r.name).filter((n) => !SYSTEM_SCHEMAS.has(n));
  // --master-data=1 with --gtid writes SET GLOBAL gtid_slave_pos for the snapshot's position; --system=users
  // with --insert-ignore writes the accounts as CREATE USER IF NOT EXISTS and their grants.
  const dumpArgs = ['--no-defaults', `--socket=${primary.socketPath}`, '-uroot', '--single-transaction', '--gtid', '--master-data=1', '--system=users', '--insert-ignore', '--routines', '--events', '--triggers'];
  if (schemas.length) dumpArgs.push('--databases', ...schemas);
  const dump = spawnSync(bin('mariadb-dump'), dumpArgs, { encoding: 'utf8', maxBuffer: 4 * 1024 ** 3 });
  if (dump.status !== 0) throw new Error(`mariadb-dump of the primary failed: ${dump.stderr.trim()}`);
  const load = spawnSync(bin('mariadb'), ['--no-defaults', `--socket=${replica.socketPath}`, '-uroot', '--init-command=SET SESSION sql_log_bin=0'], { input: dump.stdout, encoding: 'utf8', maxBuffer: 64 * 1024 ** 2 });
  if (load.status !== 0) throw new Error(`Loading the primary's dump into the replica failed: ${load.stderr.trim()}`);
}

/** Creates a database and an application account for it (TCP from 127.0.0.1 and socket logins). */
export async function ensureDatabase(socketPath: string, db: { name: string; user: string; password: string }): Promise<void> {
  const conn = await mariadb.createConnection({ socketPath, user: 'root' });
  try {
    const ident = (s: string) => `\`${s.replace(/`/g, '')}\``;
    await conn.query(`CREATE DATABASE IF NOT EXISTS ${ident(db.name)} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    for (const host of ['127.0.0.1', 'localhost']) {
      await conn.query(`CREATE USER IF NOT EXISTS ?@? IDENTIFIED BY ?`, [db.user, host, db.password]);
      await conn.query(`ALTER USER ?@? IDENTIFIED BY ?`, [db.user, host, db.password]);
      await conn.query(`GRANT ALL PRIVILEGES ON ${ident(db.name)}.* TO ?@?`, [db.user, host]);
      // Lets the server read SHOW SLAVE STATUS on a replica (is it replicating, how far behind); nothing else.
      await conn.query(`GRANT SLAVE MONITOR ON *.* TO ?@?`, [db.user, host]);
      // Test files each get their own database with this prefix.
      await conn.query(`GRANT ALL PRIVILEGES ON \`${db.name.replace(/`/g, '')}\\_%\`.* TO ?@?`, [db.user, host]);
    }
  } finally {
    await conn.end();
  }
}

/** A secret kept in a file of the data folder, made on first use (so sessions survive restarts). */
export function persistentSecret(baseDir: string, name: string, make: () => string): string {
  const file = join(resolve(baseDir), name);
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  mkdirSync(resolve(baseDir), { recursive: true });
  const value = make();
  writeFileSync(file, value, { mode: 0o600 });
  return value;
}
