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
  });
});
