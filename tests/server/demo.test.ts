import { describe, expect, it } from 'vitest';
import { tankCreateSchema } from '@shared/schemas';
import { useTestApp } from '../support/db';
import { loadDemoScenario, readScenario } from '../../server/services/demo';
import { signedIn } from '../support/fixtures';

const env = useTestApp();

describe('demo scenario', () => {
  it('loads once, with every demo sign-in working and every tank valid', async () => {
    expect(await loadDemoScenario(env.ctx.db, { onlyIfEmpty: true })).toBe(true);
    expect(await loadDemoScenario(env.ctx.db, { onlyIfEmpty: true })).toBe(false);
    const scenario = readScenario();
    for (const p of scenario.people) await signedIn(env, p.email, p.password);
    for (const t of scenario.tanks) {
      const parsed = tankCreateSchema.safeParse({ ...t, farmId: 1 });
      expect(parsed.success, `${t.code}: ${JSON.stringify(parsed.error?.issues)}`).toBe(true);
    }
    const shapes = new Set(scenario.tanks.map((t) => t.geometry.shape));
    expect([...shapes].sort()).toEqual(['box', 'cone-bottom', 'frustum', 'horizontal-cylinder', 'points', 'sphere', 'vertical-cylinder']);
    expect(await env.ctx.db.models.Tank.count()).toBe(scenario.tanks.length);
    // Three weeks of rounds: every tank has a latest reading, and the gate tank's is days old.
    expect(await env.ctx.db.models.TankLatest.count()).toBe(scenario.tanks.length);
    expect(await env.ctx.db.models.Reading.count()).toBeGreaterThan(scenario.tanks.length * 15);
    // The buyer sees at least one input due for reorder, with a quantity and a date.
    const buyer = scenario.people.find((p) => p.role === 'buyer')!;
    const inputs = (await (await signedIn(env, buyer.email, buyer.password)).get('/api/inputs').expect(200)).body;
    expect(inputs).toHaveLength(scenario.inputs.length);
    const due = inputs.filter((i: { due: boolean }) => i.due);
    expect(due.length).toBeGreaterThan(0);
    expect(due.length).toBeLessThan(inputs.length);
    for (const i of due) {
      expect(i.suggestedQuantity).toBeGreaterThan(0);
      expect(i.orderBy).not.toBeNull();
    }
  });

  it('fills the tank page’s month: a reading on every one of the last 30 days for each tank read daily', async () => {
    // The file's database may hold the demo already (the test above loads it).
    await loadDemoScenario(env.ctx.db, { onlyIfEmpty: true });
    const manager = readScenario().people.find((p) => p.role === 'manager')!;
    const agent = await signedIn(env, manager.email, manager.password);
    const tanks: { id: number; code: string }[] = (await agent.get('/api/tanks').expect(200)).body;
    expect(tanks.length).toBeGreaterThan(0);
    const to = new Date();
    const from = new Date(to.getTime() - 30 * 86_400_000);
    for (const tank of tanks) {
      const points: { t: string }[] = (await agent.get(`/api/tanks/${tank.id}/series`).query({ from: from.toISOString(), to: to.toISOString(), bucket: 'day' }).expect(200)).body;
      const days = new Set(points.map((p) => p.t.slice(0, 10)));
      // The gate tank (SO-W2) has not been read for its last four days; every other tank is read each morning.
      const missing = tank.code === 'SO-W2' ? 4 : 0;
      expect(days.size, tank.code).toBeGreaterThanOrEqual(30 - missing);
      // Its one calibration is dated before its first reading, as a tank measured when it was set up.
      const versions: { number: number; createdAt: string }[] = (await agent.get(`/api/tanks/${tank.id}/calibrations`).expect(200)).body;
      expect(versions.map((v) => v.number), tank.code).toEqual([1]);
      const first = (await agent.get(`/api/tanks/${tank.id}/series`).query({ from: new Date(0).toISOString(), bucket: 'raw' }).expect(200)).body[0];
      expect(Date.parse(versions[0].createdAt), tank.code).toBeLessThan(Date.parse(first.t));
    }
  });
});
