// The task runner behind `npm start`, `npm test`, `npm run dev` and `npm run bench`
// (scripts/bootstrap.mjs has already installed what was missing).
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readFileSync, readdirSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { randomBytes } from 'node:crypto';
import { loadConfig } from '../server/config';
import { createDatabase, migrate } from '../server/db';
import { startMailCapture } from '../server/mail/capture';
import { loadDemoScenario } from '../server/services/demo';
import { ensureDatabase, persistentSecret, startMariaDb } from './lib/mariadb';
import { supervise } from './lib/supervisor';

const root = resolve(import.meta.dirname, '..');
const task = process.argv[2];

function newestMtime(dir: string): number {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(p) : statSync(p).mtimeMs);
  }
  return newest;
}

function clientIsStale(clientDir: string): boolean {
  const built = join(clientDir, 'index.html');
  if (!existsSync(built)) return true;
  const sources = Math.max(newestMtime(join(root, 'src')), newestMtime(join(root, 'shared')), statSync(join(root, 'index.html')).mtimeMs, statSync(join(root, 'vite.config.ts')).mtimeMs);
  return sources > statSync(built).mtimeMs;
}

function npx(args: string[], env: NodeJS.ProcessEnv = process.env) {
  return spawnSync(join(root, 'node_modules', '.bin', args[0]), args.slice(1), { stdio: 'inherit', cwd: root, env });
}

/** Starts MariaDB and the mail receiver, migrates and seeds; returns the environment for the server. */
async function prepare() {
  const config = loadConfig();
  const secret = persistentSecret(config.dataDir, 'session-secret', () => randomBytes(32).toString('hex'));
  console.log(`Data folder: ${config.dataDir}`);
  const db = await startMariaDb({ baseDir: config.dataDir, port: config.db.port });
  await ensureDatabase(db.socketPath, config.db);
  const mail = await startMailCapture({ port: config.mail.port, outboxDir: config.outboxDir });
  const database = createDatabase(config);
  const applied = await migrate(database.sequelize);
  if (applied.length) console.log(`Migrations applied: ${applied.join(', ')}`);
  if (config.demo && (await loadDemoScenario(database, { onlyIfEmpty: true }))) console.log('Demo scenario loaded (sign-ins are in README.md).');
  await database.sequelize.close();
  // The server talks to its own MariaDB over the Unix socket: half the cost of TCP per query.
  const env: NodeJS.ProcessEnv = { ...process.env, SESSION_SECRET: process.env.SESSION_SECRET ?? secret, DB_SOCKET: process.env.DB_SOCKET ?? db.socketPath };
  return { config, db, mail, env };
}

async function start() {
  const { config, db, mail, env } = await prepare();
  if (clientIsStale(config.clientDir)) {
    console.log('Building the client…');
    if (npx(['vite', 'build', '--logLevel', 'warn'], { ...process.env, BUILD_OUT_DIR: config.clientDir }).status !== 0) {
      await mail.close();
      await db.stop();
      process.exit(1);
    }
  }
  supervise({
    children: [{ name: 'server', start: () => spawn(process.execPath, ['--import', 'tsx', join(root, 'server', 'index.ts')], { stdio: 'inherit', cwd: root, env }) }],
    maxRestarts: config.serverRestarts,
    cleanup: async () => {
      await mail.close();
      await db.stop();
      console.log('Stopped the server, the mail receiver and MariaDB.');
    },
  });
}

async function dev() {
  const { config, db, mail, env } = await prepare();
  // tsx watch restarts the server on change itself; if either child dies, everything stops.
  supervise({
    children: [
      { name: 'server', restart: false, start: () => spawn(process.execPath, ['--import', 'tsx', 'watch', '--clear-screen=false', join(root, 'server', 'index.ts')], { stdio: 'inherit', cwd: root, env: { ...env, PUBLIC_URL: env.PUBLIC_URL ?? `http://127.0.0.1:${env.VITE_PORT ?? 5173}` } }) },
      { name: 'Vite dev server', restart: false, start: () => spawn(join(root, 'node_modules', '.bin', 'vite'), [], { stdio: 'inherit', cwd: root, env: { ...env, PORT: String(config.port) } }) },
    ],
    maxRestarts: 0,
    cleanup: async () => {
      await mail.close();
      await db.stop();
    },
  });
}

function test() {
  const steps: [string, string[]][] = [
    ['lint', ['eslint', '.']],
    ['typecheck', ['vue-tsc', '--build']],
  ];
  for (const [name, args] of steps) {
    console.log(`\n== ${name}`);
    if (npx(args).status !== 0) {
      console.log(`\n${name} failed`);
      console.log('0 passed, 1 failed');
      process.exit(1);
    }
  }
  console.log('\n== tests');
  const report = join(root, 'test-results', 'vitest.json');
  const result = npx(['vitest', 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`, ...process.argv.slice(3)], { ...process.env, NODE_ENV: 'test' });
  let passed = 0;
  let failed = 0;
  if (existsSync(report)) {
    const json = JSON.parse(readFileSync(report, 'utf8')) as { numPassedTests: number; numFailedTests: number; numTotalTests: number };
    passed = json.numPassedTests;
    failed = json.numFailedTests;
    if (json.numTotalTests === 0) failed = Math.max(failed, 1);
  } else {
    failed = 1;
  }
  if (result.status !== 0 && failed === 0) failed = 1;
  console.log(`\n${passed} passed, ${failed} failed`);
  process.exit(failed === 0 && result.status === 0 ? 0 : 1);
}

function bench() {
  const r = spawnSync(process.execPath, ['--import', 'tsx', join(root, 'bench', 'index.ts'), ...process.argv.slice(3)], { stdio: 'inherit', cwd: root });
  process.exit(r.status ?? 1);
}

switch (task) {
  case 'start':
    await start();
    break;
  case 'dev':
    await dev();
    break;
  case 'test':
    test();
    break;
  case 'bench':
    bench();
    break;
  default:
    console.error(`Unknown task "${task}": use start, dev, test or bench`);
    process.exit(2);
}
