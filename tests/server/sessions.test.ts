// Session rows are made only at sign-in: a signed-out visitor's CSRF token is a signed cookie, so
// anonymous traffic costs no database row; dead rows are purged on a timer.
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { startServer } from '../../server/start';
import { freePort } from '../../scripts/lib/ports';
import { purgeExpiredSessions } from '../../server/services/sessions';
import { testConfig, useTestApp } from '../support/db';
import { anonymousAgent, call, makeOrganisation, signedIn } from '../support/fixtures';

const env = useTestApp({ SESSION_ABSOLUTE_HOURS: '1' });
const rows = () => env.ctx.db.models.Session.count();

describe('sessions', () => {
  it('keeps no row for signed-out visitors, however many requests they send', async () => {
    const before = await rows();
    for (let i = 0; i < 20; i++) {
      const res = await request(env.app).get('/api/auth/session').expect(200);
      expect(res.body.csrfToken).toEqual(expect.any(String));
      expect(([] as string[]).concat(res.headers['set-cookie'] ?? []).some((c) => c.startsWith('brimstock.sid='))).toBe(false);
    }
    await request(env.app).get('/api/board').expect(401);
    const agent = await anonymousAgent(env);
    await call(agent, 'post', '/api/auth/password-reset', { email: 'nobody@test.example' }).expect(202);
    expect(await rows()).toBe(before);
  });

  it('makes one row at sign-in and removes it at sign-out', async () => {
    const org = await makeOrganisation(env);
    const before = await rows();
    const agent = await signedIn(env, org.users.worker.email);
    expect(await rows()).toBe(before + 1);
    await call(agent, 'post', '/api/auth/sign-out').expect(204);
    expect(await rows()).toBe(before);
  });

  it('refuses a signed-out write whose token does not match its cookie', async () => {
    const org = await makeOrganisation(env);
    const a = await anonymousAgent(env);
    const b = await anonymousAgent(env);
    await a.post('/api/auth/sign-in').set('x-csrf-token', b.csrf).send({ email: org.users.worker.email, password: 'x' }).expect(403);
    await a.post('/api/auth/sign-in').send({ email: org.users.worker.email, password: 'x' }).expect(403);
  });

  it('purges rows idle past their expiry or older than the absolute limit, and keeps live ones', async () => {
    const { Session } = env.ctx.db.models;
    const now = new Date();
    const hour = 3_600_000;
    await Session.bulkCreate([
      { sid: 'idle-expired', expires: new Date(now.getTime() - 1000), data: '{}', userId: null },
      { sid: 'too-old', expires: new Date(now.getTime() + hour), data: '{}', userId: null, createdAt: new Date(now.getTime() - 2 * hour) },
      { sid: 'live', expires: new Date(now.getTime() + hour), data: '{}', userId: null },
    ] as never[]);
    expect(await purgeExpiredSessions(env.ctx, now)).toBeGreaterThanOrEqual(2);
    const left = (await Session.findAll({ where: { sid: ['idle-expired', 'too-old', 'live'] } })).map((s) => s.sid);
    expect(left).toEqual(['live']);
  });

  it('runs the purge on a timer in a running server', async () => {
    const server = await startServer(testConfig({ DB_NAME: env.config.db.name, DATA_DIR: env.config.dataDir, PORT: String(await freePort()), SESSION_PURGE_MINUTES: '0.01' }));
    try {
      await env.ctx.db.models.Session.create({ sid: 'timer-expired', expires: new Date(Date.now() - 1000), data: '{}', userId: null } as never);
      const until = Date.now() + 5_000;
      while ((await env.ctx.db.models.Session.count({ where: { sid: 'timer-expired' } })) && Date.now() < until) await new Promise((r) => setTimeout(r, 100));
      expect(await env.ctx.db.models.Session.count({ where: { sid: 'timer-expired' } })).toBe(0);
    } finally {
      await server.close();
    }
  });
});
