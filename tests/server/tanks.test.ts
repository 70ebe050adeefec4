import { describe, expect, it } from 'vitest';
import { capacityL } from '@shared/calibration';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn } from '../support/fixtures';

const env = useTestApp();

const SHAPES = [
  { shape: 'vertical-cylinder', diameterMm: 1200, heightMm: 1800 },
  { shape: 'cone-bottom', diameterMm: 900, straightHeightMm: 800, coneHeightMm: 400 },
  { shape: 'horizontal-cylinder', diameterMm: 1000, lengthMm: 2000, ends: 'ellipsoidal-2to1' },
  { shape: 'box', lengthMm: 1200, widthMm: 1000, heightMm: 1000 },
  { shape: 'frustum', bottomDiameterMm: 900, topDiameterMm: 1100, heightMm: 1200 },
  { shape: 'sphere', diameterMm: 1500 },
  { shape: 'points', points: [{ levelMm: 0, volumeL: 0 }, { levelMm: 200, volumeL: 100 }, { levelMm: 500, volumeL: 300 }, { levelMm: 900, volumeL: 520 }] },
] as const;

async function managerOnNewOrg() {
  const org = await makeOrganisation(env);
  return { org, manager: await signedIn(env, org.users.manager.email) };
}

describe('tanks API', () => {
  it.each(SHAPES.map((g) => [g.shape, g] as const))('creates a %s tank with its capacity and first calibration version', async (_s, geometry) => {
    const { org, manager } = await managerOnNewOrg();
    const res = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: `Tank ${geometry.shape}`, code: 'T1', contents: 'water', geometry }).expect(201);
    expect(res.body.capacityL).toBeCloseTo(capacityL(geometry), 6);
    expect(res.body.safeFillLevelMm).toBeCloseTo(res.body.heightMm, 6);
    expect(await env.ctx.db.models.TankCalibration.count({ where: { tankId: res.body.id } })).toBe(1);
  });

  it('names the geometry field that is wrong and stores nothing', async () => {
    const { org, manager } = await managerOnNewOrg();
    const res = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: 'Bad', code: 'B1', contents: 'water', geometry: { shape: 'vertical-cylinder', diameterMm: -3, heightMm: 1000 } }).expect(400);
    expect(res.body.error.field).toBe('geometry.diameterMm');
    expect(res.body.error.message).toMatch(/diameterMm/);
    expect(await env.ctx.db.models.Tank.count({ where: { farmId: org.farmIds[0] } })).toBe(0);
  });

  it('names the fill-and-mark point that is out of order', async () => {
    const { org, manager } = await managerOnNewOrg();
    const geometry = { shape: 'points', points: [{ levelMm: 0, volumeL: 0 }, { levelMm: 400, volumeL: 200 }, { levelMm: 300, volumeL: 250 }] };
    const res = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: 'Marks', code: 'M1', contents: 'culture', geometry }).expect(400);
    expect(res.body.error.field).toBe('geometry.points.2');
  });

  it('refuses an outlet above the top of the tank', async () => {
    const { org, manager } = await managerOnNewOrg();
    const res = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: 'Tall outlet', code: 'O1', contents: 'water', geometry: SHAPES[0], outletHeightMm: 2500 }).expect(400);
    expect(res.body.error.field).toBe('outletHeightMm');
  });

  it('refuses a second tank with the same code on one farm', async () => {
    const { org, manager } = await managerOnNewOrg();
    const body = { farmId: org.farmIds[0], name: 'A', code: 'DUP', contents: 'water', geometry: SHAPES[0] };
    await call(manager, 'post', '/api/tanks', body).expect(201);
    const res = await call(manager, 'post', '/api/tanks', { ...body, name: 'B' }).expect(409);
    expect(res.body.error.field).toBe('code');
  });

  it('keeps the old calibration version when the tank is re-measured', async () => {
    const { org, manager } = await managerOnNewOrg();
    const created = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: 'Remeasured', code: 'R1', contents: 'water', geometry: SHAPES[0] }).expect(201);
    const updated = await call(manager, 'patch', `/api/tanks/${created.body.id}`, { datumOffsetMm: 35 }).expect(200);
    expect(updated.body.calibrationVersion).not.toBe(created.body.calibrationVersion);
    const versions = await env.ctx.db.models.TankCalibration.findAll({ where: { tankId: created.body.id } });
    expect(versions.map((v) => v.version).sort()).toEqual([created.body.calibrationVersion, updated.body.calibrationVersion].sort());
  });

  it('keeps the contents history when a tank switches from fertilizer to pest solution', async () => {
    const { org, manager } = await managerOnNewOrg();
    const created = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: 'Side tank', code: 'S1', contents: 'fertilizer', contentsNote: 'Seaweed brew', geometry: SHAPES[3] }).expect(201);
    await call(manager, 'patch', `/api/tanks/${created.body.id}`, { contents: 'pest-solution', contentsNote: 'Neem mix', specificGravity: 1.02 }).expect(200);
    const history = await manager.get(`/api/tanks/${created.body.id}/contents`).expect(200);
    expect(history.body.map((p: { contents: string }) => p.contents)).toEqual(['pest-solution', 'fertilizer']);
    expect(history.body[1].to).not.toBeNull();
    expect(history.body[0].to).toBeNull();
  });

  it('lists tanks of one farm in walking order and only farms the worker may see', async () => {
    const { org, manager } = await managerOnNewOrg();
    for (const [code, walkOrder, farmId] of [['B', 2, org.farmIds[0]], ['A', 1, org.farmIds[0]], ['C', 1, org.farmIds[1]]] as const) {
      await call(manager, 'post', '/api/tanks', { farmId, name: `Tank ${code}`, code, contents: 'water', geometry: SHAPES[0], walkOrder }).expect(201);
    }
    const farmTanks = await manager.get(`/api/tanks?farmId=${org.farmIds[0]}`).expect(200);
    expect(farmTanks.body.map((t: { code: string }) => t.code)).toEqual(['A', 'B']);
    const worker = await signedIn(env, org.users.worker.email);
    const seen = await worker.get('/api/tanks').expect(200);
    expect(seen.body.map((t: { code: string }) => t.code)).toEqual(['A', 'B']);
    await worker.get(`/api/tanks?farmId=${org.farmIds[1]}`).expect(403);
  });
});

describe('GET /api/tanks/:id/calibration', () => {
  it('returns a 10 mm table by tube reading that ends at the top of the tank', async () => {
    const { org, manager } = await managerOnNewOrg();
    const created = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: 'Main', code: 'W1', contents: 'water', geometry: { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1005 } }).expect(201);
    const res = await manager.get(`/api/tanks/${created.body.id}/calibration?step=10`).expect(200);
    expect(res.body).toMatchObject({ number: 1, lengthUnit: 'mm', volumeUnit: 'L', datumOffset: 0 });
    expect(res.body).not.toHaveProperty('version');
    expect(res.body.rows).toHaveLength(102);
    expect(res.body.rows.at(-1)).toMatchObject({ reading: 1005, level: 1005 });
    // π/4 · 1 m² · 1.005 m = 789.32 L (hand calculation).
    expect(res.body.rows.at(-1).volume).toBeCloseTo((Math.PI / 4) * 1005, 6);
  });

  it('lists rows by what the tube reads when its zero mark is 30 mm below the floor', async () => {
    const { org, manager } = await managerOnNewOrg();
    const created = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: 'Low mark', code: 'W3', contents: 'water', geometry: { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1000 }, datumOffsetMm: -30 }).expect(201);
    const res = await manager.get(`/api/tanks/${created.body.id}/calibration?step=10`).expect(200);
    expect(res.body.rows[0]).toEqual({ reading: 30, level: 0, volume: 0 });
    expect(res.body.rows[1]).toMatchObject({ reading: 40, level: 10 });
    // π/4 · 1 m² · 0.01 m = 7.854 L (hand calculation).
    expect(res.body.rows[1].volume).toBeCloseTo((Math.PI / 4) * 10, 6);
    expect(res.body.rows.at(-1)).toMatchObject({ reading: 1030, level: 1000 });
  });

  it('returns inches and US gallons for US customary users', async () => {
    const { org, manager } = await managerOnNewOrg();
    const created = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: 'Tote', code: 'IBC', contents: 'fertilizer', geometry: { shape: 'box', lengthMm: 254, widthMm: 254, heightMm: 254 } }).expect(201);
    const res = await manager.get(`/api/tanks/${created.body.id}/calibration?step=1&unit=us`).expect(200);
    expect(res.body).toMatchObject({ lengthUnit: 'in', volumeUnit: 'usgal' });
    // A 10 in cube is 1000 in³ = 1000/231 US gal (NIST Handbook 44, Appendix C: 1 gal = 231 in³).
    expect(res.body.rows.at(-1).volume).toBeCloseTo(1000 / 231, 9);
  });

  it('downloads CSV by tube reading, numbered and dated, with spreadsheet formulas defused', async () => {
    const { org, manager } = await managerOnNewOrg();
    const created = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: '=HYPERLINK("x")', code: 'F1', contents: 'water', geometry: SHAPES[0], datumOffsetMm: 50 }).expect(201);
    const res = await manager.get(`/api/tanks/${created.body.id}/calibration?step=100&format=csv`).expect(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    const lines = res.text.trim().split(/\r\n/);
    expect(lines[0]).not.toMatch(/^=/);
    expect(lines[1]).toMatch(/^# calibration 1 of \d{4}-\d{2}-\d{2}$/);
    expect(lines[2]).toBe('tube_reading_mm,level_above_floor_mm,volume_L');
    // The zero mark stands 50 mm above the floor: the tube's 0 is the level 50 mm.
    expect(lines[3]).toBe(`0,50,${Math.round((Math.PI / 4) * 1.44 * 50 * 1000) / 1000}`);
  });

  it('names the step when it is not a positive number', async () => {
    const { org, manager } = await managerOnNewOrg();
    const created = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: 'Main', code: 'W2', contents: 'water', geometry: SHAPES[0] }).expect(201);
    const res = await manager.get(`/api/tanks/${created.body.id}/calibration?step=-4`).expect(400);
    expect(res.body.error.field).toBe('step');
  });

  it('names the zero mark when it stands above the top of the tank', async () => {
    const { org, manager } = await managerOnNewOrg();
    const created = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: 'High mark', code: 'W4', contents: 'water', geometry: SHAPES[0], datumOffsetMm: 2500 }).expect(201);
    const res = await manager.get(`/api/tanks/${created.body.id}/calibration?step=10`).expect(422);
    expect(res.body.error.field).toBe('datumOffsetMm');
    expect(res.body.error).not.toHaveProperty('stack');
  });
});

describe('GET /api/tanks/:id/calibrations', () => {
  it('numbers a tank’s calibrations 1, 2, 3 in the order they were made and marks the current one', async () => {
    const { org, manager } = await managerOnNewOrg();
    const created = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: 'Remeasured', code: 'N1', contents: 'water', geometry: SHAPES[0] }).expect(201);
    await call(manager, 'patch', `/api/tanks/${created.body.id}`, { datumOffsetMm: -30 }).expect(200);
    const third = await call(manager, 'patch', `/api/tanks/${created.body.id}`, { geometry: { ...SHAPES[0], heightMm: 1900 } }).expect(200);
    // A change that leaves the shape and the zero mark alone makes no new calibration.
    await call(manager, 'patch', `/api/tanks/${created.body.id}`, { lowStockL: 120 }).expect(200);
    const res = await manager.get(`/api/tanks/${created.body.id}/calibrations`).expect(200);
    expect(res.body.map((v: { number: number }) => v.number)).toEqual([1, 2, 3]);
    expect(res.body.map((v: { datumOffsetMm: number }) => v.datumOffsetMm)).toEqual([0, -30, -30]);
    expect(res.body.map((v: { current: boolean }) => v.current)).toEqual([false, false, true]);
    expect(res.body[0].key).toBe(created.body.calibrationVersion);
    expect(res.body[2].key).toBe(third.body.calibrationVersion);
    expect(res.body[2].geometry.heightMm).toBe(1900);
    for (const v of res.body) expect(Number.isNaN(Date.parse(v.createdAt))).toBe(false);
    const table = await manager.get(`/api/tanks/${created.body.id}/calibration?step=100`).expect(200);
    expect(table.body.number).toBe(3);
    expect(table.body.calibratedAt).toBe(res.body[2].createdAt);
  });

  it('numbers each tank on its own and keeps other farms’ tanks out', async () => {
    const { org, manager } = await managerOnNewOrg();
    const a = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: 'A', code: 'NA', contents: 'water', geometry: SHAPES[0] }).expect(201);
    await call(manager, 'patch', `/api/tanks/${a.body.id}`, { datumOffsetMm: 20 }).expect(200);
    const b = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[1], name: 'B', code: 'NB', contents: 'water', geometry: SHAPES[3] }).expect(201);
    const res = await manager.get(`/api/tanks/${b.body.id}/calibrations`).expect(200);
    expect(res.body.map((v: { number: number; current: boolean }) => [v.number, v.current])).toEqual([[1, true]]);
    const worker = await signedIn(env, org.users.worker.email);
    await worker.get(`/api/tanks/${b.body.id}/calibrations`).expect(403);
  });
});

describe('PATCH /api/tanks/:id', () => {
  it('changes only the fields it is given (no defaults fill the rest)', async () => {
    const { org, manager } = await managerOnNewOrg();
    const created = await call(manager, 'post', '/api/tanks', { farmId: org.farmIds[0], name: 'Keep', code: 'K1', contents: 'culture', contentsNote: 'Starter', geometry: SHAPES[0], datumOffsetMm: 45, outletHeightMm: 80, specificGravity: 1.04, walkOrder: 3, sensorHeightMm: 1700 }).expect(201);
    const res = await call(manager, 'patch', `/api/tanks/${created.body.id}`, { lowStockL: 150 }).expect(200);
    expect(res.body).toMatchObject({ lowStockL: 150, datumOffsetMm: 45, outletHeightMm: 80, specificGravity: 1.04, walkOrder: 3, sensorHeightMm: 1700, contentsNote: 'Starter', calibrationVersion: created.body.calibrationVersion });
  });
});
