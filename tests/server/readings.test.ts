import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn } from '../support/fixtures';
import { makeTank } from '../support/tanks';

const env = useTestApp();
const key = () => randomUUID().replace(/-/g, '');
// π/4 · (1 m)² per metre of level = 785.398 L/m (hand calculation for the 1,000 mm cylinder).
const L_PER_MM = Math.PI / 4;

async function setup() {
  const org = await makeOrganisation(env);
  const a = await makeTank(env, org, org.farmIds[0], { code: 'A', datumOffsetMm: 20 });
  const b = await makeTank(env, org, org.farmIds[0], { code: 'B', contents: 'culture' });
  const worker = await signedIn(env, org.users.worker.email);
  return { org, a, b, worker };
}

describe('POST /api/rounds', () => {
  it('stores each tank of a round with litres from the shared conversion', async () => {
    const { org, a, b, worker } = await setup();
    const res = await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: a.id, readingMm: 480, idempotencyKey: key() }, { tankId: b.id, readingMm: 1000, temperatureC: 21.5, idempotencyKey: key() }] }).expect(201);
    expect(res.body.results.map((r: { status: string }) => r.status)).toEqual(['stored', 'stored']);
    const ra = res.body.results[0].reading;
    // Tube 480 mm + datum 20 mm = level 500 mm; outlet at 100 mm leaves 400 mm usable.
    expect(ra.levelMm).toBe(500);
    expect(ra.grossL).toBeCloseTo(500 * L_PER_MM, 6);
    expect(ra.usableL).toBeCloseTo(400 * L_PER_MM, 6);
    expect(res.body.results[1].reading.temperatureC).toBe(21.5);
    const latest = await env.ctx.db.models.TankLatest.findByPk(a.id);
    expect(latest!.grossL).toBeCloseTo(500 * L_PER_MM, 6);
  });

  it('stores nothing twice when the same round is sent again', async () => {
    const { org, a, worker } = await setup();
    const body = { farmId: org.farmIds[0], entries: [{ tankId: a.id, readingMm: 700, idempotencyKey: key() }] };
    await call(worker, 'post', '/api/rounds', body).expect(201);
    const again = await call(worker, 'post', '/api/rounds', body).expect(200);
    expect(again.body.results[0].status).toBe('duplicate');
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: a.id } })).toBe(1);
  });

  it('refuses a reading above the top of the tank with a reason and stores the rest', async () => {
    const { org, a, b, worker } = await setup();
    const res = await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: a.id, readingMm: 1600, idempotencyKey: key() }, { tankId: b.id, readingMm: 300, idempotencyKey: key() }] }).expect(201);
    expect(res.body.results[0]).toMatchObject({ status: 'refused' });
    expect(res.body.results[0].reason).toMatch(/above the top/);
    expect(res.body.results[1].status).toBe('stored');
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: a.id } })).toBe(0);
  });

  it('refuses a tank of another farm and a farm the worker was not given', async () => {
    const { org, worker } = await setup();
    const other = await makeTank(env, org, org.farmIds[1], { code: 'X' });
    const res = await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: other.id, readingMm: 300, idempotencyKey: key() }] }).expect(200);
    expect(res.body.results[0].status).toBe('refused');
    await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[1], entries: [{ tankId: other.id, readingMm: 300, idempotencyKey: key() }] }).expect(403);
  });

  it('names the entry field that is malformed', async () => {
    const { org, a, worker } = await setup();
    const res = await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: a.id, readingMm: 'lots', idempotencyKey: key() }] }).expect(400);
    expect(res.body.error.field).toBe('entries.0.readingMm');
  });

  it('keeps the latest reading when an older round arrives late', async () => {
    const { org, a, worker } = await setup();
    await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: a.id, readingMm: 900, idempotencyKey: key() }] }).expect(201);
    await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], takenAt: new Date(Date.now() - 3_600_000).toISOString(), entries: [{ tankId: a.id, readingMm: 200, idempotencyKey: key() }] }).expect(201);
    const latest = await env.ctx.db.models.TankLatest.findByPk(a.id);
    expect(latest!.levelMm).toBe(920);
  });
});

describe('corrections', () => {
  it('replaces a wrong reading but keeps it in the audit trail', async () => {
    const { org, a, worker } = await setup();
    const res = await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: a.id, readingMm: 1080, idempotencyKey: key() }] }).expect(201);
    const wrong = res.body.results[0].reading;
    const fixed = await call(worker, 'post', `/api/readings/${wrong.id}/correction`, { readingMm: 180, note: 'misread 1080 for 180' }).expect(201);
    expect(fixed.body).toMatchObject({ source: 'correction', levelMm: 200, correctsId: wrong.id });
    const list = await worker.get(`/api/tanks/${a.id}/readings`).expect(200);
    expect(list.body).toHaveLength(2);
    expect(list.body.find((r: { id: number }) => r.id === wrong.id).correctedById).toBe(fixed.body.id);
    expect((await env.ctx.db.models.TankLatest.findByPk(a.id))!.levelMm).toBe(200);
    await call(worker, 'post', `/api/readings/${wrong.id}/correction`, { readingMm: 190, note: 'again' }).expect(409);
    const series = await worker.get(`/api/tanks/${a.id}/series`).expect(200);
    expect(series.body.map((p: { levelMm: number }) => p.levelMm)).toEqual([200]);
  });

  it('requires a reason for a correction', async () => {
    const { org, a, worker } = await setup();
    const res = await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: a.id, readingMm: 500, idempotencyKey: key() }] }).expect(201);
    const bad = await call(worker, 'post', `/api/readings/${res.body.results[0].reading.id}/correction`, { readingMm: 400 }).expect(400);
    expect(bad.body.error.field).toBe('note');
  });
});

describe('GET /api/board', () => {
  it('totals each contents over the latest readings of the farms the user may see', async () => {
    const { org, a, b, worker } = await setup();
    const hidden = await makeTank(env, org, org.farmIds[1], { code: 'H' });
    const manager = await signedIn(env, org.users.manager.email);
    await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: a.id, readingMm: 980, idempotencyKey: key() }, { tankId: b.id, readingMm: 600, idempotencyKey: key() }] }).expect(201);
    await call(manager, 'post', '/api/rounds', { farmId: org.farmIds[1], entries: [{ tankId: hidden.id, readingMm: 1000, idempotencyKey: key() }] }).expect(201);
    const seen = await worker.get('/api/board').expect(200);
    const water = seen.body.totals.find((t: { contents: string }) => t.contents === 'water');
    expect(water.grossL).toBeCloseTo(1000 * L_PER_MM, 6);
    expect(seen.body.farms.map((f: { farmId: number }) => f.farmId)).toEqual([org.farmIds[0]]);
    const all = await manager.get('/api/board').expect(200);
    const allWater = all.body.totals.find((t: { contents: string }) => t.contents === 'water');
    expect(allWater.grossL).toBeCloseTo(2000 * L_PER_MM, 6);
    const history = await manager.get('/api/board/history').expect(200);
    expect(history.body.days).toHaveLength(14);
    expect(history.body.series.find((s: { contents: string }) => s.contents === 'water').usableL.at(-1)).toBeCloseTo(1800 * L_PER_MM, 6);
  });
});
