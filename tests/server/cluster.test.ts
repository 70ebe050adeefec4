// Several server processes over one database and one Redis: a session signed out on one cannot be
// used on another, a background job runs once per period across three, and failed sign-ins are
// counted across two. Real processes on loopback (tests/support/cluster-processes.ts).
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { RedisServer } from '../../scripts/lib/redis';
import type { Database } from '../../server/db';
import { clusterMember, testRedis, type ClusterMember } from '../support/cluster-processes';
import { makeOrganisation, type OrgFixture } from '../support/fixtures';
import { Client, fixtureEnv, freshDatabase, type DbServer } from '../support/server-process';

let dbServer: DbServer;
let dbName: string;
let db: Database;
let org: OrgFixture;
let redis: RedisServer;
const members: ClusterMember[] = [];

async function start(env: Record<string, string> = {}): Promise<ClusterMember> {
  const member = await clusterMember(dbServer, dbName, redis.url, env);
  members.push(member);
  return member;
}

beforeAll(async () => {
  dbServer = inject('database');
  ({ name: dbName, db } = await freshDatabase(dbServer, 'brimtest_cluster'));
  org = await makeOrganisation(fixtureEnv(db));
  redis = await testRedis();
}, 150_000);

afterAll(async () => {
  await Promise.all(members.map((m) => m.stop()));
  await redis?.stop();
  await db?.sequelize.close();
});

/** The same browser on another process: its cookie and token, another address. */
function sameBrowserOn(client: Client, baseUrl: string): Client {
  const other = new Client(baseUrl);
  other.cookie = client.cookie;
  other.csrf = client.csrf;
  return other;
}

describe('several server processes', () => {
  it('refuses a session on process B within 1 s of its sign-out on process A', async () => {
    const [a, b] = await Promise.all([start(), start()]);
    const onA = await Client.signIn(a.baseUrl, org.users.worker.email);
    const onB = sameBrowserOn(onA, b.baseUrl);
    // B has read the session and keeps it in memory for up to 5 s (services/signed-in-cache.ts).
    expect((await onB.request('GET', '/api/auth/me')).status).toBe(200);
    expect((await onB.request('GET', '/api/auth/me')).status).toBe(200);
    expect((await onA.request('POST', '/api/auth/sign-out')).status).toBeLessThan(300);
    const signedOutAt = Date.now();
    let status = 200;
    while (status === 200 && Date.now() - signedOutAt < 1_000) {
      status = (await onB.request('GET', '/api/auth/me')).status;
      if (status === 200) await new Promise((r) => setTimeout(r, 20));
    }
    expect(status).toBe(401);
    expect(Date.now() - signedOutAt).toBeLessThan(1_000);
    await Promise.all([a.stop(), b.stop()]);
  }, 150_000);

  it('runs a periodic job once per period across three processes', async () => {
    const periodMs = 1_200; // SESSION_PURGE_MINUTES=0.02
    const env = { SESSION_PURGE_MINUTES: '0.02', LOG_LEVEL: 'debug' };
    const trio = await Promise.all([start(env), start(env), start(env)]);
    const from = Date.now();
    await new Promise((r) => setTimeout(r, 6 * periodMs));
    const to = Date.now();
    const runs = trio.flatMap((m, member) =>
      m.lines
        .filter((l) => l.startsWith('{'))
        .map((l) => JSON.parse(l) as { event?: string; job?: string; slot?: number; time?: number })
        .filter((r) => r.event === 'job' && r.job === 'session-purge')
        .map((r) => ({ member, slot: r.slot! })),
    );
    const slots = runs.map((r) => r.slot);
    // Never two runs in one period (the first process up ran some before the others were), and one run
    // in every period that began and ended while all three were up.
    expect(new Set(slots).size).toBe(slots.length);
    const whileAllUp = Array.from({ length: Math.floor(to / periodMs) - Math.floor(from / periodMs) - 1 }, (_, i) => Math.floor(from / periodMs) + 1 + i);
    expect(whileAllUp.length).toBeGreaterThanOrEqual(4);
    for (const slot of whileAllUp) expect(runs.filter((r) => r.slot === slot), `runs in period ${slot}`).toHaveLength(1);
    await Promise.all(trio.map((m) => m.stop()));
  }, 150_000);

  it('counts failed sign-ins to one account from one address across two processes', async () => {
    const env = { SIGN_IN_LIMIT_PER_ACCOUNT_AND_IP: '3', SIGN_IN_LIMIT_PER_IP: '100', SIGN_IN_LIMIT_PER_ACCOUNT: '100' };
    const [a, b] = await Promise.all([start(env), start(env)]);
    const wrong = { email: org.users.manager.email, password: 'not-the-password-at-all' };
    const signInOn = async (baseUrl: string) => {
      const c = new Client(baseUrl);
      const first = await fetch(`${baseUrl}/api/auth/session`);
      c.cookie = first.headers.getSetCookie().map((x) => x.split(';')[0]).join('; ');
      c.csrf = ((await first.json()) as { csrfToken: string }).csrfToken;
      return (await c.request('POST', '/api/auth/sign-in', wrong)).status;
    };
    expect(await signInOn(a.baseUrl)).toBe(401);
    expect(await signInOn(a.baseUrl)).toBe(401);
    expect(await signInOn(b.baseUrl)).toBe(401);
    // The fourth failure within the window is over the limit of 3 whichever process counts it.
    expect(await signInOn(b.baseUrl)).toBe(429);
    expect(await signInOn(a.baseUrl)).toBe(429);
    await Promise.all([a.stop(), b.stop()]);
  }, 150_000);
});
