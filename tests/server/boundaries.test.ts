// Boundary values through every JSON body of the API. For each route a valid body is taken apart field
// by field (nested list items and objects too) and each field gets the values that break things:
// negative, zero, just past the schema's bounds, NaN and Infinity as text, 1e308, huge and unicode
// strings, SQL-looking text, null, lists and objects in place of scalars. The field list and the bounds
// come from the shared zod schemas the routes parse with. Every answer must be below 500; a 400 names
// the field in both `field` and the message; a refused request changes no stored row; nonsense is
// never accepted; and text that is accepted is stored exactly as sent (trimmed). Query strings of the
// list routes and the :id of every route get the same treatment.
import { gzipSync } from 'node:zlib';
import { QueryTypes } from 'sequelize';
import { settleDeferred } from '../../server/deferred';
import { z } from 'zod';
import { beforeAll, describe, expect, it } from 'vitest';
import {
  brewCreateSchema,
  brewListQuerySchema,
  brewTemperatureSchema,
  calibrationQuerySchema,
  brewUpdateSchema,
  correctionSchema,
  farmCreateSchema,
  farmUpdateSchema,
  flagAckSchema,
  flagClearSchema,
  flagListQuerySchema,
  farmLabelsQuerySchema,
  gaugeStripQuerySchema,
  importListQuerySchema,
  inputCreateSchema,
  inputListQuerySchema,
  inputUpdateSchema,
  invitationSchema,
  movementCreateSchema,
  orderCreateSchema,
  orderFromSuggestionsSchema,
  orderReceiptSchema,
  orderCloseShortSchema,
  organisationSettingsSchema,
  orderUpdateSchema,
  passwordResetSchema,
  personUpdateSchema,
  profileSchema,
  readingsQuerySchema,
  roundSubmitSchema,
  seriesQuerySchema,
  setPasswordSchema,
  signInSchema,
  supplierCreateSchema,
  supplierUpdateSchema,
  tankCreateSchema,
  tankLabelQuerySchema,
  tankUpdateSchema,
} from '@shared/schemas';
import { useTestApp } from '../support/db';
import { PASSWORD, anonymousAgent, call, makeOrganisation, signedIn, type Agent, type OrgFixture } from '../support/fixtures';
import { makeTank } from '../support/tanks';
import { SQL, UNICODE, fieldsOf, setAt, shapeOf, valuesFor, valuesUnder, type FieldInfo, type Path } from '../support/boundary-values';

type Method = 'post' | 'patch';
interface RouteCase {
  route: string;
  /** Which of several bodies of one route this is. */
  variant?: string;
  method: Method;
  url: () => string | Promise<string>;
  schema: z.ZodType;
  body: () => Record<string, unknown>;
  /** Sent without a signed-in session. */
  anonymous?: boolean;
  /** The url makes a fixture row of its own each call (a fresh reading or flag). */
  freshFixture?: boolean;
  /** Text fields the response does not echo (so "stored verbatim" is read from the database instead, or not at all). */
  noEcho?: string[];
}

const env = useTestApp({ SIGN_IN_LIMIT_PER_IP: '1000000', SIGN_IN_LIMIT_PER_ACCOUNT_AND_IP: '1000000', SIGN_IN_LIMIT_PER_ACCOUNT: '1000000' });
let org: OrgFixture;
let owner: Agent;
let anonymous: Agent;
let farmId: number;
let tankId: number;
let supplierId: number;
let inputId: number;
let seq = 0;
const ids = { draftOrder: 0, sentOrder: 0, sentLine: 0, brew: 0, buyer: 0, readingTank: 0 };

/** A checksum of every table a request could change (sessions aside: each request touches its own). */
let checksumSql: string | undefined;
async function snapshot(): Promise<string> {
  // Mail (and the link rows it makes) goes out after an answer: let it finish so it is not taken for the next request's change.
  await settleDeferred(env.ctx);
  if (!checksumSql) {
    const tables = (await env.ctx.db.sequelize.query<{ t: string }>("SELECT table_name AS t FROM information_schema.tables WHERE table_schema = DATABASE() AND table_name NOT IN ('sessions', 'umzug_meta', 'SequelizeMeta')", { type: QueryTypes.SELECT })).map((r) => r.t);
    checksumSql = `CHECKSUM TABLE ${tables.map((t) => `\`${t}\``).join(', ')}`;
  }
  const rows = await env.ctx.db.sequelize.query<{ Table: string; Checksum: number }>(checksumSql, { type: QueryTypes.SELECT });
  return rows.map((r) => `${r.Table}=${r.Checksum}`).join(' ');
}

async function freshReading(): Promise<number> {
  const t = (await env.ctx.db.models.Tank.findByPk(ids.readingTank))!;
  const r = await env.ctx.db.models.Reading.create({ organisationId: t.organisationId, farmId: t.farmId, tankId: t.id, takenAt: new Date(Date.now() - ++seq * 60_000), source: 'round', levelMm: 500, grossL: 392.7, usableL: 392.7, temperatureC: null, calibrationVersion: t.calibrationVersion, enteredById: null, importId: null, idempotencyKey: null });
  return r.id;
}

/** A new part-received order (closing one short ends it, so each case needs its own). */
async function freshPartReceivedOrder(): Promise<number> {
  const { PurchaseOrder, PurchaseOrderLine } = env.ctx.db.models;
  const o = await PurchaseOrder.create({ organisationId: org.organisationId, farmId, supplierId, number: `BD-${++seq}`, status: 'part-received', notes: '', sentAt: new Date(), createdById: null });
  await PurchaseOrderLine.create({ orderId: o.id, inputId, quantity: 10, unitPrice: 1, receivedQuantity: 4 });
  return o.id;
}

async function freshFlag(kind: 'low-stock' | 'frost-risk' = 'low-stock'): Promise<number> {
  const now = new Date();
  return (await env.ctx.db.models.Flag.create({ organisationId: org.organisationId, farmId, kind, subjectType: 'tank', subjectId: 200_000 + ++seq, status: 'open', activeKey: 1, message: 'boundary', value: null, raisedAt: now, lastSeenAt: now, acknowledgedAt: null, acknowledgedById: null, ackNote: null, clearedAt: null })).id;
}

const GEOMETRY = { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1500 };

const ROUTES: RouteCase[] = [
  { route: 'POST /api/farms', method: 'post', url: () => '/api/farms', schema: farmCreateSchema, body: () => ({ name: `Boundary farm ${++seq}`, timeZone: 'Europe/Dublin', location: 'North field' }) },
  { route: 'PATCH /api/farms/:id', method: 'patch', url: () => `/api/farms/${farmId}`, schema: farmUpdateSchema, body: () => ({ location: 'Hill' }) },
  {
    route: 'POST /api/tanks',
    method: 'post',
    url: () => '/api/tanks',
    schema: tankCreateSchema,
    body: () => ({ farmId, name: 'Boundary tank', code: `B${++seq}`, contents: 'water', geometry: GEOMETRY, outletHeightMm: 100, safeFillLevelMm: 1400, lowStockL: 50, contentsNote: 'rain' }),
  },
  { route: 'PATCH /api/tanks/:id', method: 'patch', url: () => `/api/tanks/${tankId}`, schema: tankUpdateSchema, body: () => ({ lowStockL: 100, contentsNote: 'topped up' }) },
  {
    route: 'POST /api/rounds',
    method: 'post',
    url: () => '/api/rounds',
    schema: roundSubmitSchema,
    body: () => ({ farmId, entries: [{ tankId: ids.readingTank, readingMm: 400, temperatureC: 12, note: 'ok', idempotencyKey: `boundary${++seq}key` }] }),
  },
  { route: 'POST /api/readings/:id/correction', method: 'post', url: async () => `/api/readings/${await freshReading()}/correction`, schema: correctionSchema, body: () => ({ readingMm: 300, note: 'misread the tube' }), freshFixture: true },
  // A mobile number is answered in E.164 (an empty one as null: no number), not as typed.
  { route: 'PATCH /api/auth/me', method: 'patch', url: () => '/api/auth/me', schema: profileSchema, body: () => ({ name: 'Owner', unitSystem: 'metric' }), noEcho: ['phone'] },
  { route: 'POST /api/invitations', method: 'post', url: () => '/api/invitations', schema: invitationSchema, body: () => ({ email: `boundary-${++seq}@test.example`, name: 'New Person', role: 'worker', farmIds: [farmId] }) },
  { route: 'PATCH /api/people/:id', method: 'patch', url: () => `/api/people/${ids.buyer}`, schema: personUpdateSchema, body: () => ({ farmIds: [farmId] }) },
  { route: 'POST /api/suppliers', method: 'post', url: () => '/api/suppliers', schema: supplierCreateSchema, body: () => ({ name: `Boundary supplier ${++seq}`, email: 'sales@boundary.example', phone: '555 0101', notes: 'weekly' }) },
  { route: 'PATCH /api/suppliers/:id', method: 'patch', url: () => `/api/suppliers/${supplierId}`, schema: supplierUpdateSchema, body: () => ({ phone: '555 0102' }) },
  { route: 'POST /api/inputs', method: 'post', url: () => '/api/inputs', schema: inputCreateSchema, body: () => ({ farmId, name: 'Boundary input', unit: 'kg', category: 'amendment', supplierId, notes: 'dry' }) },
  { route: 'PATCH /api/inputs/:id', method: 'patch', url: () => `/api/inputs/${inputId}`, schema: inputUpdateSchema, body: () => ({ notes: 'kept dry' }) },
  { route: 'POST /api/inputs/:id/movements', method: 'post', url: () => `/api/inputs/${inputId}/movements`, schema: movementCreateSchema, body: () => ({ kind: 'count', quantity: 50, reason: 'stock take' }) },
  { route: 'POST /api/inputs/:id/movements', variant: 'a signed adjustment', method: 'post', url: () => `/api/inputs/${inputId}/movements`, schema: movementCreateSchema, body: () => ({ kind: 'adjustment', quantity: -2, reason: 'spilt a bag' }) },
  { route: 'POST /api/orders', method: 'post', url: () => '/api/orders', schema: orderCreateSchema, body: () => ({ supplierId, farmId, lines: [{ inputId, quantity: 5, unitPrice: 2 }], notes: 'asap' }) },
  { route: 'POST /api/orders/from-suggestions', method: 'post', url: () => '/api/orders/from-suggestions', schema: orderFromSuggestionsSchema, body: () => ({ farmId, inputIds: [inputId] }) },
  { route: 'PATCH /api/orders/:id', method: 'patch', url: () => `/api/orders/${ids.draftOrder}`, schema: orderUpdateSchema, body: () => ({ notes: 'call first', lines: [{ inputId, quantity: 3 }] }) },
  { route: 'POST /api/orders/:id/receipts', method: 'post', url: () => `/api/orders/${ids.sentOrder}/receipts`, schema: orderReceiptSchema, body: () => ({ lines: [{ lineId: ids.sentLine, quantity: 0.001 }], note: 'part' }) },
  { route: 'POST /api/orders/:id/close-short', method: 'post', url: async () => `/api/orders/${await freshPartReceivedOrder()}/close-short`, schema: orderCloseShortSchema, body: () => ({ reason: 'rest out of stock' }), freshFixture: true },
  { route: 'PATCH /api/organisation', method: 'patch', url: () => '/api/organisation', schema: organisationSettingsSchema, body: () => ({ currency: 'NZD' }) },
  { route: 'POST /api/flags/:id/acknowledge', method: 'post', url: async () => `/api/flags/${await freshFlag()}/acknowledge`, schema: flagAckSchema, body: () => ({ note: 'ordered more' }), noEcho: ['note'], freshFixture: true },
  { route: 'POST /api/flags/:id/clear', method: 'post', url: async () => `/api/flags/${await freshFlag('frost-risk')}/clear`, schema: flagClearSchema, body: () => ({ note: 'tank drained for the winter' }), noEcho: ['note'], freshFixture: true },
  { route: 'POST /api/brews', method: 'post', url: () => '/api/brews', schema: brewCreateSchema, body: () => ({ tankId, kind: 'culture', name: `Boundary brew ${++seq}`, waterL: 10, dilution: { n: 10, convention: 'parts-water' }, inputs: [{ inputId, quantity: 0.5 }], notes: 'warm' }) },
  { route: 'PATCH /api/brews/:id', method: 'patch', url: () => `/api/brews/${ids.brew}`, schema: brewUpdateSchema, body: () => ({ notes: 'smells right' }) },
  { route: 'POST /api/brews/:id/temperatures', method: 'post', url: () => `/api/brews/${ids.brew}/temperatures`, schema: brewTemperatureSchema, body: () => ({ temperatureC: 21 }) },
  { route: 'POST /api/auth/sign-in', method: 'post', url: () => '/api/auth/sign-in', schema: signInSchema, body: () => ({ email: 'nobody@test.example', password: PASSWORD }), anonymous: true, noEcho: ['email', 'password'] },
  { route: 'POST /api/auth/password-reset', method: 'post', url: () => '/api/auth/password-reset', schema: passwordResetSchema, body: () => ({ email: 'nobody@test.example' }), anonymous: true, noEcho: ['email'] },
  { route: 'POST /api/auth/set-password', method: 'post', url: () => '/api/auth/set-password', schema: setPasswordSchema, body: () => ({ token: 'y'.repeat(43), password: 'long-enough-pw', name: 'Set' }), anonymous: true, noEcho: ['token', 'password', 'name'] },
];

beforeAll(async () => {
  org = await makeOrganisation(env, { farms: 1 });
  farmId = org.farmIds[0];
  owner = await signedIn(env, org.users.owner.email);
  anonymous = await anonymousAgent(env);
  tankId = (await makeTank(env, org, farmId, { code: 'BD' })).id;
  ids.readingTank = (await makeTank(env, org, farmId, { code: 'RD' })).id;
  ids.buyer = org.users.buyer.id;
  const { Supplier, Input, PurchaseOrder, PurchaseOrderLine, Brew } = env.ctx.db.models;
  supplierId = (await Supplier.create({ organisationId: org.organisationId, name: 'Fixture supplier', contactName: '', email: 'orders@fixture.example', phone: '', leadTimeDays: 5, notes: '', archivedAt: null })).id;
  inputId = (await Input.create({ organisationId: org.organisationId, farmId, name: 'Fixture input', unit: 'kg', category: 'fertilizer', supplierId, leadTimeDays: null, serviceLevel: 0.95, orderCost: 10, holdingCostPerYear: 1, unitPrice: 2, packSize: 1, minimumOrder: 0, notes: '', archivedAt: null })).id;
  const order = async (status: 'draft' | 'sent') => {
    const o = await PurchaseOrder.create({ organisationId: org.organisationId, farmId, supplierId, number: `BD-${++seq}`, status, notes: '', sentAt: status === 'sent' ? new Date() : null, createdById: null });
    const line = await PurchaseOrderLine.create({ orderId: o.id, inputId, quantity: 1_000_000, unitPrice: 1 });
    return { order: o.id, line: line.id };
  };
  ids.draftOrder = (await order('draft')).order;
  const sent = await order('sent');
  ids.sentOrder = sent.order;
  ids.sentLine = sent.line;
  ids.brew = (await Brew.create({ organisationId: org.organisationId, farmId, tankId, kind: 'culture', name: 'Fixture brew', status: 'brewing', startedAt: new Date(), readyAt: null, waterL: 10, dilution: null, notes: '', createdById: null })).id;
});

// ---- The checks -----------------------------------------------------------------------------

interface Outcome {
  route: string;
  field: string;
  value: string;
  problem: string;
}

async function probe(rc: RouteCase, path: Path, info: FieldInfo, value: unknown, nonsense: boolean, body: Record<string, unknown>, before: string): Promise<{ outcome: Outcome | null; after: string | null }> {
  const field = path.join('.');
  const agent = rc.anonymous ? anonymous : owner;
  const url = await rc.url();
  // The probe's own fixture rows (a fresh reading or flag) are part of "before".
  const start = rc.freshFixture ? await snapshot() : before;
  const res = await call(agent, rc.method, url, body);
  const shown = JSON.stringify(value)?.slice(0, 40) ?? String(value);
  const fail = (problem: string) => ({ outcome: { route: rc.route, field, value: shown, problem }, after: null });
  if (res.status >= 500) return fail(`answered ${res.status}: ${res.text.slice(0, 200)}`);
  if (/\bat .+\.(ts|js):\d+/.test(res.text)) return fail('the answer shows a stack trace');
  if (res.status >= 400) {
    const err = res.body?.error;
    if (typeof err?.message !== 'string' || err.message.length < 3) return fail(`${res.status} without a message`);
    if (res.status === 400) {
      if (typeof err.field !== 'string') return fail(`400 without a field: ${err.message}`);
      if (!err.message.startsWith(`${err.field}: `)) return fail(`400 message does not start with its field: ${err.message}`);
      // A value of the wrong type is about this field alone, so the answer names this field (or a part of it).
      const related = err.field === field || err.field.startsWith(`${field}.`) || field.startsWith(`${err.field}.`);
      if (nonsense && !related) return fail(`400 names ${err.field}, not ${field}: ${err.message}`);
    }
    const after = await snapshot();
    if (after !== start) return fail(`refused with ${res.status} (${err.message}) but stored rows changed`);
    return { outcome: null, after };
  }
  if (nonsense) return fail(`accepted with ${res.status}`);
  if (info.kind === 'string' && typeof value === 'string' && !info.format && !rc.noEcho?.includes(String(path[path.length - 1]))) {
    const echoed = valuesUnder(res.body, String(path[path.length - 1]));
    if (echoed.length && !echoed.includes(value.trim())) return fail(`accepted but echoed as ${JSON.stringify(echoed).slice(0, 80)}`);
  }
  return { outcome: null, after: await snapshot() };
}

/** A superagent serializer that sends a Buffer body byte for byte (its type says string, Node's writer takes both). */
const asIs = ((b: Buffer) => b) as unknown as (body: unknown) => string;

/** Per field schema object: the values it was seen to refuse. Shared field schemas (ids, patch forms of a create schema) are probed once. */
const refusedBefore = new WeakMap<z.ZodType, Set<string>>();

describe('boundary values through every JSON body route', () => {
  it('covers every JSON body route the app serves', () => {
    const routes: string[] = env.app.locals.apiRoutes;
    const bodyRoutes = routes.filter((r) => /^(POST|PATCH|PUT) /.test(r));
    // Routes without a JSON body of their own: sign-out, re-sending an invitation, sending or cancelling
    // an order, retrying an import; the multipart upload has its own fuzz test. The first-owner set-up
    // answers 409 before reading its body once any organisation exists, as here; tests/server/first-owner.test.ts
    // checks its body on an empty database. The SMS service's webhooks take signed form posts, not JSON
    // (tests/server/flag-texts.test.ts).
    const noBody = ['POST /api/texts/inbound', 'POST /api/texts/status', 'POST /api/setup/first-owner', 'POST /api/auth/sign-out', 'POST /api/people/:id/invitation', 'POST /api/orders/:id/send', 'POST /api/orders/:id/cancel', 'POST /api/imports/:id/retry', 'POST /api/imports'];
    expect(bodyRoutes.filter((r) => !noBody.includes(r) && !ROUTES.some((c) => c.route === r))).toEqual([]);
  });

  it.each(ROUTES.map((rc) => [rc.variant ? `${rc.route} (${rc.variant})` : rc.route, rc] as const))('%s: no 5xx, refusals name the field and change nothing, text is stored as sent', { timeout: 90_000 }, async (_name, rc) => {
    const problems: Outcome[] = [];
    const fields = fieldsOf(rc.schema, rc.body());
    expect(fields.length).toBeGreaterThan(0);
    let before = await snapshot();
    for (const { path, info } of fields) {
      for (const { value, nonsense } of valuesFor(info)) {
        const body = setAt(rc.body(), path, value);
        // A value the field's own schema object refused on an earlier route is refused by zod before any
        // route code runs; it is sent again only where the body as a whole passes the schema.
        const key = JSON.stringify(value) ?? String(value);
        const seen = refusedBefore.get(info.inner) ?? new Set<string>();
        refusedBefore.set(info.inner, seen);
        const schemaRefuses = !rc.schema.safeParse(body).success;
        if (schemaRefuses && seen.has(key)) continue;
        if (schemaRefuses) seen.add(key);
        const { outcome, after } = await probe(rc, path, info, value, nonsense, body, before);
        if (outcome) problems.push(outcome);
        before = after ?? (await snapshot());
      }
    }
    expect(problems, JSON.stringify(problems, null, 1)).toEqual([]);
  });

  it('stores SQL-looking and unicode text verbatim and keeps every table', async () => {
    const res = await call(owner, 'post', '/api/suppliers', { name: SQL, email: 'sql@boundary.example', notes: UNICODE, contactName: 'Robert"); DROP TABLE users;--' }).expect(201);
    const stored = (await env.ctx.db.models.Supplier.findByPk(res.body.id))!;
    expect([stored.name, stored.notes, stored.contactName]).toEqual([SQL, UNICODE, 'Robert"); DROP TABLE users;--']);
    expect(await env.ctx.db.models.Reading.count()).toBeGreaterThan(0);
    expect(await env.ctx.db.models.User.count()).toBeGreaterThan(0);
  });

  it('refuses a gzip-compressed JSON body that inflates past the body limit with 413', async () => {
    const bomb = gzipSync(Buffer.from(JSON.stringify({ name: 'x'.repeat(20 * 1_048_576), timeZone: 'Europe/Dublin' })));
    const before = await snapshot();
    // serialize: send the compressed bytes as they are (superagent would otherwise write the Buffer as JSON).
    const res = await owner.post('/api/farms').set('x-csrf-token', owner.csrf).set('content-type', 'application/json').set('content-encoding', 'gzip').serialize(asIs).send(bomb).expect(413);
    expect(res.body.error).toEqual({ code: 'too_large', message: 'The request body is too large' });
    expect(await snapshot()).toBe(before);
  });

  it('answers a body in an unknown encoding or one that is not the gzip it claims with a 4xx, not a server error', async () => {
    const send = (encoding: string, body: Buffer) => owner.post('/api/farms').set('x-csrf-token', owner.csrf).set('content-type', 'application/json').set('content-encoding', encoding).serialize(asIs).send(body);
    const json = Buffer.from(JSON.stringify({ name: 'Encoded farm', timeZone: 'UTC' }));
    const unknown = await send('compress', json).expect(415);
    expect(unknown.body.error.code).toBe('unsupported_body');
    const notGzip = await send('gzip', json).expect(400);
    expect(notGzip.body.error).toMatchObject({ code: 'bad_body' });
    expect(notGzip.body.error.message).toMatch(/^The request body could not be read \(/);
    const charset = await owner.post('/api/farms').set('x-csrf-token', owner.csrf).set('content-type', 'application/json; charset=x-nonsense-8').send('{}').expect(415);
    expect(charset.body.error.code).toBe('unsupported_body');
  });

  it('answers a body that is not JSON, or JSON that is not an object, with a 4xx and a message', async () => {
    for (const [type, body] of [['application/json', '{"name": '], ['application/json', '[1,2,3]'], ['application/json', '"text"'], ['application/json', 'null'], ['text/plain', 'name=x'], ['application/x-www-form-urlencoded', 'name=x&timeZone=UTC']] as const) {
      const res = await owner.post('/api/farms').set('x-csrf-token', owner.csrf).set('content-type', type).send(body);
      expect(res.status, `${type} ${body}: ${res.text}`).toBeGreaterThanOrEqual(400);
      expect(res.status).toBeLessThan(500);
      expect(typeof res.body.error?.message).toBe('string');
    }
  });
});

describe('boundary values in query strings and route parameters', () => {
  const QUERIES: { name: string; url: () => string; schema: z.ZodType }[] = [
    { name: '/api/imports', url: () => '/api/imports', schema: importListQuerySchema },
    { name: '/api/tanks/:id/readings', url: () => `/api/tanks/${tankId}/readings`, schema: readingsQuerySchema },
    { name: '/api/tanks/:id/series', url: () => `/api/tanks/${tankId}/series`, schema: seriesQuerySchema },
    { name: '/api/tanks/:id/calibration', url: () => `/api/tanks/${tankId}/calibration`, schema: calibrationQuerySchema },
    { name: '/api/tanks/:id/gauge-strip.pdf', url: () => `/api/tanks/${tankId}/gauge-strip.pdf`, schema: gaugeStripQuerySchema },
    { name: '/api/tanks/:id/label.pdf', url: () => `/api/tanks/${tankId}/label.pdf`, schema: tankLabelQuerySchema },
    { name: '/api/farms/:id/labels.pdf', url: () => `/api/farms/${farmId}/labels.pdf`, schema: farmLabelsQuerySchema },
    { name: '/api/flags', url: () => '/api/flags', schema: flagListQuerySchema },
    { name: '/api/brews', url: () => '/api/brews', schema: brewListQuerySchema },
    { name: '/api/inputs', url: () => '/api/inputs', schema: inputListQuerySchema },
  ];
  // As a browser or a hand-typed URL sends them; a repeated key arrives as a list.
  const QUERY_VALUES = ['-1', '0', 'NaN', 'Infinity', '1e308', '1.5', '', SQL, UNICODE, 'x'.repeat(4000), '%00', ['1', '2']];

  it.each(QUERIES.map((q) => [q.name, q] as const))('%s: every query field answers below 500 and a 400 names it', async (_name, q) => {
    const problems: string[] = [];
    for (const key of Object.keys(shapeOf(q.schema) ?? {})) {
      for (const value of QUERY_VALUES) {
        const res = await owner.get(q.url()).query({ [key]: value });
        const err = res.body?.error;
        if (res.status >= 500) problems.push(`${key}=${String(value).slice(0, 20)}: ${res.status}`);
        else if (res.status === 400 && !(typeof err?.field === 'string' && err.field.split('.')[0] === key && err.message.startsWith(`${err.field}: `))) problems.push(`${key}=${String(value).slice(0, 20)}: 400 ${JSON.stringify(err)}`);
      }
    }
    expect(problems).toEqual([]);
  });

  it('answers a route id that is not a positive whole number with 404 on every route, never a server error', async () => {
    const routes: string[] = env.app.locals.apiRoutes;
    const withId = routes.filter((r) => r.includes('/:id') && !r.startsWith('GET /api/dev'));
    expect(withId.length).toBeGreaterThan(10);
    const problems: string[] = [];
    for (const r of withId) {
      const [method, path] = r.split(' ');
      for (const id of ['0', '-1', '1.5', '1e3', 'abc', '9007199254740993', `1;${encodeURIComponent(SQL)}`, '%00', encodeURIComponent(UNICODE)]) {
        const res = await call(owner, method.toLowerCase() as 'get' | 'post' | 'patch', path.replace(':id', id), method === 'GET' ? undefined : {});
        if (res.status !== 404) problems.push(`${method} ${path.replace(':id', id)}: ${res.status} ${res.text.slice(0, 120)}`);
      }
    }
    expect(problems).toEqual([]);
  });
});
