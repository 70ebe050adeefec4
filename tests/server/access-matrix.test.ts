// The access matrix: every API route × role × target (own farm, another farm of the same
// organisation, another organisation) with the status the server must answer. The route list
// comes from the app itself, so a new route without a row here fails the first test.
import { beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '@shared/schemas';
import { useTestApp } from '../support/db';
import { anonymousAgent, call, makeOrganisation, signedIn, type Agent, type OrgFixture } from '../support/fixtures';

type Who = Role | 'anonymous';
type Scope = 'own' | 'other-farm' | 'other-org';
type Method = 'get' | 'post' | 'patch' | 'put' | 'delete';
interface World {
  a: OrgFixture & { pendingId: number };
  b: OrgFixture & { pendingId: number };
  /** A tank on each target farm. */
  tanks: Record<Scope, number>;
}
type Expect = number | Partial<Record<Scope, number>>;
interface Row {
  route: string;
  url: (w: World, s: Scope) => string | Promise<string>;
  body?: (w: World, s: Scope, who: Who) => object;
  /** The agent's session changes (sign-in, sign-out): use a fresh one for this row. */
  fresh?: boolean;
  expect: Record<Who, Expect>;
}

const WHO: Who[] = ['owner', 'manager', 'worker', 'buyer', 'anonymous'];
const SCOPES: Scope[] = ['own', 'other-farm', 'other-org'];
const farm = (w: World, s: Scope) => (s === 'own' ? w.a.farmIds[0] : s === 'other-farm' ? w.a.farmIds[1] : w.b.farmIds[0]);
const person = (w: World, s: Scope) => (s === 'other-org' ? w.b.users.buyer.id : w.a.users.buyer.id);
const pending = (w: World, s: Scope) => (s === 'other-org' ? w.b.pendingId : w.a.pendingId);
const tank = (w: World, s: Scope) => w.tanks[s];
const TANK_GEOMETRY = { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1500 };
const same = (n: number): Record<Who, Expect> => ({ owner: n, manager: n, worker: n, buyer: n, anonymous: n });
const signedInOnly = (n: number): Record<Who, Expect> => ({ ...same(n), anonymous: 401 });
/** Farm-scoped read: owners and managers see every farm of their organisation, workers and buyers only theirs. */
const farmRead = (ok: number): Record<Who, Expect> => ({
  owner: { own: ok, 'other-farm': ok, 'other-org': 404 },
  manager: { own: ok, 'other-farm': ok, 'other-org': 404 },
  worker: { own: ok, 'other-farm': 403, 'other-org': 404 },
  buyer: { own: ok, 'other-farm': 403, 'other-org': 404 },
  anonymous: 401,
});
const managersOnly = (ok: Expect): Record<Who, Expect> => ({ owner: ok, manager: ok, worker: 403, buyer: 403, anonymous: 401 });
const ownerOnly = (ok: Expect): Record<Who, Expect> => ({ owner: ok, manager: 403, worker: 403, buyer: 403, anonymous: 401 });
let seq = 0;

const ROWS: Row[] = [
  { route: 'GET /api/health', url: () => '/api/health', expect: same(200) },
  { route: 'GET /api/auth/session', url: () => '/api/auth/session', expect: same(200) },
  { route: 'GET /api/auth/me', url: () => '/api/auth/me', expect: signedInOnly(200) },
  { route: 'PATCH /api/auth/me', url: () => '/api/auth/me', body: () => ({ unitSystem: 'metric' }), expect: signedInOnly(200) },
  {
    route: 'POST /api/auth/sign-in',
    url: () => '/api/auth/sign-in',
    body: (w, _s, who) => ({ email: who === 'anonymous' ? 'nobody@test.example' : w.a.users[who].email, password: 'correct-horse-battery' }),
    fresh: true,
    expect: { ...same(200), anonymous: 401 },
  },
  { route: 'POST /api/auth/sign-out', url: () => '/api/auth/sign-out', fresh: true, expect: same(204) },
  { route: 'POST /api/auth/password-reset', url: () => '/api/auth/password-reset', body: () => ({ email: 'nobody@test.example' }), expect: same(202) },
  { route: 'GET /api/auth/tokens/:token', url: () => `/api/auth/tokens/${'x'.repeat(43)}`, expect: same(404) },
  { route: 'POST /api/auth/set-password', url: () => '/api/auth/set-password', body: () => ({ token: 'y'.repeat(43), password: 'long-enough-pw' }), expect: same(404) },
  { route: 'GET /api/farms', url: () => '/api/farms', expect: signedInOnly(200) },
  { route: 'GET /api/farms/:id', url: (w, s) => `/api/farms/${farm(w, s)}`, expect: farmRead(200) },
  { route: 'POST /api/farms', url: () => '/api/farms', body: () => ({ name: `New farm ${++seq}`, timeZone: 'Europe/Dublin' }), expect: managersOnly(201) },
  { route: 'PATCH /api/farms/:id', url: (w, s) => `/api/farms/${farm(w, s)}`, body: () => ({ location: 'checked by the matrix' }), expect: managersOnly({ own: 200, 'other-farm': 200, 'other-org': 404 }) },
  { route: 'GET /api/people', url: () => '/api/people', expect: ownerOnly(200) },
  {
    route: 'POST /api/invitations',
    url: () => '/api/invitations',
    body: (w, s) => ({ email: `matrix-${++seq}@test.example`, name: 'Matrix Person', role: 'worker', farmIds: [farm(w, s)] }),
    expect: ownerOnly({ own: 201, 'other-farm': 201, 'other-org': 422 }),
  },
  { route: 'POST /api/people/:id/invitation', url: (w, s) => `/api/people/${pending(w, s)}/invitation`, expect: ownerOnly({ own: 202, 'other-farm': 202, 'other-org': 404 }) },
  {
    route: 'PATCH /api/people/:id',
    url: (w, s) => `/api/people/${person(w, s)}`,
    body: (w) => ({ farmIds: [w.a.farmIds[0]] }),
    expect: ownerOnly({ own: 200, 'other-farm': 200, 'other-org': 404 }),
  },
  { route: 'GET /api/tanks', url: (w, s) => `/api/tanks?farmId=${farm(w, s)}`, expect: farmRead(200) },
  { route: 'GET /api/tanks/:id', url: (w, s) => `/api/tanks/${tank(w, s)}`, expect: farmRead(200) },
  {
    route: 'POST /api/tanks',
    url: () => '/api/tanks',
    body: (w, s) => ({ farmId: farm(w, s), name: 'Matrix tank', code: `MX${++seq}`, contents: 'water', geometry: TANK_GEOMETRY }),
    expect: managersOnly({ own: 201, 'other-farm': 201, 'other-org': 404 }),
  },
  { route: 'PATCH /api/tanks/:id', url: (w, s) => `/api/tanks/${tank(w, s)}`, body: () => ({ lowStockL: 100 }), expect: managersOnly({ own: 200, 'other-farm': 200, 'other-org': 404 }) },
  { route: 'GET /api/tanks/:id/contents', url: (w, s) => `/api/tanks/${tank(w, s)}/contents`, expect: farmRead(200) },
  { route: 'GET /api/tanks/:id/calibration', url: (w, s) => `/api/tanks/${tank(w, s)}/calibration?step=50`, expect: farmRead(200) },
  { route: 'GET /api/tanks/:id/gauge-strip.pdf', url: (w, s) => `/api/tanks/${tank(w, s)}/gauge-strip.pdf?every=50&unit=metric&paper=a4`, expect: farmRead(200) },
  {
    route: 'POST /api/rounds',
    url: () => '/api/rounds',
    body: (w, s) => ({ farmId: farm(w, s), entries: [{ tankId: tank(w, s), readingMm: 400, idempotencyKey: `matrix${++seq}x` }] }),
    expect: { ...farmRead(201), buyer: 403 },
  },
  { route: 'GET /api/tanks/:id/readings', url: (w, s) => `/api/tanks/${tank(w, s)}/readings`, expect: farmRead(200) },
  { route: 'GET /api/tanks/:id/series', url: (w, s) => `/api/tanks/${tank(w, s)}/series?bucket=day`, expect: farmRead(200) },
  {
    route: 'POST /api/readings/:id/correction',
    url: async (w, s) => `/api/readings/${await freshReading(w, s)}/correction`,
    body: () => ({ readingMm: 300, note: 'matrix correction' }),
    expect: { ...farmRead(201), buyer: 403 },
  },
  { route: 'GET /api/board', url: () => '/api/board', expect: signedInOnly(200) },
  { route: 'GET /api/board/history', url: () => '/api/board/history', expect: signedInOnly(200) },
  // Development-only mail outbox; not mounted in production (see the config test).
  { route: 'GET /api/dev/outbox', url: () => '/api/dev/outbox', expect: same(200) },
  { route: 'DELETE /api/dev/outbox', url: () => '/api/dev/outbox', expect: same(204) },
];

const env = useTestApp({ SIGN_IN_LIMIT_PER_IP: '100000', SIGN_IN_LIMIT_PER_ACCOUNT: '100000' });
const world = {} as World;

/** A new reading on the scope's tank (each correction case needs its own). */
async function freshReading(w: World, s: Scope): Promise<number> {
  const t = (await env.ctx.db.models.Tank.findByPk(w.tanks[s]))!;
  const r = await env.ctx.db.models.Reading.create({ organisationId: t.organisationId, farmId: t.farmId, tankId: t.id, takenAt: new Date(Date.now() - ++seq * 1000), source: 'round', levelMm: 500, grossL: 392.7, usableL: 392.7, temperatureC: null, calibrationVersion: t.calibrationVersion, enteredById: null, importId: null, idempotencyKey: null });
  return r.id;
}
const agents = {} as Record<Who, Agent>;

async function withPending(org: OrgFixture) {
  const u = await env.ctx.db.models.User.create({ organisationId: org.organisationId, email: `pending-${org.organisationId}@test.example`, name: 'Pending', role: 'worker', passwordHash: null, lastSignInAt: null });
  return { ...org, pendingId: u.id };
}

async function agentFor(who: Who): Promise<Agent> {
  return who === 'anonymous' ? anonymousAgent(env) : signedIn(env, world.a.users[who].email);
}

beforeAll(async () => {
  world.a = await withPending(await makeOrganisation(env, { farms: 2 }));
  world.b = await withPending(await makeOrganisation(env, { farms: 1 }));
  const { Tank } = env.ctx.db.models;
  const makeTank = async (org: OrgFixture, farmId: number) =>
    (await Tank.create({ organisationId: org.organisationId, farmId, name: 'Fixture', code: 'FX', contents: 'water', contentsNote: '', geometry: TANK_GEOMETRY as never, datumOffsetMm: 0, outletHeightMm: 0, safeFillLevelMm: 1500, lowStockL: 0, specificGravity: 1, sensorHeightMm: null, walkOrder: 0, calibrationVersion: 'fixture', archivedAt: null })).id;
  world.tanks = { own: await makeTank(world.a, world.a.farmIds[0]), 'other-farm': await makeTank(world.a, world.a.farmIds[1]), 'other-org': await makeTank(world.b, world.b.farmIds[0]) };
  for (const who of WHO) agents[who] = await agentFor(who);
});

describe('access matrix', () => {
  it('has a row for every API route the app serves', () => {
    const routes: string[] = env.app.locals.apiRoutes;
    const covered = new Set(ROWS.map((r) => r.route));
    expect(routes.filter((r) => !covered.has(r))).toEqual([]);
    expect([...covered].filter((r) => !routes.includes(r))).toEqual([]);
  });

  const cases = ROWS.flatMap((row) => WHO.flatMap((who) => SCOPES.map((scope) => ({ row, who, scope }))));
  it.each(cases.map((c) => [`${c.row.route} as ${c.who} on ${c.scope}`, c] as const))('%s', async (_name, { row, who, scope }) => {
    const want = typeof row.expect[who] === 'number' ? row.expect[who] : row.expect[who][scope];
    const agent = row.fresh ? await agentFor(who) : agents[who];
    const [method, ...rest] = row.route.split(' ');
    void rest;
    const res = await call(agent, method.toLowerCase() as Method, await row.url(world, scope), row.body?.(world, scope, who));
    expect(res.status, JSON.stringify(res.body)).toBe(want);
  });

  it('lists only the farms a worker was given, and none of another organisation', async () => {
    const res = await agents.worker.get('/api/farms').expect(200);
    expect(res.body.map((f: { id: number }) => f.id)).toEqual([world.a.farmIds[0]]);
    const owner = await agents.owner.get('/api/farms').expect(200);
    const ids = owner.body.map((f: { id: number }) => f.id);
    expect(ids).toEqual(expect.arrayContaining(world.a.farmIds));
    expect(ids).not.toContain(world.b.farmIds[0]);
  });
});
