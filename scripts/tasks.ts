// The task runner behind `npm start`, `npm test`, `npm run dev` and `npm run bench`
// (scripts/bootstrap.mjs has already installed what was missing).
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readFileSync, readdirSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { randomBytes } from 'node:crypto';
import { loadConfig } from '../server/config';
import { createDatabase, migrate } from '../server/db';
import { startMailCapture } from '../server/mail/capture';
import { startSmsFakeFor } from '../server/sms/fake';
import { startFakeWeather } from '../server/weather/fake';
import { loadDemoScenario } from '../server/services/demo';
import { startHaproxy } from './lib/haproxy';
import { ensureDatabase, persistentSecret, startMariaDb, startReplica } from './lib/mariadb';
import { startRedis } from './lib/redis';
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

/**
 * Starts MariaDB (and, with `replica`, a second one as its GTID replica unless DB_REPLICAS names others) and
 * the mail receiver, migrates and seeds; returns the environment for the server.
 */
async function prepare(opts: { replica?: boolean } = {}) {
  const config = loadConfig();
  const secret = persistentSecret(config.dataDir, 'session-secret', () => randomBytes(32).toString('hex'));
  console.log(`Data folder: ${config.dataDir}`);
  const localReplica = opts.replica === true && !process.env.DB_REPLICAS;
  const replicaPort = config.db.replicas.hosts.find((h) => h.host === config.db.host)?.port ?? config.db.port + 1;
  // A primary that ever had a replica keeps its binary log even when run alone, so the replica misses nothing.
  const logged = localReplica || existsSync(join(config.dataDir, 'mariadb-replica'));
  const primary = await startMariaDb({ baseDir: config.dataDir, port: config.db.port, ...(logged ? { replication: { serverId: 1 } } : {}) });
  const replica = localReplica ? await startReplica(primary, { baseDir: config.dataDir, port: replicaPort }).catch(async (err: unknown) => {
    await primary.stop();
    throw err;
  }) : null;
  if (replica) console.log(`MariaDB replica on 127.0.0.1:${replica.port} (GTID, read-only; ${replica.dataDir}): board and history reads go to it.`);
  const db = {
    ...primary,
    async stop() {
      await replica?.stop();
      await primary.stop();
    },
  };
  await ensureDatabase(db.socketPath, config.db);
  const mailCapture = await startMailCapture({ port: config.mail.port, outboxDir: config.outboxDir });
  // The SMS fake closes with the mail receiver, so every path that stops one stops both.
  const smsFake = await startSmsFakeFor(config);
  const mail = { close: () => Promise.all([mailCapture.close(), smsFake.close()]).then(() => undefined) };
  // The local stand-in for the forecast service (the demo farm's frost tomorrow night) unless WEATHER_URL
  // names a real one; it stops with the mail receiver.
  const weather = process.env.WEATHER_URL ? null : await startFakeWeather({ port: 0 });
  const closeMail = mail.close;
  if (weather) mail.close = async () => void (await Promise.all([weather.close(), closeMail()]));
  const database = createDatabase(config);
  const applied = await migrate(database.sequelize);
  if (applied.length) console.log(`Migrations applied: ${applied.join(', ')}`);
  if (config.demo && (await loadDemoScenario(database, { onlyIfEmpty: true }))) console.log('Demo scenario loaded (sign-ins are in README.md).');
  await database.sequelize.close();
  // The server talks to its own MariaDB over the Unix socket: half the cost of TCP per query.
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    SESSION_SECRET: process.env.SESSION_SECRET ?? secret,
    DB_SOCKET: process.env.DB_SOCKET ?? db.socketPath,
    ...(replica ? { DB_REPLICA_PORT: String(replica.port) } : {}),
    ...(weather ? { WEATHER_URL: weather.url } : {}),
  };
  return { config, db, mail, env };
}

async function start(servers: number) {
  const { config, db, mail, env } = await prepare({ replica: servers > 1 });
  if (clientIsStale(config.clientDir)) {
    console.log('Building the client…');
    if (npx(['vite', 'build', '--logLevel', 'warn'], { ...process.env, BUILD_OUT_DIR: config.clientDir }).status !== 0) {
      await mail.close();
      await db.stop();
      process.exit(1);
    }
  }
  if (servers > 1) {
    await startCluster(config, servers, env, async () => {
      await mail.close();
      await db.stop();
    });
    return;
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

/**
 * `servers` server processes on 127.0.0.1, ports PORT+1…PORT+N, sharing a Redis (REDIS_URL, else our own
 * redis-server on REDIS_PORT), behind haproxy on HOST:PORT; `stopRest` stops what `prepare` started.
 */
async function startCluster(config: ReturnType<typeof loadConfig>, servers: number, env: NodeJS.ProcessEnv, stopRest: () => Promise<void>) {
  const redis = config.redisUrl ? null : await startRedis({ baseDir: config.dataDir, port: config.redisPort });
  const ports = Array.from({ length: servers }, (_, i) => config.port + 1 + i);
  const haproxy = await startHaproxy({ baseDir: config.dataDir, host: config.host, port: config.port, serverPorts: ports });
  console.log(`${servers} server processes on ports ${ports.join(', ')} behind haproxy on ${config.host}:${config.port} (${haproxy.configFile}); Redis at ${config.redisUrl ?? redis!.url}.`);
  const serverEnv: NodeJS.ProcessEnv = {
    ...env,
    HOST: '127.0.0.1',
    // Links, the socket origin check and the ready line name the balancer's address, not a process's own.
    PUBLIC_URL: config.publicUrl,
    REDIS_URL: config.redisUrl ?? redis!.url,
    // The balancer is one more proxy hop whose X-Forwarded-For names the client (sign-in limits per address).
    PROXY_HOPS: String(config.proxyHops + 1),
    SERVERS: '1',
  };
  const stop = supervise({
    children: ports.map((port, i) => ({
      name: `server ${i + 1} (port ${port})`,
      start: () => spawn(process.execPath, ['--import', 'tsx', join(root, 'server', 'index.ts')], { stdio: 'inherit', cwd: root, env: { ...serverEnv, PORT: String(port) } }),
    })),
    maxRestarts: config.serverRestarts,
    cleanup: async () => {
      await haproxy.stop();
      await redis?.stop();
      await stopRest();
      console.log(`Stopped the ${servers} server processes, haproxy, ${redis ? 'Redis, ' : ''}the mail receiver and MariaDB${env.DB_REPLICA_PORT ? ' with its replica' : ''}.`);
    },
  });
  haproxy.child.once('exit', (code, signal) => {
    console.log(`haproxy ${signal ? `was killed by ${signal}` : `exited with code ${code}`}; stopping everything.`);
    void stop(1);
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
    await start(loadConfig().servers);
    break;
  case 'start:cluster': {
    const servers = loadConfig().servers;
    await start(servers > 1 ? servers : 3);
    break;
  }
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
    console.error(`Unknown task "${task}": use start, start:cluster, dev, test or bench`);
    process.exit(2);
}
