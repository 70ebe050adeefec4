// Several real server processes (scripts/lib/server-process.ts) over one test database and one
// redis-server started for the test file, for the tests of what the processes share.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { freePort } from '../../scripts/lib/ports';
import { startRedis, type RedisServer } from '../../scripts/lib/redis';
import { startServerProcess, type ServerProcess } from '../../scripts/lib/server-process';
import type { DbServer } from './server-process';

export interface ClusterMember {
  baseUrl: string;
  process: ServerProcess;
  /** Every line the process printed on standard output so far. */
  lines: string[];
  stop(): Promise<void>;
}

/** A redis-server on a free loopback port with its files in a new temporary folder. */
export async function testRedis(): Promise<RedisServer> {
  return startRedis({ baseDir: mkdtempSync(join(tmpdir(), 'brimstock-redis-')), port: await freePort() });
}

/** One server process on a free port against database `dbName`, sharing `redisUrl`; `env` adds or overrides settings. */
export async function clusterMember(db: DbServer, dbName: string, redisUrl: string, env: Record<string, string> = {}): Promise<ClusterMember> {
  const port = await freePort();
  const dataDir = mkdtempSync(join(tmpdir(), 'brimstock-member-'));
  const lines: string[] = [];
  const started = await startServerProcess({
    env: {
      PATH: process.env.PATH ?? '',
      HOME: process.env.HOME ?? '',
      NODE_ENV: 'test',
      HOST: '127.0.0.1',
      PORT: String(port),
      DATA_DIR: dataDir,
      CLIENT_DIR: join(dataDir, 'no-client'),
      DB_HOST: '127.0.0.1',
      DB_PORT: String(db.port),
      DB_NAME: dbName,
      DB_USER: db.user,
      DB_PASSWORD: db.password,
      SMTP_PORT: String(await freePort()),
      LOG_LEVEL: 'error',
      SESSION_SECRET: 'cluster-test-secret-cluster-test-secret',
      REDIS_URL: redisUrl,
      ...env,
    },
    captureStderr: true,
    timeoutMs: 90_000,
    onLine: (line) => lines.push(line),
  });
  const child = started.child;
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    process: started,
    lines,
    async stop() {
      if (child.exitCode !== null || child.signalCode !== null) return;
      const gone = new Promise((r) => child.once('exit', r));
      child.kill('SIGTERM');
      await gone;
    },
  };
}
