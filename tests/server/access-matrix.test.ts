// The access matrix: every API route × role × target (own farm, another farm of the same
// organisation, another organisation) with the status the server must answer. The route list
// comes from the app itself, so a new route without a row here fails the first test.
import { createHash } from 'node:crypto';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
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
  /** A supplier, an input and a draft order on each target farm. */
  stock: Record<Scope, { supplierId: number; inputId: number; orderId: number; lastLineId: number }>;
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
/** Buying: owners, managers and buyers (buyers only on their farms); workers 403. */
const purchasing = (ok: Expect, buyer: Expect = ok): Record<Who, Expect> => ({ owner: ok, manager: ok, worker: 403, buyer, anonymous: 401 });
const ownerOnly = (ok: Expect): Record<Who, Expect> => ({ owner: ok, manager: 403, worker: 403, buyer: 403, anonymous: 401 });
let seq = 0;

const ROWS: Row[] = [
  { route: 'GET /api/health', url: () => '/api/health', expect: same(200) },
  { route: 'GET /api/auth/session', url: () => '/api/auth/session', expect: same(200) },
  { route: 'GET /api/auth/me', url: () => '/api/auth/me', expect: signedInOnly(200) },
  { route: 'PATCH /api/auth/me', url: () => '/api/auth/me', body: () => ({ unitSystem: 'metric' }), expect: signedInOnly(200) },
  { route: 'GET /api/auth/me/text-failures', url: () => '/api/auth/me/text-failures', expect: signedInOnly(200) },
  // The SMS service's webhooks take no session: without the service's signature everyone is refused.
  { route: 'POST /api/texts/inbound', url: () => '/api/texts/inbound', body: () => ({ From: '+61491570156', Body: 'STOP' }), expect: same(403) },
  { route: 'POST /api/texts/status', url: () => '/api/texts/status', body: () => ({ MessageSid: 'SM0', MessageStatus: 'failed' }), expect: same(403) },
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
  { route: 'GET /api/setup', url: () => '/api/setup', expect: same(200) },
  // Organisations exist here: the first-owner set-up is closed to everyone, whatever the token.
  {
    route: 'POST /api/setup/first-owner',
    url: () => '/api/setup/first-owner',
    body: () => ({ token: 'z'.repeat(43), organisationName: 'Matrix Co-op', name: 'Matrix Owner', email: `first-${++seq}@test.example`, password: 'kettle heron basalt plum' }),
    expect: same(409),
  },
  { route: 'GET /api/farms', url: () => '/api/farms', expect: signedInOnly(200) },
  { route: 'GET /api/farms/:id', url: (w, s) => `/api/farms/${farm(w, s)}`, expect: farmRead(200) },
  { route: 'GET /api/farms/:id/labels.pdf', url: (w, s) => `/api/farms/${farm(w, s)}/labels.pdf`, expect: farmRead(200) },
  { route: 'GET /api/farms/:id/frost', url: (w, s) => `/api/farms/${farm(w, s)}/frost`, expect: farmRead(200) },
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
  { route: 'GET /api/tanks/:id/forecast', url: (w, s) => `/api/tanks/${tank(w, s)}/forecast`, expect: farmRead(200) },
  { route: 'GET /api/tanks/:id/contents', url: (w, s) => `/api/tanks/${tank(w, s)}/contents`, expect: farmRead(200) },
  { route: 'GET /api/tanks/:id/calibration', url: (w, s) => `/api/tanks/${tank(w, s)}/calibration?step=50`, expect: farmRead(200) },
  { route: 'GET /api/tanks/:id/calibrations', url: (w, s) => `/api/tanks/${tank(w, s)}/calibrations`, expect: farmRead(200) },
  { route: 'GET /api/tanks/:id/gauge-strip.pdf', url: (w, s) => `/api/tanks/${tank(w, s)}/gauge-strip.pdf?every=50&unit=metric&paper=a4`, expect: farmRead(200) },
  { route: 'GET /api/tanks/:id/label.pdf', url: (w, s) => `/api/tanks/${tank(w, s)}/label.pdf`, expect: farmRead(200) },
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
  // The matrix sends JSON, so no file comes with it: a caller allowed to import gets the 400 that names files.
  {
    route: 'POST /api/imports',
    url: () => '/api/imports',
    body: (w, s) => ({ tankId: tank(w, s), policy: 'reject-file', mapping: MATRIX_MAPPING }),
    expect: { ...farmRead(400), buyer: 403 },
  },
  { route: 'GET /api/imports', url: (w, s) => `/api/imports?farmId=${farm(w, s)}`, expect: farmRead(200) },
  { route: 'GET /api/imports/:id', url: async (w, s) => `/api/imports/${await freshImport(w, s, 'imported')}`, expect: farmRead(200) },
  { route: 'GET /api/imports/:id/rejected.csv', url: async (w, s) => `/api/imports/${await freshImport(w, s, 'imported')}/rejected.csv`, expect: farmRead(200) },
  { route: 'POST /api/imports/:id/retry', url: async (w, s) => `/api/imports/${await freshImport(w, s, 'failed')}/retry`, expect: { ...farmRead(200), buyer: 403 } },
  { route: 'GET /api/tanks/:id/import-mapping', url: async (w, s) => `/api/tanks/${await withSavedMapping(w, s)}/import-mapping`, expect: farmRead(200) },
  { route: 'GET /api/board', url: () => '/api/board', expect: signedInOnly(200) },
  { route: 'GET /api/board/history', url: () => '/api/board/history', expect: signedInOnly(200) },
  { route: 'GET /api/suppliers', url: () => '/api/suppliers', expect: signedInOnly(200) },
  { route: 'POST /api/suppliers', url: () => '/api/suppliers', body: () => ({ name: `Matrix supplier ${++seq}`, email: 'orders@matrix.example' }), expect: purchasing(201) },
  { route: 'PATCH /api/suppliers/:id', url: (w, s) => `/api/suppliers/${w.stock[s].supplierId}`, body: () => ({ phone: '555 0100' }), expect: purchasing({ own: 200, 'other-farm': 200, 'other-org': 404 }) },
  { route: 'GET /api/inputs', url: (w, s) => `/api/inputs?farmId=${farm(w, s)}`, expect: farmRead(200) },
  { route: 'GET /api/inputs/:id', url: (w, s) => `/api/inputs/${w.stock[s].inputId}`, expect: farmRead(200) },
  {
    route: 'POST /api/inputs',
    url: () => '/api/inputs',
    body: (w, s) => ({ farmId: farm(w, s), name: 'Matrix input', unit: 'kg', category: 'amendment' }),
    expect: purchasing({ own: 201, 'other-farm': 201, 'other-org': 404 }, { own: 201, 'other-farm': 403, 'other-org': 404 }),
  },
  { route: 'PATCH /api/inputs/:id', url: (w, s) => `/api/inputs/${w.stock[s].inputId}`, body: () => ({ notes: 'matrix' }), expect: purchasing({ own: 200, 'other-farm': 200, 'other-org': 404 }, { own: 200, 'other-farm': 403, 'other-org': 404 }) },
  { route: 'GET /api/inputs/:id/movements', url: (w, s) => `/api/inputs/${w.stock[s].inputId}/movements`, expect: farmRead(200) },
  { route: 'POST /api/inputs/:id/movements', url: (w, s) => `/api/inputs/${w.stock[s].inputId}/movements`, body: () => ({ kind: 'count', quantity: 50 }), expect: farmRead(201) },
  { route: 'GET /api/orders', url: () => '/api/orders', expect: purchasing(200) },
  { route: 'GET /api/orders/:id', url: (w, s) => `/api/orders/${w.stock[s].orderId}`, expect: purchasing({ own: 200, 'other-farm': 200, 'other-org': 404 }, { own: 200, 'other-farm': 403, 'other-org': 404 }) },
  {
    route: 'POST /api/orders',
    url: () => '/api/orders',
    body: (w, s) => ({ supplierId: w.stock[s].supplierId, farmId: farm(w, s), lines: [{ inputId: w.stock[s].inputId, quantity: 5 }] }),
    expect: purchasing({ own: 201, 'other-farm': 201, 'other-org': 404 }, { own: 201, 'other-farm': 403, 'other-org': 404 }),
  },
  { route: 'POST /api/orders/from-suggestions', url: () => '/api/orders/from-suggestions', body: (w, s) => ({ farmId: farm(w, s), inputIds: [w.stock[s].inputId] }), expect: purchasing({ own: 201, 'other-farm': 201, 'other-org': 404 }, { own: 201, 'other-farm': 403, 'other-org': 404 }) },
  { route: 'PATCH /api/orders/:id', url: async (w, s) => `/api/orders/${await freshOrder(w, s)}`, body: () => ({ notes: 'matrix' }), expect: purchasing({ own: 200, 'other-farm': 200, 'other-org': 404 }, { own: 200, 'other-farm': 403, 'other-org': 404 }) },
  { route: 'POST /api/orders/:id/send', url: async (w, s) => `/api/orders/${await freshOrder(w, s)}/send`, expect: purchasing({ own: 200, 'other-farm': 200, 'other-org': 404 }, { own: 200, 'other-farm': 403, 'other-org': 404 }) },
  { route: 'POST /api/orders/:id/cancel', url: async (w, s) => `/api/orders/${await freshOrder(w, s)}/cancel`, expect: purchasing({ own: 200, 'other-farm': 200, 'other-org': 404 }, { own: 200, 'other-farm': 403, 'other-org': 404 }) },
  {
    route: 'POST /api/orders/:id/close-short',
    url: async (w, s) => `/api/orders/${await freshOrder(w, s, 'part-received')}/close-short`,
    body: () => ({ reason: 'the rest is out of stock at the supplier' }),
    expect: purchasing({ own: 200, 'other-farm': 200, 'other-org': 404 }, { own: 200, 'other-farm': 403, 'other-org': 404 }),
  },
  { route: 'GET /api/organisation', url: () => '/api/organisation', expect: signedInOnly(200) },
  { route: 'PATCH /api/organisation', url: () => '/api/organisation', body: () => ({ currency: 'EUR' }), expect: ownerOnly(200) },
  {
    route: 'POST /api/orders/:id/receipts',
    url: async (w, s) => `/api/orders/${await freshOrder(w, s, 'sent')}/receipts`,
    body: (w, s) => ({ lines: [{ lineId: w.stock[s].lastLineId, quantity: 1 }] }),
    expect: purchasing({ own: 200, 'other-farm': 200, 'other-org': 404 }, { own: 200, 'other-farm': 403, 'other-org': 404 }),
  },
  { route: 'GET /api/flags', url: (w, s) => `/api/flags?farmId=${farm(w, s)}`, expect: signedInOnly(200) },
  {
    route: 'POST /api/flags/:id/acknowledge',
    url: async (w, s) => `/api/flags/${await freshFlag(w, s)}/acknowledge`,
    body: () => ({ note: 'seen by the matrix' }),
    expect: { ...farmRead(200), buyer: { own: 403, 'other-farm': 403, 'other-org': 404 } },
  },
  {
    route: 'POST /api/flags/:id/clear',
    url: async (w, s) => `/api/flags/${await freshFlag(w, s, 'frost-risk')}/clear`,
    body: () => ({ note: 'tank drained by the matrix' }),
    expect: managersOnly({ own: 200, 'other-farm': 200, 'other-org': 404 }),
  },
  { route: 'GET /api/brews', url: (w, s) => `/api/brews?farmId=${farm(w, s)}`, expect: signedInOnly(200) },
  { route: 'POST /api/brews', url: () => '/api/brews', body: (w, s) => ({ tankId: tank(w, s), kind: 'culture', name: `Matrix brew ${++seq}`, waterL: 10 }), expect: { ...farmRead(201), buyer: 403 } },
  { route: 'PATCH /api/brews/:id', url: async (w, s) => `/api/brews/${await freshBrew(w, s)}`, body: () => ({ notes: 'matrix' }), expect: { ...farmRead(200), buyer: 403 } },
  { route: 'POST /api/brews/:id/temperatures', url: async (w, s) => `/api/brews/${await freshBrew(w, s)}/temperatures`, body: () => ({ temperatureC: 21 }), expect: { ...farmRead(201), buyer: 403 } },
  // Development-only mail outbox; not mounted in production (see the config test).
  { route: 'GET /api/dev/outbox', url: () => '/api/dev/outbox', expect: purchasing(200) },
  { route: 'GET /api/dev/outbox/:id/attachments/:index', url: () => '/api/dev/outbox/no-such-mail/attachments/0', expect: purchasing(404) },
  { route: 'DELETE /api/dev/outbox', url: () => '/api/dev/outbox', expect: managersOnly(204) },
];

const env = useTestApp({ SIGN_IN_LIMIT_PER_IP: '100000', SIGN_IN_LIMIT_PER_ACCOUNT_AND_IP: '100000', SIGN_IN_LIMIT_PER_ACCOUNT: '100000' });
const world = {} as World;

/** A new order on the scope's farm (each state change needs its own); remembers its line for receipts. */
async function freshOrder(w: World, s: Scope, status: 'draft' | 'sent' | 'part-received' = 'draft'): Promise<number> {
  const { PurchaseOrder, PurchaseOrderLine, Input } = env.ctx.db.models;
  const input = (await Input.findByPk(w.stock[s].inputId))!;
  const o = await PurchaseOrder.create({ organisationId: input.organisationId, farmId: input.farmId, supplierId: w.stock[s].supplierId, number: `MX-${++seq}`, status, notes: '', sentAt: null, createdById: null });
  w.stock[s].lastLineId = (await PurchaseOrderLine.create({ orderId: o.id, inputId: input.id, quantity: 10, unitPrice: 1 })).id;
  return o.id;
}

/** A new brew in the scope's tank. */
async function freshBrew(w: World, s: Scope): Promise<number> {
  const t = (await env.ctx.db.models.Tank.findByPk(w.tanks[s]))!;
  return (await env.ctx.db.models.Brew.create({ organisationId: t.organisationId, farmId: t.farmId, tankId: t.id, kind: 'culture', name: 'Fixture brew', status: 'brewing', startedAt: new Date(), readyAt: null, waterL: 10, dilution: null, notes: '', createdById: null })).id;
}

/** A new open tank flag on the scope's farm. */
async function freshFlag(w: World, s: Scope, only?: 'frost-risk' | 'cold-culture'): Promise<number> {
  const t = (await env.ctx.db.models.Tank.findByPk(w.tanks[s]))!;
  const kinds = only ? [only] : (['low-stock', 'stale-tank', 'cold-culture', 'frost-risk', 'overfill', 'suspected-leak'] as const);
  const now = new Date();
  // A different tank-less subject id each time keeps one active flag per kind and subject.
  return (await env.ctx.db.models.Flag.create({ organisationId: t.organisationId, farmId: t.farmId, kind: kinds[seq % kinds.length], subjectType: 'tank', subjectId: 100_000 + ++seq, status: 'open', activeKey: 1, message: 'matrix', value: null, raisedAt: now, lastSeenAt: now, acknowledgedAt: null, acknowledgedById: null, ackNote: null, clearedAt: null })).id;
}

/** A new reading on the scope's tank (each correction case needs its own). */
async function freshReading(w: World, s: Scope): Promise<number> {
  const t = (await env.ctx.db.models.Tank.findByPk(w.tanks[s]))!;
  const r = await env.ctx.db.models.Reading.create({ organisationId: t.organisationId, farmId: t.farmId, tankId: t.id, takenAt: new Date(Date.now() - ++seq * 1000), source: 'round', levelMm: 500, grossL: 392.7, usableL: 392.7, temperatureC: null, calibrationVersion: t.calibrationVersion, enteredById: null, importId: null, idempotencyKey: null });
  return r.id;
}
const MATRIX_MAPPING = { delimiter: ',', decimalComma: false, hasHeader: true, timestamp: { column: 'time', format: 'iso8601', time: null }, value: { column: 'level_mm', kind: 'level', unit: 'mm' }, temperature: null } as const;

/** An import on the scope's tank with its file in the upload folder (a failed one can be retried). */
async function freshImport(w: World, s: Scope, status: 'imported' | 'failed'): Promise<number> {
  const t = (await env.ctx.db.models.Tank.findByPk(w.tanks[s]))!;
  const storedName = `matrix-${++seq}.csv`;
  const content = `time,level_mm\n${new Date(Date.UTC(2025, 0, 1) + seq * 60_000).toISOString()},500\n`;
  mkdirSync(env.ctx.config.uploadDir, { recursive: true });
  writeFileSync(join(env.ctx.config.uploadDir, storedName), content);
  const r = await env.ctx.db.models.LoggerImport.create({ organisationId: t.organisationId, farmId: t.farmId, tankId: t.id, uploadedById: null, originalName: 'matrix.csv', storedName, sizeBytes: content.length, sha256: createHash('sha256').update(content).digest('hex'), mapping: MATRIX_MAPPING, policy: 'reject-file', status, delimiter: null, error: null, duplicateOfId: null, startedAt: null, finishedAt: null });
  return r.id;
}

/** The scope's tank id, with a saved import mapping. */
async function withSavedMapping(w: World, s: Scope): Promise<number> {
  const t = (await env.ctx.db.models.Tank.findByPk(w.tanks[s]))!;
  await env.ctx.db.models.TankImportMapping.upsert({ tankId: t.id, organisationId: t.organisationId, mapping: MATRIX_MAPPING, policy: 'reject-file', savedById: null, savedAt: new Date() });
  return t.id;
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
  const makeStock = async (org: OrgFixture, farmId: number) => {
    const { Supplier, Input, StockMovement } = env.ctx.db.models;
    const supplier = await Supplier.create({ organisationId: org.organisationId, name: 'Fixture supplier', contactName: '', email: 'orders@fixture.example', phone: '', leadTimeDays: 5, notes: '', archivedAt: null });
    const input = await Input.create({ organisationId: org.organisationId, farmId, name: 'Fixture input', unit: 'L', category: 'fertilizer', supplierId: supplier.id, leadTimeDays: null, serviceLevel: 0.95, orderCost: 10, holdingCostPerYear: 1, unitPrice: 2, packSize: 1, minimumOrder: 0, notes: '', archivedAt: null });
    await StockMovement.create({ organisationId: org.organisationId, farmId, inputId: input.id, kind: 'use', quantity: 0.5, at: new Date(Date.now() - 86_400_000), reason: '', orderId: null, orderLineId: null, brewId: null, byUserId: null });
    const stock = { supplierId: supplier.id, inputId: input.id, orderId: 0, lastLineId: 0 };
    return stock;
  };
  world.stock = { own: await makeStock(world.a, world.a.farmIds[0]), 'other-farm': await makeStock(world.a, world.a.farmIds[1]), 'other-org': await makeStock(world.b, world.b.farmIds[0]) };
  for (const s of SCOPES) world.stock[s].orderId = await freshOrder(world, s);
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
