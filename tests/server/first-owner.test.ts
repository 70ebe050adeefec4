// The first owner of an empty production database: a one-time set-up link opened at start-up,
// used once to make the organisation and its owner, and closed for good once any organisation exists.
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { passwordStrength } from '@shared/passwords';
import { startServer, type RunningServer } from '../../server/start';
import { freePort } from '../../scripts/lib/ports';
import { testConfig, useTestApp, type TestEnv } from '../support/db';
import { call, makeOrganisation, type Agent } from '../support/fixtures';
import { hashToken } from '../../server/services/passwords';

const STRONG = 'kettle heron basalt plum';

/**
 * Starts the real server on the test file's database, as `npm start` would in production (demo
 * off). Sequelize models are bound to the last instance made, so while it runs every request and
 * query goes through this server and its context.
 */
async function startOn(env: TestEnv): Promise<RunningServer> {
  return startServer(testConfig({ DB_NAME: env.config.db.name, DATA_DIR: env.config.dataDir, PORT: String(await freePort()), DEMO: 'false' }));
}

/** Runs `fn` against a freshly started server, then stops it. */
async function withServer<T>(env: TestEnv, fn: (server: RunningServer) => Promise<T>): Promise<T> {
  const server = await startOn(env);
  try {
    return await fn(server);
  } finally {
    await server.close();
  }
}

/** A signed-out visitor of `server` holding a CSRF token, as the browser client is. */
async function visitor(server: RunningServer): Promise<Agent> {
  const agent = request.agent(server.http) as Agent;
  agent.csrf = (await agent.get('/api/auth/session').expect(200)).body.csrfToken;
  return agent;
}

const tokenOf = (link: string) => new URL(link).searchParams.get('token')!;
const body = (token: string, over: Record<string, string> = {}) => ({
  token,
  organisationName: 'Tarn Ridge Growers',
  name: 'Morwenna Lisle',
  email: 'morwenna@tarnridge.test',
  password: STRONG,
  ...over,
});

describe('first-owner set-up on an empty database', () => {
  const env = useTestApp({ DEMO: 'false' });

  it('opens a set-up link at start-up, and a new start replaces it', async () => {
    const first = await withServer(env, async (server) => {
      expect(server.ctx.config.demo).toBe(false);
      expect(server.firstOwnerLink).toMatch(new RegExp(`^${server.ctx.config.publicUrl}/first-owner\\?token=[A-Za-z0-9_-]{43}$`));
      return server.firstOwnerLink;
    });
    await withServer(env, async (server) => {
      expect(server.firstOwnerLink).not.toBe(first);
      const agent = await visitor(server);
      expect((await agent.get('/api/setup').expect(200)).body).toEqual({ firstOwnerNeeded: true });
      const stale = await call(agent, 'post', '/api/setup/first-owner', body(tokenOf(first!)));
      expect(stale.status, JSON.stringify(stale.body)).toBe(404);
      expect(stale.body.error.code).toBe('token_invalid');
      expect(await server.ctx.db.models.Organisation.count()).toBe(0);
    });
  });

  it('keeps only a hash of the token', async () => {
    await withServer(env, async (server) => {
      const token = tokenOf(server.firstOwnerLink!);
      const rows = await server.ctx.db.models.SetupToken.findAll();
      expect(rows).toHaveLength(1);
      expect(rows[0]!.tokenHash).toMatch(/^[0-9a-f]{64}$/);
      expect(rows[0]!.tokenHash).not.toContain(token);
    });
  });

  it('refuses a wrong token with 404 and makes nothing', async () => {
    await withServer(env, async (server) => {
      const res = await call(await visitor(server), 'post', '/api/setup/first-owner', body('w'.repeat(43)));
      expect(res.status).toBe(404);
      expect(res.body.error.code).toBe('token_invalid');
      expect(await server.ctx.db.models.Organisation.count()).toBe(0);
      expect(await server.ctx.db.models.User.count()).toBe(0);
    });
  });

  it('refuses a weak password naming password, and leaves the link usable', async () => {
    await withServer(env, async (server) => {
      const token = tokenOf(server.firstOwnerLink!);
      const weak = await call(await visitor(server), 'post', '/api/setup/first-owner', body(token, { password: 'tarnridge2024' }));
      expect(weak.status).toBe(422);
      expect(weak.body.error.field).toBe('password');
      const verdict = passwordStrength('tarnridge2024', ['morwenna@tarnridge.test', 'Morwenna Lisle', 'Tarn Ridge Growers']);
      expect(verdict.acceptable).toBe(false);
      expect(weak.body.error.message).toBe(`password: ${verdict.message}`);
      expect(await server.ctx.db.models.Organisation.count()).toBe(0);
      expect(await server.ctx.db.models.SetupToken.findByPk(hashToken(token))).not.toBeNull();
    });
  });

  it('names the field of a bad body', async () => {
    await withServer(env, async (server) => {
      const agent = await visitor(server);
      const token = tokenOf(server.firstOwnerLink!);
      const org = await call(agent, 'post', '/api/setup/first-owner', body(token, { organisationName: '  ' }));
      expect(org.status).toBe(400);
      expect(org.body.error.field).toBe('organisationName');
      const email = await call(agent, 'post', '/api/setup/first-owner', body(token, { email: 'not an address' }));
      expect(email.status).toBe(400);
      expect(email.body.error.field).toBe('email');
    });
  });

  it('refuses a request without the CSRF token', async () => {
    await withServer(env, async (server) => {
      const res = await request(server.http).post('/api/setup/first-owner').send(body(tokenOf(server.firstOwnerLink!)));
      expect(res.status).toBe(403);
      expect(await server.ctx.db.models.Organisation.count()).toBe(0);
    });
  });
});

describe('using the first-owner link', () => {
  const env = useTestApp({ DEMO: 'false' });

  it('makes exactly one owner when two requests use it at once, signs that one in, and refuses the link afterwards', async () => {
    const token = await withServer(env, async (server) => {
      const token = tokenOf(server.firstOwnerLink!);
      const [a, b] = await Promise.all([visitor(server), visitor(server)]);
      const answers = await Promise.all([
        call(a, 'post', '/api/setup/first-owner', body(token)),
        call(b, 'post', '/api/setup/first-owner', body(token, { organisationName: 'Second Try Co-op', email: 'other@tarnridge.test' })),
      ]);
      const statuses = answers.map((r) => r.status).sort();
      expect(statuses[0], JSON.stringify(answers.map((r) => r.body))).toBe(200);
      expect([404, 409]).toContain(statuses[1]);

      const { Organisation, User, SetupToken } = server.ctx.db.models;
      expect(await Organisation.count()).toBe(1);
      const users = await User.findAll();
      expect(users).toHaveLength(1);
      expect(users[0]!.role).toBe('owner');
      expect(await SetupToken.count()).toBe(0);

      const winner = answers[0]!.status === 200 ? 0 : 1;
      const agent = [a, b][winner]!;
      expect(answers[winner]!.body.user).toMatchObject({ role: 'owner', email: users[0]!.email, organisationName: (await Organisation.findOne())!.name });
      agent.csrf = answers[winner]!.body.csrfToken;
      expect((await agent.get('/api/auth/me').expect(200)).body.role).toBe('owner');
      // The owner can sign in again later with the password chosen.
      const again = await call(await visitor(server), 'post', '/api/auth/sign-in', { email: users[0]!.email, password: STRONG });
      expect(again.status).toBe(200);

      const reused = await call(await visitor(server), 'post', '/api/setup/first-owner', body(token));
      expect(reused.status).toBe(409);
      expect(reused.body.error.code).toBe('setup_closed');
      expect((await agent.get('/api/setup').expect(200)).body).toEqual({ firstOwnerNeeded: false });
      return token;
    });
    await withServer(env, async (server) => {
      expect(server.firstOwnerLink).toBeNull();
      expect((await call(await visitor(server), 'post', '/api/setup/first-owner', body(token))).status).toBe(409);
    });
  });
});

describe('first-owner set-up once an organisation exists', () => {
  const env = useTestApp({ DEMO: 'false' });

  it('refuses a link opened before the organisation was made, whatever the token, and opens none at the next start', async () => {
    await withServer(env, async (server) => {
      const early = tokenOf(server.firstOwnerLink!);
      await makeOrganisation({ ...env, ctx: server.ctx }, { farms: 1 });
      const agent = await visitor(server);
      for (const token of [early, 'q'.repeat(43)]) {
        const res = await call(agent, 'post', '/api/setup/first-owner', body(token, { organisationName: 'Another Co-op', email: 'another@tarnridge.test' }));
        expect(res.status).toBe(409);
        expect(res.body.error.code).toBe('setup_closed');
      }
      expect((await call(agent, 'post', '/api/setup/first-owner', {})).status).toBe(409);
      expect(await server.ctx.db.models.Organisation.count()).toBe(1);
    });
    await withServer(env, async (server) => {
      expect(server.firstOwnerLink).toBeNull();
      expect(await server.ctx.db.models.SetupToken.count()).toBe(0);
      expect((await server.ctx.db.models.User.findAll()).map((u) => u.role).sort()).toEqual(['buyer', 'manager', 'owner', 'worker']);
    });
  });
});
