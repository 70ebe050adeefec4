// Per-file test database and app: a fresh, migrated database of its own, a mail receiver on a
// free port, and a context wired as in production. No test depends on another file's rows.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { randomBytes } from 'node:crypto';
import { EventEmitter } from 'node:events';
import { afterAll, beforeAll, inject } from 'vitest';
import mariadb from 'mariadb';
import { loadConfig, type Config } from '../../server/config';
import type { AppContext } from '../../server/context';
import { createApp } from '../../server/app';
import { createDatabase, migrate } from '../../server/db';
import { settleDeferred } from '../../server/deferred';
import { createLogger } from '../../server/logger';
import { createMailer } from '../../server/mail/mailer';
import { startMailCapture } from '../../server/mail/capture';
import { startSmsFake, type SmsFake } from '../../server/sms/fake';
import { createTextSender } from '../../server/sms/sender';
import { freePort } from '../../scripts/lib/ports';

export interface TestEnv {
  ctx: AppContext;
  app: ReturnType<typeof createApp>;
  config: Config;
  /** The file's fake of the SMS service (its texts land in config.outboxDir). */
  sms: SmsFake;
}

export function testConfig(overrides: Record<string, string> = {}): Config {
  const info = inject('database');
  return loadConfig({
    NODE_ENV: 'test',
    DB_PORT: String(info.port),
    DB_USER: info.user,
    DB_PASSWORD: info.password,
    LOG_LEVEL: process.env.TEST_LOG_LEVEL ?? 'silent',
    SESSION_SECRET: 'test-secret-test-secret-test-secret',
    ...overrides,
  });
}

/** Registers beforeAll/afterAll hooks that build a fresh database, mail receiver and app for this file. */
export function useTestApp(overrides: Record<string, string> = {}): TestEnv {
  const env = {} as TestEnv;
  let dataDir = '';
  let closeMail: (() => Promise<void>) | undefined;
  beforeAll(async () => {
    const info = inject('database');
    const name = `${info.prefix}_${randomBytes(5).toString('hex')}`;
    const admin = await mariadb.createConnection({ socketPath: info.socketPath, user: 'root' });
    await admin.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    await admin.end();
    dataDir = mkdtempSync(join(tmpdir(), 'brimstock-file-'));
    const smtpPort = await freePort();
    const smsPort = await freePort();
    const config = testConfig({ DB_NAME: name, DATA_DIR: dataDir, SMTP_PORT: String(smtpPort), SMS_API_URL: `http://127.0.0.1:${smsPort}`, ...overrides });
    closeMail = (await startMailCapture({ port: smtpPort, outboxDir: config.outboxDir })).close;
    env.sms = await startSmsFake({ port: smsPort, outboxDir: config.outboxDir, ...config.sms.credentials!, inboundUrl: `${config.publicUrl}/api/texts/inbound` });
    const db = createDatabase(config);
    await migrate(db.sequelize);
    const ctx: AppContext = { config, db, logger: createLogger(config), mailer: createMailer(config), texts: createTextSender(config), events: new EventEmitter() };
    Object.assign(env, { ctx, config, app: createApp(ctx, { staticDir: join(dataDir, 'no-client') }) });
  });
  afterAll(async () => {
    if (env.ctx) await settleDeferred(env.ctx);
    env.ctx?.mailer.close();
    await env.ctx?.db.sequelize.close();
    await closeMail?.();
    await env.sms?.close();
    if (dataDir) rmSync(dataDir, { recursive: true, force: true });
  });
  return env;
}
