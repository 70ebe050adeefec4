// Test data made per test: an organisation with farms and one user per role, and signed-in
// supertest agents that carry the session cookie and CSRF token like the browser client does.
import { randomBytes } from 'node:crypto';
import request from 'supertest';
import type { Role } from '@shared/schemas';
import type { TestEnv } from './db';
import { hashPassword } from '../../server/services/passwords';

export const PASSWORD = 'correct-horse-battery';
let passwordHash: Promise<string> | undefined;

export interface OrgFixture {
  organisationId: number;
  farmIds: number[];
  users: Record<Role, { id: number; email: string }>;
}

/** An organisation with `farms` farms; the worker and buyer are given the first farm only. */
export async function makeOrganisation(env: TestEnv, opts: { farms?: number } = {}): Promise<OrgFixture> {
  const { Organisation, Farm, User, FarmAccess } = env.ctx.db.models;
  passwordHash ??= hashPassword(PASSWORD);
  const hash = await passwordHash;
  const tag = randomBytes(4).toString('hex');
  const org = await Organisation.create({ name: `Test co-op ${tag}` });
  const farmIds: number[] = [];
  for (let i = 0; i < (opts.farms ?? 2); i++) {
    farmIds.push((await Farm.create({ organisationId: org.id, name: `Farm ${i + 1} ${tag}`, timeZone: 'Europe/Dublin', location: '', archivedAt: null })).id);
  }
  const users = {} as OrgFixture['users'];
  for (const role of ['owner', 'manager', 'worker', 'buyer'] as Role[]) {
    const email = `${role}-${tag}@test.example`;
    const u = await User.create({ organisationId: org.id, email, name: `${role} ${tag}`, role, passwordHash: hash, lastSignInAt: null });
    users[role] = { id: u.id, email };
    if (role === 'worker' || role === 'buyer') await FarmAccess.create({ userId: u.id, farmId: farmIds[0], organisationId: org.id });
  }
  return { organisationId: org.id, farmIds, users };
}

export type Agent = ReturnType<typeof request.agent> & { csrf: string };

/** A supertest agent with a session but nobody signed in, holding a CSRF token. */
export async function anonymousAgent(env: TestEnv): Promise<Agent> {
  const agent = request.agent(env.app) as Agent;
  const res = await agent.get('/api/auth/session').expect(200);
  agent.csrf = res.body.csrfToken;
  return agent;
}

/** A supertest agent signed in as `email`. */
export async function signedIn(env: TestEnv, email: string, password = PASSWORD): Promise<Agent> {
  const agent = await anonymousAgent(env);
  const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', agent.csrf).send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  agent.csrf = res.body.csrfToken;
  return agent;
}

/** Sends a request through an agent with its CSRF token. */
export function call(agent: Agent, method: 'get' | 'post' | 'patch' | 'put' | 'delete', url: string, body?: object) {
  const req = agent[method](url).set('x-csrf-token', agent.csrf);
  return body === undefined ? req : req.send(body);
}
