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

  it('works out a round taken before the tank\'s calibration changed with the calibration of its own time, and a later one with the new', async () => {
    const { org, a, worker } = await setup();
    const before = await env.ctx.db.models.TankCalibration.findOne({ where: { tankId: a.id } });
    // Made two hours ago (Sequelize never writes createdAt on update, so straight SQL).
    await env.ctx.db.sequelize.query('UPDATE tank_calibrations SET createdAt = ? WHERE id = ?', { replacements: [new Date(Date.now() - 2 * 3_600_000), before!.id] });
    const manager = await signedIn(env, org.users.manager.email);
    await call(manager, 'patch', `/api/tanks/${a.id}`, { datumOffsetMm: 120 }).expect(200);

    // Typed an hour ago without signal (datum 20 mm then), sent now: tube 480 mm + 20 mm = level 500 mm.
    const late = await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], takenAt: new Date(Date.now() - 3_600_000).toISOString(), entries: [{ tankId: a.id, readingMm: 480, idempotencyKey: key() }] }).expect(201);
    expect(late.body.results[0].reading).toMatchObject({ levelMm: 500, calibrationVersion: before!.version });
    expect(late.body.results[0].reading.grossL).toBeCloseTo(500 * L_PER_MM, 6);
    // Taken now, after the change: 480 mm + 120 mm = 600 mm with the new calibration.
    const now = await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: a.id, readingMm: 480, idempotencyKey: key() }] }).expect(201);
    expect(now.body.results[0].reading.levelMm).toBe(600);
    expect(now.body.results[0].reading.calibrationVersion).not.toBe(before!.version);
  });

  it('refuses a reading above the top of the tank with a reason and stores the rest', async () => {
    const { org, a, b, worker } = await setup();
    const res = await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: a.id, readingMm: 1600, idempotencyKey: key() }, { tankId: b.id, readingMm: 300, idempotencyKey: key() }] }).expect(201);
    expect(res.body.results[0]).toMatchObject({ status: 'refused' });
    expect(res.body.results[0].reason).toMatch(/above the top/);
    // With its code, so a screen in another language words it (area checks).
    expect(res.body.results[0].problem.code).toMatch(/^reading\.sightTube.*AboveTop$/);
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

describe('POST /api/rounds idempotency keys', () => {
  it('stores a worker\'s reading whose key another farm\'s reading uses, and never hands back that reading', async () => {
    const { org, a, worker } = await setup();
    const hidden = await makeTank(env, org, org.farmIds[1], { code: 'H' });
    const manager = await signedIn(env, org.users.manager.email);
    const shared = key();
    await call(manager, 'post', '/api/rounds', { farmId: org.farmIds[1], entries: [{ tankId: hidden.id, readingMm: 900, note: 'padlock code 4711', idempotencyKey: shared }] }).expect(201);
    const res = await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: a.id, readingMm: 300, idempotencyKey: shared }] }).expect(201);
    expect(res.body.results[0]).toMatchObject({ tankId: a.id, status: 'stored', reading: { tankId: a.id, levelMm: 320 } });
    expect(JSON.stringify(res.body)).not.toContain('padlock');
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: a.id } })).toBe(1);
  });

  it('stores a reading whose key was used in another organisation', async () => {
    const { org, a, worker } = await setup();
    const stranger = await makeOrganisation(env);
    const theirs = await makeTank(env, stranger, stranger.farmIds[0], { code: 'S' });
    const strangerWorker = await signedIn(env, stranger.users.worker.email);
    const shared = key();
    await call(strangerWorker, 'post', '/api/rounds', { farmId: stranger.farmIds[0], entries: [{ tankId: theirs.id, readingMm: 500, idempotencyKey: shared }] }).expect(201);
    const res = await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: a.id, readingMm: 400, idempotencyKey: shared }] }).expect(201);
    expect(res.body.results[0]).toMatchObject({ status: 'stored', reading: { tankId: a.id, levelMm: 420 } });
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: a.id } })).toBe(1);
  });

  it('refuses a key the same person used for another tank, without that reading', async () => {
    const { org, a, b, worker } = await setup();
    const k = key();
    await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: a.id, readingMm: 600, note: 'first tank', idempotencyKey: k }] }).expect(201);
    const res = await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: b.id, readingMm: 700, idempotencyKey: k }] }).expect(200);
    expect(res.body.results[0]).toMatchObject({ tankId: b.id, status: 'refused' });
    expect(res.body.results[0].reading).toBeUndefined();
    expect(res.body.results[0].reason).toMatch(/Tank B/);
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: b.id } })).toBe(0);
  });
});

describe('POST /api/rounds readings at the same instant', () => {
  it('reports a clash with another person\'s reading of the tank at the same instant as a conflict naming the tank, not as stored', async () => {
    const { org, a, b, worker } = await setup();
    const manager = await signedIn(env, org.users.manager.email);
    const takenAt = new Date(Date.now() - 60_000).toISOString();
    await call(manager, 'post', '/api/rounds', { farmId: org.farmIds[0], takenAt, entries: [{ tankId: a.id, readingMm: 800, idempotencyKey: key() }] }).expect(201);
    const res = await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], takenAt, entries: [{ tankId: a.id, readingMm: 300, idempotencyKey: key() }, { tankId: b.id, readingMm: 500, idempotencyKey: key() }] }).expect(201);
    expect(res.body.results[0]).toMatchObject({ tankId: a.id, status: 'conflict' });
    expect(res.body.results[0].reason).toMatch(/Tank A/);
    expect(res.body.results[0].reading).toBeUndefined();
    expect(res.body.results[1]).toMatchObject({ tankId: b.id, status: 'stored' });
    const stored = await env.ctx.db.models.Reading.findAll({ where: { tankId: a.id } });
    expect(stored.map((r) => [r.levelMm, r.enteredById])).toEqual([[820, org.users.manager.id]]);
  });

  it('answers the same instant and key sent twice at once as one stored reading, never a conflict', async () => {
    const { org, a, worker } = await setup();
    const body = { farmId: org.farmIds[0], takenAt: new Date(Date.now() - 120_000).toISOString(), entries: [{ tankId: a.id, readingMm: 640, idempotencyKey: key() }] };
    const answers = await Promise.all([call(worker, 'post', '/api/rounds', body), call(worker, 'post', '/api/rounds', body)]);
    for (const res of answers) {
      expect([200, 201]).toContain(res.status);
      expect(['stored', 'duplicate']).toContain(res.body.results[0].status);
      expect(res.body.results[0].reading).toMatchObject({ tankId: a.id, levelMm: 660 });
    }
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: a.id } })).toBe(1);
  });

  it('stores every reading it answers as stored when rounds without a time arrive together', async () => {
    const { org, a } = await setup();
    const people = await Promise.all((['owner', 'manager', 'worker'] as const).map((role) => signedIn(env, org.users[role].email)));
    const answers = await Promise.all(people.map((p, i) => call(p, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: a.id, readingMm: 300 + i * 100, idempotencyKey: key() }] })));
    const stored = await env.ctx.db.models.Reading.findAll({ where: { tankId: a.id } });
    const said = answers.map((res) => res.body.results[0]);
    for (const r of said) expect(['stored', 'conflict']).toContain(r.status);
    expect(said.filter((r) => r.status === 'stored').map((r) => r.reading.id).sort()).toEqual(stored.map((r) => Number(r.id)).sort());
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
