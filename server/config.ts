// The only module that reads the environment: parsed once, typed, defaulted, failing fast.
import { resolve } from 'node:path';
import { z } from 'zod';

const bool = z
  .enum(['true', 'false', '1', '0', 'yes', 'no'])
  .transform((v) => v === 'true' || v === '1' || v === 'yes');

const schema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(1).max(65535).default(5180),
  PUBLIC_URL: z.string().url().optional(),
  DATA_DIR: z.string().default('.data'),
  CLIENT_DIR: z.string().default('dist'),
  DB_HOST: z.string().default('127.0.0.1'),
  DB_PORT: z.coerce.number().int().min(1).max(65535).default(3407),
  DB_SOCKET: z.string().optional(),
  DB_NAME: z.string().regex(/^[A-Za-z0-9_]+$/).default('brimstock'),
  DB_USER: z.string().default('brimstock'),
  DB_PASSWORD: z.string().default('brimstock-dev'),
  DB_POOL_MAX: z.coerce.number().int().min(1).max(200).default(10),
  DB_REPLICA_PORT: z.coerce.number().int().min(1).max(65535).optional(),
  DB_REPLICAS: z
    .string()
    .regex(/^\s*$|^[^\s,:]+:\d{1,5}(\s*,\s*[^\s,:]+:\d{1,5})*$/, 'host:port of each read replica, separated by commas')
    .optional(),
  DB_REPLICA_CHECK_SECONDS: z.coerce.number().positive().max(60).default(1),
  DB_REPLICA_MAX_LAG_SECONDS: z.coerce.number().int().min(0).max(3600).default(2),
  DB_REPLICA_WAIT_SECONDS: z.coerce.number().min(0).max(10).default(0.25),
  SESSION_SECRET: z.string().min(16).default('development-only-session-secret'),
  SESSION_IDLE_MINUTES: z.coerce.number().positive().default(60 * 12),
  SESSION_ABSOLUTE_HOURS: z.coerce.number().positive().default(24 * 14),
  SESSION_PURGE_MINUTES: z.coerce.number().positive().default(15),
  COOKIE_SECURE: bool.default(false),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().default('Brimstock <no-reply@brimstock.invalid>'),
  DEV_OUTBOX: bool.default(true),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  SIGN_IN_LIMIT_PER_IP: z.coerce.number().int().positive().default(30),
  SIGN_IN_LIMIT_PER_ACCOUNT_AND_IP: z.coerce.number().int().positive().default(8),
  SIGN_IN_WINDOW_MINUTES: z.coerce.number().positive().default(15),
  SIGN_IN_LIMIT_PER_ACCOUNT: z.coerce.number().int().positive().default(20),
  SIGN_IN_ACCOUNT_BACKOFF_SECONDS: z.coerce.number().positive().default(60),
  INVITE_TTL_HOURS: z.coerce.number().positive().default(72),
  RESET_TTL_HOURS: z.coerce.number().positive().default(2),
  UPLOAD_MAX_MB: z.coerce.number().positive().max(1024).default(200),
  FLAG_DIGEST_HOUR: z.coerce.number().int().min(0).max(23).default(7),
  SMS_ACCOUNT_SID: z.string().regex(/^AC[0-9a-fA-F]{32}$/, 'an account id: AC and 32 hex digits').optional(),
  SMS_AUTH_TOKEN: z.string().min(8).optional(),
  SMS_FROM: z.string().regex(/^\+[1-9][0-9]{6,14}$/, 'an E.164 number such as +61491570110').default('+61491570110'),
  SMS_API_URL: z.string().url().optional(),
  SMS_DAILY_CAP: z.coerce.number().int().min(1).max(1000).default(10),
  SMS_MAX_ATTEMPTS: z.coerce.number().int().min(1).max(20).default(5),
  SMS_RETRY_SECONDS: z.coerce.number().positive().default(60),
  DEMO: bool.optional(),
  SERVER_RESTARTS: z.coerce.number().int().min(0).max(100).default(5),
  WEATHER_URL: z.string().url().default('https://api.open-meteo.com'),
  WEATHER_TIMEOUT_SECONDS: z.coerce.number().positive().max(120).default(10),
  WEATHER_EVERY_MINUTES: z.coerce.number().positive().max(24 * 60).default(180),
  REDIS_URL: z.string().url().refine((u) => /^rediss?:$/.test(new URL(u).protocol), 'must be a redis:// or rediss:// address').optional(),
  REDIS_PORT: z.coerce.number().int().min(1).max(65535).default(6391),
  SERVERS: z.coerce.number().int().min(1).max(32).default(1),
  PROXY_HOPS: z.coerce.number().int().min(0).max(10).optional(),
});

export type Config = ReturnType<typeof loadConfig>;

// Outside production the texts go to the local fake of the SMS service (server/sms/fake.ts) with made-up credentials.
const DEV_SMS = { accountSid: `AC${'0'.repeat(31)}1`, authToken: 'development-only-sms-token', apiUrl: 'http://127.0.0.1:2526' };

function smsSettings(c: z.infer<typeof schema>) {
  const dev = c.NODE_ENV !== 'production';
  const accountSid = c.SMS_ACCOUNT_SID ?? (dev ? DEV_SMS.accountSid : null);
  const authToken = c.SMS_AUTH_TOKEN ?? (dev ? DEV_SMS.authToken : null);
  return {
    /** Null when texts cannot be sent (production without SMS_ACCOUNT_SID and SMS_AUTH_TOKEN). */
    credentials: accountSid && authToken ? { accountSid, authToken } : null,
    from: c.SMS_FROM,
    /** Base URL of the SMS service's API; null: the SDK's own host. */
    apiUrl: c.SMS_API_URL ?? (dev ? DEV_SMS.apiUrl : null),
    dailyCap: c.SMS_DAILY_CAP,
    maxAttempts: c.SMS_MAX_ATTEMPTS,
    retryMs: c.SMS_RETRY_SECONDS * 1000,
  };
}

/**
 * The read replicas (DB_REPLICAS, then DB_REPLICA_PORT on DB_HOST) and how they are used: a replica
 * serves reads while it replicates within `maxLagS` (checked every `checkMs`), and each request's
 * reads there first wait up to `waitMs` for it to reach the primary's position (else they read the primary).
 */
function replicaList(c: z.infer<typeof schema>) {
  const hosts = (c.DB_REPLICAS ?? '').split(',').map((s) => s.trim()).filter(Boolean).map((s) => {
    const at = s.lastIndexOf(':');
    const port = Number(s.slice(at + 1));
    if (port < 1 || port > 65535) throw new Error(`Bad settings in the environment:\n  DB_REPLICAS: port ${port} of ${s} is not between 1 and 65535`);
    return { host: s.slice(0, at), port };
  });
  if (c.DB_REPLICA_PORT && !hosts.some((h) => h.host === c.DB_HOST && h.port === c.DB_REPLICA_PORT)) hosts.push({ host: c.DB_HOST, port: c.DB_REPLICA_PORT });
  return { hosts, checkMs: c.DB_REPLICA_CHECK_SECONDS * 1000, maxLagS: c.DB_REPLICA_MAX_LAG_SECONDS, waitMs: Math.round(c.DB_REPLICA_WAIT_SECONDS * 1000) };
}

/** Parses the environment once; throws with every bad key named. */
export function loadConfig(env: Record<string, string | undefined> = process.env) {
  const parsed = schema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Bad settings in the environment:\n${lines.join('\n')}`);
  }
  const c = parsed.data;
  if (c.NODE_ENV === 'production' && c.SESSION_SECRET === 'development-only-session-secret') {
    throw new Error('SESSION_SECRET must be set in production');
  }
  const dataDir = resolve(c.DATA_DIR);
  const replicas = replicaList(c);
  return {
    env: c.NODE_ENV,
    host: c.HOST,
    port: c.PORT,
    publicUrl: (c.PUBLIC_URL ?? `http://${c.HOST}:${c.PORT}`).replace(/\/$/, ''),
    dataDir,
    clientDir: resolve(c.CLIENT_DIR),
    uploadDir: resolve(dataDir, 'uploads'),
    outboxDir: resolve(dataDir, 'outbox'),
    db: { host: c.DB_HOST, port: c.DB_PORT, socketPath: c.DB_SOCKET || null, name: c.DB_NAME, user: c.DB_USER, password: c.DB_PASSWORD, poolMax: c.DB_POOL_MAX, replicas },
    session: {
      secret: c.SESSION_SECRET,
      // Behind HTTPS the __Host- prefix makes browsers refuse the cookie unless Secure, for path / and from this host only.
      cookieName: c.COOKIE_SECURE ? '__Host-brimstock.sid' : 'brimstock.sid',
      idleMs: c.SESSION_IDLE_MINUTES * 60_000,
      absoluteMs: c.SESSION_ABSOLUTE_HOURS * 3_600_000,
      purgeMs: c.SESSION_PURGE_MINUTES * 60_000,
      secureCookie: c.COOKIE_SECURE,
    },
    mail: { host: c.SMTP_HOST, port: c.SMTP_PORT, user: c.SMTP_USER, password: c.SMTP_PASSWORD, from: c.MAIL_FROM },
    devOutbox: c.DEV_OUTBOX && c.NODE_ENV !== 'production',
    logLevel: c.LOG_LEVEL,
    /** Failed sign-ins: per address and per account + address over windowMs; per account from anywhere over accountWindowMs. */
    signInLimits: {
      perIp: c.SIGN_IN_LIMIT_PER_IP,
      perAccountAndIp: c.SIGN_IN_LIMIT_PER_ACCOUNT_AND_IP,
      windowMs: c.SIGN_IN_WINDOW_MINUTES * 60_000,
      perAccount: c.SIGN_IN_LIMIT_PER_ACCOUNT,
      accountWindowMs: c.SIGN_IN_ACCOUNT_BACKOFF_SECONDS * 1_000,
    },
    tokenTtlMs: { invite: c.INVITE_TTL_HOURS * 3_600_000, reset: c.RESET_TTL_HOURS * 3_600_000 },
    uploadMaxBytes: Math.round(c.UPLOAD_MAX_MB * 1024 * 1024),
    flagDigestHour: c.FLAG_DIGEST_HOUR,
    sms: smsSettings(c),
    /** Load the invented demo scenario into an empty database: development and test, or when asked. */
    demo: c.DEMO ?? c.NODE_ENV !== 'production',
    /** How many times `npm start` restarts a server process that died, before it stops everything. */
    serverRestarts: c.SERVER_RESTARTS,
    /** The hourly forecast service (Open-Meteo's API; npm start and the tests point it at the local fake), its time limit and how often each farm is fetched. */
    weather: { url: c.WEATHER_URL.replace(/\/$/, ''), timeoutMs: c.WEATHER_TIMEOUT_SECONDS * 1000, everyMs: c.WEATHER_EVERY_MINUTES * 60_000 },
    /** The Redis that several server processes share (bus, job claims, sign-in limits); null: this process alone. */
    redisUrl: c.REDIS_URL || null,
    /** The port of the Redis that `npm start` runs for several server processes. */
    redisPort: c.REDIS_PORT,
    /** How many server processes `npm start` runs behind the load balancer on PORT (1: one process, no balancer). */
    servers: c.SERVERS,
    /** Proxies in front whose X-Forwarded-For is trusted (default: 1 with COOKIE_SECURE, else none). */
    proxyHops: c.PROXY_HOPS ?? (c.COOKIE_SECURE ? 1 : 0),
  };
}
