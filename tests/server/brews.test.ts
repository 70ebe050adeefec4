import { describe, expect, it } from 'vitest';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn } from '../support/fixtures';
import { makeTank } from '../support/tanks';
import { makeInput } from '../support/inventory';

const env = useTestApp();

async function setup() {
  const org = await makeOrganisation(env);
  const tank = await makeTank(env, org, org.farmIds[0], { code: 'B1', contents: 'water' });
  const { input } = await makeInput(env, org, org.farmIds[0], { onHand: 10 });
  const worker = await signedIn(env, org.users.worker.email);
  return { org, tank, input, worker };
}

describe('brews', () => {
  it('logs a brew, draws its inputs from stock and switches the tank\'s contents', async () => {
    const { tank, input, worker } = await setup();
    const res = await call(worker, 'post', '/api/brews', { tankId: tank.id, kind: 'culture', name: 'Lactic starter batch 4', waterL: 180, dilution: { n: 50, convention: 'parts-water' }, inputs: [{ inputId: input.id, quantity: 2 }] }).expect(201);
    expect(res.body).toMatchObject({ kind: 'culture', status: 'brewing', waterL: 180, inputs: [{ inputId: input.id, quantity: 2 }] });
    const stock = await worker.get(`/api/inputs/${input.id}`).expect(200);
    expect(stock.body.onHand).toBeCloseTo(8, 9);
    const t = await worker.get(`/api/tanks/${tank.id}`).expect(200);
    expect(t.body).toMatchObject({ contents: 'culture', contentsNote: 'Lactic starter batch 4' });
    const history = await worker.get(`/api/tanks/${tank.id}/contents`).expect(200);
    expect(history.body.map((p: { contents: string }) => p.contents)).toEqual(['culture', 'water']);
  });

  it('stores nothing when an input would go below zero, naming the line', async () => {
    const { tank, input, worker } = await setup();
    const res = await call(worker, 'post', '/api/brews', { tankId: tank.id, kind: 'fertilizer', name: 'Too much', waterL: 100, inputs: [{ inputId: input.id, quantity: 50 }] }).expect(409);
    expect(res.body.error.field).toBe('inputs.0.quantity');
    expect((await worker.get('/api/brews').expect(200)).body).toEqual([]);
    expect((await worker.get(`/api/inputs/${input.id}`).expect(200)).body.onHand).toBeCloseTo(10, 9);
  });

  it('keeps a culture temperature log with the tank\'s round temperatures and marks a brew ready', async () => {
    const { org, tank, worker } = await setup();
    const brew = (await call(worker, 'post', '/api/brews', { tankId: tank.id, kind: 'culture', name: 'Compost tea', waterL: 200, startedAt: new Date(Date.now() - 3_600_000).toISOString() }).expect(201)).body;
    await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: tank.id, readingMm: 600, temperatureC: 19.5, idempotencyKey: `brewtest${Date.now()}` }] }).expect(201);
    const logged = await call(worker, 'post', `/api/brews/${brew.id}/temperatures`, { temperatureC: 22 }).expect(201);
    expect(logged.body.temperatures.map((t: { temperatureC: number; source: string }) => [t.temperatureC, t.source])).toEqual([[19.5, 'reading'], [22, 'brew']]);
    const ready = await call(worker, 'patch', `/api/brews/${brew.id}`, { status: 'ready' }).expect(200);
    expect(ready.body.status).toBe('ready');
    await call(worker, 'post', `/api/brews/${brew.id}/temperatures`, { temperatureC: 120 }).expect(400);
  });

  // The 1,000 mm test cylinder read at 1,000 mm with its safe fill line at 1,400 mm has
  // π/4 · (1 m)² · 0.4 m = 314.159 L of free space (hand derivation, π r² h).
  it('refuses with 422 naming waterL a batch larger than the free space below the safe fill line, storing nothing', async () => {
    const { org, tank, input, worker } = await setup();
    await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: tank.id, readingMm: 1000, idempotencyKey: `fit${Date.now()}` }] }).expect(201);
    // 300 L of water and 15 L of an input counted in litres make 315 L: 0.84 L too many.
    const over = await call(worker, 'post', '/api/brews', { tankId: tank.id, kind: 'fertilizer', name: 'Kelp feed', waterL: 300, inputs: [{ inputId: input.id, quantity: 10 }, { inputId: input.id, quantity: 5 }] }).expect(422);
    expect(over.body.error).toEqual({
      code: 'batch_over_free_space',
      field: 'waterL',
      message: "waterL: the batch of 315 L is 0.8 L more than the tank's free space: it holds 785.4 L and 1,099.6 L reaches its safe fill line, leaving 314.2 L",
    });
    expect((await worker.get('/api/brews').expect(200)).body).toEqual([]);
    expect((await worker.get(`/api/inputs/${input.id}`).expect(200)).body.onHand).toBeCloseTo(10, 9);
    // 314 L fits (within the last 10 %: the form warns, the server lets it through).
    await call(worker, 'post', '/api/brews', { tankId: tank.id, kind: 'fertilizer', name: 'Kelp feed', waterL: 304, inputs: [{ inputId: input.id, quantity: 10 }] }).expect(201);
  });
});
