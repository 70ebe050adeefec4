// Vitest global set-up for the server tests: one throwaway MariaDB for the whole run, in a
// temporary folder on a free port. Each test file then makes its own database (tests/support/db.ts).
import { mkdtempSync, mkdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import type { TestProject } from 'vitest/node';
import { ensureDatabase, startMariaDb } from '../../scripts/lib/mariadb';
import { freePort } from '../../scripts/lib/ports';

export interface TestDatabaseInfo {
  socketPath: string;
  port: number;
  user: string;
  password: string;
  prefix: string;
}

declare module 'vitest' {
  export interface ProvidedContext {
    database: TestDatabaseInfo;
  }
}

export default async function setup(project: TestProject) {
  const parent = process.env.DATA_DIR ? resolve(process.env.DATA_DIR) : tmpdir();
  mkdirSync(parent, { recursive: true });
  const baseDir = mkdtempSync(join(parent, 'brimstock-test-'));
  const server = await startMariaDb({ baseDir, port: await freePort() });
  const info: TestDatabaseInfo = { socketPath: server.socketPath, port: server.port, user: 'brimtest', password: 'brimtest-pw', prefix: 'brimtest' };
  await ensureDatabase(server.socketPath, { name: info.prefix, user: info.user, password: info.password });
  project.provide('database', info);
  return async () => {
    await server.stop();
    rmSync(baseDir, { recursive: true, force: true });
  };
}
