// Vitest global set-up for the browser tests: builds the client, starts a throwaway MariaDB with
// the demo scenario, a mail receiver and the real server process on free ports.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, mkdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import type { TestProject } from 'vitest/node';
import { ensureDatabase, startMariaDb } from '../../scripts/lib/mariadb';
import { freePort } from '../../scripts/lib/ports';
import { startServerProcess } from '../../scripts/lib/server-process';
import { loadConfig } from '../../server/config';
import { createDatabase, migrate } from '../../server/db';
import { startMailCapture } from '../../server/mail/capture';
import { startSmsFakeFor } from '../../server/sms/fake';
import { startFakeWeather } from '../../server/weather/fake';
import { loadDemoScenario } from '../../server/services/demo';

declare module 'vitest' {
  export interface ProvidedContext {
    app: { baseUrl: string; outboxDir: string; dataDir: string };
  }
}

const root = resolve(import.meta.dirname, '../..');

export default async function setup(project: TestProject) {
  const parent = process.env.DATA_DIR ? resolve(process.env.DATA_DIR) : tmpdir();
  mkdirSync(parent, { recursive: true });
  const dataDir = mkdtempSync(join(parent, 'brimstock-e2e-'));
  const clientDir = join(dataDir, 'client');
  const build = spawnSync(join(root, 'node_modules/.bin/vite'), ['build', '--logLevel', 'error'], { cwd: root, env: { ...process.env, BUILD_OUT_DIR: clientDir }, encoding: 'utf8' });
  if (build.status !== 0) throw new Error(`client build failed:\n${build.stdout}\n${build.stderr}`);

  const db = await startMariaDb({ baseDir: dataDir, port: await freePort() });
  const port = process.env.PORT && process.env.E2E_USE_PORT ? Number(process.env.PORT) : await freePort();
  const smtpPort = await freePort();
  // The fake forecast service with the demo farm's frost tomorrow night.
  const weather = await startFakeWeather({ port: 0 });
  const env: Record<string, string> = {
    ...(process.env as Record<string, string>),
    NODE_ENV: 'test',
    PORT: String(port),
    DATA_DIR: dataDir,
    CLIENT_DIR: clientDir,
    DB_PORT: String(db.port),
    DB_SOCKET: db.socketPath,
    DB_NAME: 'brimstock_e2e',
    SMTP_PORT: String(smtpPort),
    SMS_API_URL: `http://127.0.0.1:${await freePort()}`,
    LOG_LEVEL: 'warn',
    SESSION_SECRET: 'e2e-secret-e2e-secret-e2e-secret',
    WEATHER_URL: weather.url,
  };
  const config = loadConfig(env);
  await ensureDatabase(db.socketPath, config.db);
  const mail = await startMailCapture({ port: smtpPort, outboxDir: config.outboxDir });
  const sms = await startSmsFakeFor(config);
  const database = createDatabase(config);
  await migrate(database.sequelize);
  await loadDemoScenario(database);
  await database.sequelize.close();

  const { child: server } = await startServerProcess({ env });
  project.provide('app', { baseUrl: `http://127.0.0.1:${port}`, outboxDir: config.outboxDir, dataDir });

  return async () => {
    server.kill('SIGTERM');
    await new Promise((r) => (server.exitCode === null ? server.once('exit', r) : r(null)));
    await mail.close();
    await sms.close();
    await weather.close();
    await db.stop();
    rmSync(dataDir, { recursive: true, force: true });
  };
}
