// Runs a private MariaDB server for development and tests: its own data folder, socket and
// port, bound to 127.0.0.1, started and stopped by us (no system service).
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import mariadb from 'mariadb';

export interface MariaDbServer {
  port: number;
  socketPath: string;
  dataDir: string;
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

/**
 * Starts MariaDB with its data in `baseDir/mariadb` (initialised on first use). A server already
 * running on the same folder (left by an earlier run) is reused.
 */
export async function startMariaDb(opts: { baseDir: string; port: number; quiet?: boolean }): Promise<MariaDbServer> {
  const base = resolve(opts.baseDir);
  const dataDir = join(base, 'mariadb');
  const runDir = join(base, 'run');
  mkdirSync(runDir, { recursive: true });
  const socketPath = join(runDir, 'mariadb.sock');
  const pidFile = join(runDir, 'mariadb.pid');
  const logFile = join(base, 'mariadb.log');
  if (!existsSync(join(dataDir, 'mysql'))) initialise(dataDir, logFile);

  let child: ChildProcess | undefined;
  if (!(await ping(socketPath))) {
    const args = [
      '--no-defaults', `--datadir=${dataDir}`, `--socket=${socketPath}`, `--pid-file=${pidFile}`,
      `--port=${opts.port}`, '--bind-address=127.0.0.1', '--skip-name-resolve', `--log-error=${logFile}`,
      '--innodb-buffer-pool-size=256M', '--max-connections=500', '--local-infile=1',
      '--character-set-server=utf8mb4', '--collation-server=utf8mb4_unicode_ci',
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
    async stop() {
      spawnSync(bin('mariadb-admin'), ['--no-defaults', `--socket=${socketPath}`, '-uroot', 'shutdown'], { stdio: 'ignore' });
      if (child && child.exitCode === null) await new Promise((r) => child!.once('exit', r));
    },
  };
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
