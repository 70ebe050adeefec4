// Text in JSON bodies is stored exactly as sent or refused: a NUL character, bytes that are not UTF-8
// (which a decoder would quietly turn into U+FFFD) and lone surrogates are refused with 422 naming the
// field, on every route, before anything is stored. A U+FFFD the client really sent is kept.
import { randomUUID } from 'node:crypto';
import { gzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { useTestApp } from '../support/db';
import { anonymousAgent, call, makeOrganisation, signedIn, type Agent } from '../support/fixtures';
import { makeTank } from '../support/tanks';

const env = useTestApp();
const key = () => randomUUID().replace(/-/g, '');

/** A JSON body with `bytes` spliced in raw where the text "@@" stands. */
function rawBody(body: object, bytes: Buffer): Buffer {
  const [before, after] = JSON.stringify(body).split('@@');
  return Buffer.concat([Buffer.from(before, 'utf8'), bytes, Buffer.from(after, 'utf8')]);
}

function sendRaw(agent: Agent, url: string, data: Buffer, headers: Record<string, string> = {}) {
  const req = agent.post(url).set('x-csrf-token', agent.csrf).set('content-type', 'application/json');
  for (const [name, value] of Object.entries(headers)) req.set(name, value);
  // The bytes go out as they are (superagent would write a Buffer as JSON of its bytes).
  return req.serialize((d: unknown) => d as string).send(data);
}

async function world() {
  const org = await makeOrganisation(env);
  const tank = await makeTank(env, org, org.farmIds[0], { code: 'TX' });
  const worker = await signedIn(env, org.users.worker.email);
  const round = (note: string) => ({ farmId: org.farmIds[0], entries: [{ tankId: tank.id, readingMm: 300, note, idempotencyKey: key() }] });
  const count = () => env.ctx.db.models.Reading.count({ where: { tankId: tank.id } });
  return { org, tank, worker, round, count };
}

describe('text fields of JSON bodies', () => {
  it.each([
    ['a Latin-1 byte', Buffer.from([0xe9])],
    ['a lone continuation byte', Buffer.from([0x80])],
    ['a cut-off three-byte character', Buffer.from([0xe2, 0x82])],
    ['an overlong encoding of "/"', Buffer.from([0xc0, 0xaf])],
    ['an encoded surrogate', Buffer.from([0xed, 0xa0, 0x80])],
  ])('refuses %s in a note with 422 naming the field, and stores nothing', async (_name, bytes) => {
    const { worker, round, count } = await world();
    const res = await sendRaw(worker, '/api/rounds', rawBody(round('Tank lid @@ loose'), bytes)).expect(422);
    expect(res.body.error).toMatchObject({ code: 'invalid_text', field: 'entries.0.note' });
    expect(res.body.error.message).toMatch(/^entries\.0\.note: .*UTF-8/);
    expect(await count()).toBe(0);
  });

  it('refuses bytes that are not UTF-8 in a gzip-compressed body', async () => {
    const { worker, round, count } = await world();
    const res = await sendRaw(worker, '/api/rounds', gzipSync(rawBody(round('gz @@'), Buffer.from([0xff]))), { 'content-encoding': 'gzip' }).expect(422);
    expect(res.body.error.field).toBe('entries.0.note');
    expect(await count()).toBe(0);
  });

  it('names the field with the bad bytes when another field holds a real U+FFFD', async () => {
    const { org, tank, worker, count } = await world();
    const body = { farmId: org.farmIds[0], entries: [{ tankId: tank.id, readingMm: 300, note: 'sent \uFFFD on purpose', idempotencyKey: key() }, { tankId: tank.id, readingMm: 310, note: 'bad @@', idempotencyKey: key() }] };
    const res = await sendRaw(worker, '/api/rounds', rawBody(body, Buffer.from([0xfe]))).expect(422);
    expect(res.body.error.field).toBe('entries.1.note');
    expect(await count()).toBe(0);
  });

  it.each([
    ['a NUL character', 'before\u0000after', /NUL/],
    ['a lone surrogate', 'half \uD83D of a pair', /UTF-8/],
  ])('refuses %s sent as a JSON escape with 422 naming the field', async (_name, note, message) => {
    const { worker, round, count } = await world();
    const res = await call(worker, 'post', '/api/rounds', round(note)).expect(422);
    expect(res.body.error).toMatchObject({ code: 'invalid_text', field: 'entries.0.note' });
    expect(res.body.error.message).toMatch(message);
    expect(await count()).toBe(0);
  });

  it('stores a U+FFFD the client really sent, as raw UTF-8 or as an escape, and emoji', async () => {
    const { worker, round, count } = await world();
    const raw = await sendRaw(worker, '/api/rounds', rawBody(round('mark @@ 🚰'), Buffer.from('\uFFFD', 'utf8')));
    expect(raw.status, JSON.stringify(raw.body)).toBe(201);
    expect(raw.body.results[0].reading.note).toBe('mark \uFFFD 🚰');
    const escaped = await sendRaw(worker, '/api/rounds', Buffer.from(JSON.stringify(round('x')).replace('"x"', '"mark \\ufffd"'), 'utf8'));
    expect(escaped.status).toBe(201);
    expect(escaped.body.results[0].reading.note).toBe('mark \uFFFD');
    expect(await count()).toBe(2);
  });

  it('checks every route, signed in or not: a farm name and a sign-in e-mail', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    const farm = await call(owner, 'post', '/api/farms', { name: 'North \u0000 field', timeZone: 'Europe/Dublin' }).expect(422);
    expect(farm.body.error).toMatchObject({ code: 'invalid_text', field: 'name' });
    expect(await env.ctx.db.models.Farm.count({ where: { organisationId: org.organisationId } })).toBe(2);
    const visitor = await anonymousAgent(env);
    const signIn = await sendRaw(visitor, '/api/auth/sign-in', rawBody({ email: 'x@@@test.example', password: 'whatever-it-is' }, Buffer.from([0xc3]))).expect(422);
    expect(signIn.body.error.field).toBe('email');
  });

  it('names a nested field in a list of objects and a field whose key holds a NUL', async () => {
    const { worker, round } = await world();
    const nested = await call(worker, 'post', '/api/rounds', { ...round('fine'), entries: [{ ...round('fine').entries[0], idempotencyKey: 'abc\u0000defgh' }] }).expect(422);
    expect(nested.body.error.field).toBe('entries.0.idempotencyKey');
    const badKey = await call(worker, 'post', '/api/rounds', { ...round('fine'), 'odd\u0000key': 1 }).expect(422);
    expect(badKey.body.error.message).toMatch(/NUL/);
  });
});
