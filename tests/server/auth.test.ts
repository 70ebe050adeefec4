import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { useTestApp } from '../support/db';
import { anonymousAgent, call, makeOrganisation, PASSWORD, signedIn } from '../support/fixtures';
import { tokenFrom, waitForMail } from '../support/mail';

const env = useTestApp({ SIGN_IN_LIMIT_PER_ACCOUNT_AND_IP: '3', SESSION_ABSOLUTE_HOURS: '1' });

const sessionCookie = (res: request.Response) =>
  ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.startsWith('brimstock.sid='));

describe('sign-in', () => {
  it('signs in with the right password and returns the session user and a new CSRF token', async () => {
    const org = await makeOrganisation(env);
    const agent = await anonymousAgent(env);
    const res = await call(agent, 'post', '/api/auth/sign-in', { email: org.users.manager.email.toUpperCase(), password: PASSWORD }).expect(200);
    expect(res.body.user).toMatchObject({ email: org.users.manager.email, role: 'manager', organisationId: org.organisationId, farmIds: org.farmIds });
    expect(res.body.csrfToken).not.toBe(agent.csrf);
    const cookie = sessionCookie(res)!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });

  it('issues a new session id at sign-in, whatever session cookie came with it (no session fixation)', async () => {
    const org = await makeOrganisation(env);
    // Only signed-in sessions exist now; an attacker can only plant an id of their choosing.
    const planted = 'brimstock.sid=s%3Aattacker-chosen-id.forged';
    const first = await request(env.app).get('/api/auth/session').expect(200);
    const csrfCookie = ([] as string[]).concat(first.headers['set-cookie'] ?? []).map((c) => c.split(';')[0]).join('; ');
    const res = await request(env.app)
      .post('/api/auth/sign-in')
      .set('Cookie', `${planted}; ${csrfCookie}`)
      .set('x-csrf-token', first.body.csrfToken)
      .send({ email: org.users.worker.email, password: PASSWORD })
      .expect(200);
    expect(sessionCookie(res)!.split(';')[0]).not.toBe(planted);
    expect(await env.ctx.db.models.Session.count({ where: { sid: 'attacker-chosen-id' } })).toBe(0);
  });

  it('refuses a wrong password with 401 and the same message as an unknown e-mail', async () => {
    const org = await makeOrganisation(env);
    const agent = await anonymousAgent(env);
    const wrong = await call(agent, 'post', '/api/auth/sign-in', { email: org.users.buyer.email, password: 'not-the-password' }).expect(401);
    const unknown = await call(agent, 'post', '/api/auth/sign-in', { email: 'nobody@test.example', password: 'not-the-password' }).expect(401);
    expect(wrong.body.error).toEqual(unknown.body.error);
  });

  it('names the field when the e-mail is malformed', async () => {
    const agent = await anonymousAgent(env);
    const res = await call(agent, 'post', '/api/auth/sign-in', { email: 'not an address', password: 'x' }).expect(400);
    expect(res.body.error).toMatchObject({ code: 'invalid_input', field: 'email' });
  });

  it('rate-limits repeated failures on one account from one address with 429', async () => {
    const org = await makeOrganisation(env);
    const agent = await anonymousAgent(env);
    for (let i = 0; i < 3; i++) await call(agent, 'post', '/api/auth/sign-in', { email: org.users.owner.email, password: 'wrong-wrong' }).expect(401);
    const res = await call(agent, 'post', '/api/auth/sign-in', { email: org.users.owner.email, password: PASSWORD }).expect(429);
    expect(res.body.error.code).toBe('rate_limited');
  });

  it('refuses writes without the CSRF token', async () => {
    const org = await makeOrganisation(env);
    const agent = await anonymousAgent(env);
    const res = await agent.post('/api/auth/sign-in').send({ email: org.users.owner.email, password: PASSWORD }).expect(403);
    expect(res.body.error.code).toBe('csrf_invalid');
  });

  it('never sends a stack trace in an error', async () => {
    const agent = await anonymousAgent(env);
    const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', agent.csrf).set('content-type', 'application/json').send('{"email":').expect(400);
    expect(res.body.error.code).toBe('invalid_json');
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.(ts|js):\d+/);
  });
});

describe('sessions', () => {
  it('answers "who am I" and ends the session at sign-out', async () => {
    const org = await makeOrganisation(env);
    const agent = await signedIn(env, org.users.worker.email);
    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body).toMatchObject({ role: 'worker', farmIds: [org.farmIds[0]] });
    await call(agent, 'post', '/api/auth/sign-out').expect(204);
    await agent.get('/api/auth/me').expect(401);
  });

  it('keeps a session in the database, so a fresh app instance still knows it', async () => {
    const org = await makeOrganisation(env);
    const agent = await signedIn(env, org.users.owner.email);
    const { createApp } = await import('../../server/app');
    const second = createApp(env.ctx);
    const cookie = (await agent.get('/api/auth/session')).headers['set-cookie'] ?? [];
    const jar = ([] as string[]).concat(cookie).map((c) => c.split(';')[0]).join('; ');
    const res = await request(second).get('/api/auth/me').set('cookie', jar).expect(200);
    expect(res.body.email).toBe(org.users.owner.email);
  });

  it('ends a session past the absolute timeout even when it was used recently', async () => {
    const org = await makeOrganisation(env);
    const agent = await signedIn(env, org.users.owner.email);
    const { Session } = env.ctx.db.models;
    const row = (await Session.findOne({ where: { userId: org.users.owner.id } }))!;
    const data = JSON.parse(row.data!);
    data.signedInAt = Date.now() - 2 * 3_600_000;
    await row.update({ data: JSON.stringify(data) });
    await agent.get('/api/auth/me').expect(401);
  });

  it('updates the unit system of the signed-in user', async () => {
    const org = await makeOrganisation(env);
    const agent = await signedIn(env, org.users.buyer.email);
    const res = await call(agent, 'patch', '/api/auth/me', { unitSystem: 'us' }).expect(200);
    expect(res.body.unitSystem).toBe('us');
    await call(agent, 'patch', '/api/auth/me', { unitSystem: 'imperial' }).expect(400);
  });
});

describe('invitations and password reset', () => {
  it('invites a person by mail; the link sets a password once and signs them in', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    const email = `new-${Date.now()}@test.example`;
    const created = await call(owner, 'post', '/api/invitations', { email, name: 'Nell Avery', role: 'worker', farmIds: [org.farmIds[1]] }).expect(201);
    expect(created.body).toMatchObject({ email, invitationPending: true, farmIds: [org.farmIds[1]] });

    const mail = await waitForMail(env.config.outboxDir, email);
    expect(mail.subject).toMatch(/invited/);
    const token = tokenFrom(mail);

    const visitor = await anonymousAgent(env);
    const info = await visitor.get(`/api/auth/tokens/${token}`).expect(200);
    expect(info.body).toEqual({ purpose: 'invite', email, name: 'Nell Avery' });
    await call(visitor, 'post', '/api/auth/set-password', { token, password: 'short' }).expect(400);
    const set = await call(visitor, 'post', '/api/auth/set-password', { token, password: 'a-long-enough-password', name: 'Nell A.' }).expect(200);
    expect(set.body.user).toMatchObject({ email, name: 'Nell A.', role: 'worker', farmIds: [org.farmIds[1]] });

    const again = await anonymousAgent(env);
    await call(again, 'post', '/api/auth/set-password', { token, password: 'another-long-password' }).expect(404);
    await signedIn(env, email, 'a-long-enough-password');
  });

  it('refuses an expired link', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    const email = `late-${Date.now()}@test.example`;
    await call(owner, 'post', '/api/invitations', { email, name: 'Late Comer', role: 'buyer', farmIds: [] }).expect(201);
    const token = tokenFrom(await waitForMail(env.config.outboxDir, email));
    await env.ctx.db.models.AuthToken.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { purpose: 'invite' } });
    const visitor = await anonymousAgent(env);
    const res = await visitor.get(`/api/auth/tokens/${token}`).expect(404);
    expect(res.body.error.code).toBe('token_invalid');
  });

  it('resets a password through a mailed link and says nothing about unknown addresses', async () => {
    const org = await makeOrganisation(env);
    const visitor = await anonymousAgent(env);
    await call(visitor, 'post', '/api/auth/password-reset', { email: 'nobody-here@test.example' }).expect(202);
    await call(visitor, 'post', '/api/auth/password-reset', { email: org.users.manager.email }).expect(202);
    const token = tokenFrom(await waitForMail(env.config.outboxDir, org.users.manager.email));
    await call(visitor, 'post', '/api/auth/set-password', { token, password: 'brand-new-password-1' }).expect(200);
    await signedIn(env, org.users.manager.email, 'brand-new-password-1');
  });

  it('ends a deactivated person\'s sessions at once', async () => {
    const org = await makeOrganisation(env);
    const worker = await signedIn(env, org.users.worker.email);
    await worker.get('/api/auth/me').expect(200);
    const owner = await signedIn(env, org.users.owner.email);
    await call(owner, 'patch', `/api/people/${org.users.worker.id}`, { active: false }).expect(200);
    await worker.get('/api/auth/me').expect(401);
    const again = await anonymousAgent(env);
    const res = await call(again, 'post', '/api/auth/sign-in', { email: org.users.worker.email, password: PASSWORD }).expect(403);
    expect(res.body.error.code).toBe('account_inactive');
  });

  it('refuses an invitation to an address that already has an account, naming the field', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    const res = await call(owner, 'post', '/api/invitations', { email: org.users.buyer.email, name: 'Dup', role: 'buyer', farmIds: [] }).expect(409);
    expect(res.body.error).toMatchObject({ code: 'email_taken', field: 'email' });
  });

  it('stops an owner from demoting themself', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    await call(owner, 'patch', `/api/people/${org.users.owner.id}`, { role: 'worker' }).expect(409);
  });
});
