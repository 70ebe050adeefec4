// Sign-in, reset and invitation hardening: no account enumeration by answer or timing, limits
// that do not lock the real person out, argon2id hashes, strong new passwords, and a request log
// without tokens or headers.
import { Agent as HttpAgent } from 'node:http';
import { Writable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import request from 'supertest';
import bcrypt from 'bcryptjs';
import { useTestApp, type TestEnv } from '../support/db';
import { anonymousAgent, call, makeOrganisation, PASSWORD, signedIn, type Agent } from '../support/fixtures';
import { tokenFrom, waitForMail } from '../support/mail';
import { createApp } from '../../server/app';
import { createLogger } from '../../server/logger';
import { readOutbox } from '../../server/mail/outbox';
import type { Mailer } from '../../server/mail/mailer';
import { hashPassword } from '../../server/services/passwords';

const env = useTestApp({
  SIGN_IN_LIMIT_PER_IP: '200',
  SIGN_IN_LIMIT_PER_ACCOUNT_AND_IP: '3',
  SIGN_IN_LIMIT_PER_ACCOUNT: '6',
  SIGN_IN_ACCOUNT_BACKOFF_SECONDS: '2',
});

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

/** A signed-out agent whose requests come from another loopback address (127.0.0.N). */
async function agentFrom(e: TestEnv, address: string): Promise<Agent & { from: HttpAgent }> {
  const from = new HttpAgent({ localAddress: address });
  const agent = request.agent(e.app) as Agent & { from: HttpAgent };
  agent.from = from;
  const res = await agent.get('/api/auth/session').agent(from).expect(200);
  agent.csrf = res.body.csrfToken;
  return agent;
}
const signInFrom = (agent: Agent & { from: HttpAgent }, email: string, password: string) =>
  agent.post('/api/auth/sign-in').agent(agent.from).set('x-csrf-token', agent.csrf).send({ email, password });

/** Sets up a pending invitation in the owner's organisation and returns its link token. */
async function invite(owner: Agent, email: string, name = 'Rowan Tey') {
  const res = await call(owner, 'post', '/api/invitations', { email, name, role: 'worker', farmIds: [] }).expect(201);
  return { person: res.body, token: tokenFrom(await waitForMail(env.config.outboxDir, email)) };
}

/** A logger that writes JSON lines into `lines`, at `level`. */
function capturedLogger(level: 'info' | 'debug') {
  const lines: Record<string, unknown>[] = [];
  let text = '';
  const stream = new Writable({
    write(chunk, _enc, done) {
      text += String(chunk);
      for (let i = text.indexOf('\n'); i >= 0; i = text.indexOf('\n')) {
        lines.push(JSON.parse(text.slice(0, i)));
        text = text.slice(i + 1);
      }
      done();
    },
  });
  return { logger: createLogger({ logLevel: level }, stream), lines };
}

describe('account enumeration', () => {
  it('answers a password reset as fast for a known address as for an unknown one', async () => {
    const org = await makeOrganisation(env);
    const visitor = await anonymousAgent(env);
    const known: number[] = [];
    const unknown: number[] = [];
    for (let i = 0; i < 12; i++) {
      for (const [email, times] of [[org.users.manager.email, known], [`nobody-${i}@test.example`, unknown]] as const) {
        const t = performance.now();
        await call(visitor, 'post', '/api/auth/password-reset', { email }).expect(202);
        times.push(performance.now() - t);
      }
    }
    // The mail work runs after the answer; both answers are the same few milliseconds of parsing.
    expect(Math.abs(median(known) - median(unknown))).toBeLessThan(Math.max(10, median(unknown) * 0.5));
    await waitForMail(env.config.outboxDir, org.users.manager.email);
  }, 20_000);

  it('invites an address that has an account in another organisation exactly as a new address', async () => {
    const elsewhere = await makeOrganisation(env);
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    const fresh = `fresh-${Date.now()}@test.example`;

    const taken = await call(owner, 'post', '/api/invitations', { email: elsewhere.users.worker.email, name: 'Kit Arden', role: 'worker', farmIds: [] });
    const untaken = await call(owner, 'post', '/api/invitations', { email: fresh, name: 'Kit Arden', role: 'worker', farmIds: [] });
    expect(taken.status).toBe(201);
    expect(untaken.status).toBe(201);
    expect(Object.keys(taken.body).sort()).toEqual(Object.keys(untaken.body).sort());
    expect({ ...taken.body, id: 0, email: '' }).toEqual({ ...untaken.body, id: 0, email: '' });
    expect(taken.body).toMatchObject({ email: elsewhere.users.worker.email, invitationPending: true });
    // The other organisation's account is untouched.
    await signedIn(env, elsewhere.users.worker.email);
  });

  it('takes the same time to invite an address known elsewhere as a new one', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    const elsewhere = [await makeOrganisation(env, { farms: 1 }), await makeOrganisation(env, { farms: 1 })].flatMap((o) => Object.values(o.users).map((u) => u.email));
    const known: number[] = [];
    const unknown: number[] = [];
    for (const [i, taken] of elsewhere.entries()) {
      for (const [email, times] of [[taken, known], [`new-${i}-${Date.now()}@test.example`, unknown]] as const) {
        const t = performance.now();
        await call(owner, 'post', '/api/invitations', { email, name: 'Timed Person', role: 'buyer', farmIds: [] }).expect(201);
        times.push(performance.now() - t);
      }
    }
    expect(Math.abs(median(known) - median(unknown))).toBeLessThan(Math.max(15, median(unknown) * 0.5));
  }, 20_000);

  it('still says 409 for an address already in the same organisation', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    const res = await call(owner, 'post', '/api/invitations', { email: org.users.buyer.email, name: 'Dup', role: 'buyer', farmIds: [] }).expect(409);
    expect(res.body.error).toMatchObject({ code: 'email_taken', field: 'email' });
  });

  it('signs an address with accounts in two organisations into the one whose password matches', async () => {
    const first = await makeOrganisation(env);
    const second = await makeOrganisation(env);
    const email = first.users.manager.email;
    const owner = await signedIn(env, second.users.owner.email);
    const { token } = await invite(owner, email);
    const visitor = await anonymousAgent(env);
    await call(visitor, 'post', '/api/auth/set-password', { token, password: 'second-farm-lantern-kettle' }).expect(200);

    const a = await anonymousAgent(env);
    const inFirst = await call(a, 'post', '/api/auth/sign-in', { email, password: PASSWORD }).expect(200);
    expect(inFirst.body.user).toMatchObject({ organisationId: first.organisationId, role: 'manager' });
    const b = await anonymousAgent(env);
    const inSecond = await call(b, 'post', '/api/auth/sign-in', { email, password: 'second-farm-lantern-kettle' }).expect(200);
    expect(inSecond.body.user).toMatchObject({ organisationId: second.organisationId, role: 'worker' });
    await call(await anonymousAgent(env), 'post', '/api/auth/sign-in', { email, password: 'neither-of-them-at-all' }).expect(401);
  });

  it('mails a reset link to every active account of an address', async () => {
    const first = await makeOrganisation(env);
    const second = await makeOrganisation(env);
    const email = first.users.buyer.email;
    const owner = await signedIn(env, second.users.owner.email);
    const { token } = await invite(owner, email);
    await call(await anonymousAgent(env), 'post', '/api/auth/set-password', { token, password: 'orchard-gate-copper-wren' }).expect(200);

    const visitor = await anonymousAgent(env);
    await call(visitor, 'post', '/api/auth/password-reset', { email }).expect(202);
    let resets: Awaited<ReturnType<typeof readOutbox>> = [];
    await expect.poll(async () => (resets = (await readOutbox(env.config.outboxDir)).filter((m) => m.to.includes(email) && /new .*password/i.test(m.subject))).length, { timeout: 5_000 }).toBe(2);
    const names = resets.map((m) => m.text).join('\n');
    expect(names).toContain(`Test co-op`);
    // Each link sets the password of its own account.
    const tokens = resets.map(tokenFrom);
    const infos = await Promise.all(tokens.map(async (t) => (await visitor.get(`/api/auth/tokens/${t}`).expect(200)).body));
    expect(infos.every((i) => i.purpose === 'reset' && i.email === email)).toBe(true);
  });

  it('answers an invitation without waiting for the mail, and logs a mail that fails', async () => {
    const org = await makeOrganisation(env);
    const { logger, lines } = capturedLogger('info');
    const failing: Mailer = {
      send: () => new Promise((_, reject) => setTimeout(() => reject(new Error('SMTP is down')), 1_500)),
      close: () => undefined,
    };
    const slowEnv: TestEnv = { ...env, ctx: { ...env.ctx, mailer: failing, logger } } as TestEnv;
    slowEnv.app = createApp(slowEnv.ctx, { staticDir: '/nonexistent' });
    const owner = await signedIn(slowEnv, org.users.owner.email);
    const t = performance.now();
    await call(owner, 'post', '/api/invitations', { email: `slow-${Date.now()}@test.example`, name: 'Slow Mail', role: 'worker', farmIds: [] }).expect(201);
    expect(performance.now() - t).toBeLessThan(1_000);
    await expect.poll(() => lines.some((l) => l.level === 50 && JSON.stringify(l).includes('SMTP is down')), { timeout: 5_000 }).toBe(true);
  });
});

describe('sign-in limits', () => {
  it('blocks the address that guessed wrong while the person still signs in from another', async () => {
    const org = await makeOrganisation(env);
    const email = org.users.worker.email;
    const attacker = await agentFrom(env, '127.0.0.11');
    for (let i = 0; i < 3; i++) await signInFrom(attacker, email, 'wrong-guess-wrong').expect(401);
    const blocked = await signInFrom(attacker, email, PASSWORD).expect(429);
    expect(blocked.body.error.code).toBe('rate_limited');

    const person = await agentFrom(env, '127.0.0.12');
    const res = await signInFrom(person, email, PASSWORD).expect(200);
    expect(res.body.user.email).toBe(email);
  });

  it('backs off an account guessed at from many addresses for a short while only', async () => {
    const org = await makeOrganisation(env);
    const email = org.users.buyer.email;
    for (let n = 0; n < 3; n++) {
      const from = await agentFrom(env, `127.0.1.${n + 1}`);
      for (let i = 0; i < 2; i++) await signInFrom(from, email, 'wrong-guess-wrong').expect(401);
    }
    const person = await agentFrom(env, '127.0.1.50');
    const held = await signInFrom(person, email, PASSWORD).expect(429);
    expect(held.body.error.code).toBe('rate_limited');
    await new Promise((r) => setTimeout(r, 2_100));
    await signInFrom(person, email, PASSWORD).expect(200);
  });
});

describe('password hashing', () => {
  it('stores argon2id hashes with the OWASP Password Storage Cheat Sheet parameters (m=19 MiB, t=2, p=1)', async () => {
    expect(await hashPassword('any-password-at-all')).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);
  });

  it('tells apart two passwords over 72 bytes that share their first 72 bytes', async () => {
    const org = await makeOrganisation(env);
    const head = 'a'.repeat(40) + 'lantern-copper-wren-orchard-gate-xx';
    expect(Buffer.byteLength(head)).toBeGreaterThanOrEqual(72);
    const right = `${head}-the-right-ending`;
    const wrong = `${head}-a-wrong-ending`;
    await env.ctx.db.models.User.update({ passwordHash: await hashPassword(right) }, { where: { id: org.users.worker.id } });
    const agent = await anonymousAgent(env);
    await call(agent, 'post', '/api/auth/sign-in', { email: org.users.worker.email, password: wrong }).expect(401);
    await call(agent, 'post', '/api/auth/sign-in', { email: org.users.worker.email, password: right }).expect(200);
  });

  it('signs in a person with an old bcrypt hash and stores an argon2id hash instead', async () => {
    const org = await makeOrganisation(env);
    const { User } = env.ctx.db.models;
    await User.update({ passwordHash: bcrypt.hashSync(PASSWORD, 10) }, { where: { id: org.users.manager.id } });
    await signedIn(env, org.users.manager.email);
    const stored = (await User.findByPk(org.users.manager.id))!.passwordHash!;
    expect(stored.startsWith('$argon2id$')).toBe(true);
    await signedIn(env, org.users.manager.email);
  });

  it('takes as long for an unknown address as for a wrong password', async () => {
    const orgs = [await makeOrganisation(env), await makeOrganisation(env)];
    // One wrong try per account keeps every account under this file's limits.
    const emails = orgs.flatMap((o) => Object.values(o.users).map((u) => u.email));
    const agent = await anonymousAgent(env);
    const known: number[] = [];
    const unknown: number[] = [];
    for (const [i, email] of emails.entries()) {
      for (const [address, times] of [[email, known], [`nobody-${i}@test.example`, unknown]] as const) {
        const t = performance.now();
        await call(agent, 'post', '/api/auth/sign-in', { email: address, password: `wrong-${i}` }).expect(401);
        times.push(performance.now() - t);
      }
    }
    expect(median(unknown)).toBeGreaterThan(median(known) * 0.6);
    expect(median(unknown)).toBeLessThan(median(known) * 1.6);
  }, 20_000);
});

describe('new password strength', () => {
  it('refuses a common password with 422 naming the field, and keeps the link usable', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    const { token } = await invite(owner, `weak-${Date.now()}@test.example`);
    const visitor = await anonymousAgent(env);
    const res = await call(visitor, 'post', '/api/auth/set-password', { token, password: 'password' }).expect(422);
    expect(res.body.error).toMatchObject({ code: 'weak_password', field: 'password' });
    expect(res.body.error.message).toMatch(/^password: Too easy to guess\./);
    await call(visitor, 'post', '/api/auth/set-password', { token, password: 'kettle-heron-basalt-plum' }).expect(200);
  });

  it('refuses a password built from the person\'s own name', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    const { token } = await invite(owner, `rowan.tey-${Date.now()}@test.example`, 'Rowan Teyberg');
    const res = await call(await anonymousAgent(env), 'post', '/api/auth/set-password', { token, password: 'rowanteyberg' }).expect(422);
    expect(res.body.error.field).toBe('password');
  });
});

describe('request log', () => {
  it('writes method, path without tokens, status and time at info, and no headers', async () => {
    const { logger, lines } = capturedLogger('info');
    const app = createApp({ ...env.ctx, logger }, { staticDir: '/nonexistent' });
    const token = 'Zm9vYmFyLXNlY3JldC10b2tlbi12YWx1ZS0xMjM0NTY3';
    const agent = request.agent(app);
    const session = await agent.get('/api/auth/session').set('user-agent', 'log-test-agent').expect(200);
    await agent.get(`/api/auth/tokens/${token}`).expect(404);
    await agent.get(`/set-password?token=${token}&x=1`);
    await agent.post('/api/auth/password-reset').set('x-csrf-token', session.body.csrfToken).send({ email: 'nobody@test.example' }).expect(202);
    await expect.poll(() => lines.filter((l) => l.msg === 'request completed').length).toBeGreaterThanOrEqual(4);

    const requests = lines.filter((l) => l.msg === 'request completed');
    const all = JSON.stringify(lines);
    expect(all).not.toContain(token);
    expect(all).not.toContain('log-test-agent');
    expect(all).not.toContain(session.body.csrfToken);
    expect(all).not.toMatch(/"headers"/);
    for (const l of requests) {
      expect(Object.keys(l.req as object).sort()).toEqual(['method', 'url']);
      expect(Object.keys(l.res as object)).toEqual(['statusCode']);
      expect(typeof l.responseTime).toBe('number');
    }
    expect(requests.map((l) => (l.req as { url: string }).url)).toEqual(
      expect.arrayContaining(['/api/auth/tokens/[redacted]', '/set-password?token=[redacted]&x=1', '/api/auth/password-reset']),
    );
  });

  it('adds headers at debug level, still without cookies or the CSRF token', async () => {
    const { logger, lines } = capturedLogger('debug');
    const app = createApp({ ...env.ctx, logger }, { staticDir: '/nonexistent' });
    const agent = request.agent(app);
    const session = await agent.get('/api/auth/session').set('user-agent', 'log-test-agent').expect(200);
    await agent.post('/api/auth/password-reset').set('x-csrf-token', session.body.csrfToken).send({ email: 'nobody@test.example' }).expect(202);
    await expect.poll(() => lines.filter((l) => l.msg === 'request completed').length).toBeGreaterThanOrEqual(2);
    const all = JSON.stringify(lines);
    expect(all).toContain('log-test-agent');
    expect(all).not.toContain(session.body.csrfToken);
    expect(all).not.toMatch(/brimstock\.sid=s%3A/);
  });
});
