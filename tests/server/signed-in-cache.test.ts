// Sessions and signed-in users kept in memory between requests: a change made through the app
// applies on the very next request; one written straight into the database (another process, a
// script) within KEEP_MS.
import { describe, expect, it } from 'vitest';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn } from '../support/fixtures';
import { makeTank } from '../support/tanks';
import { KEEP_MS } from '../../server/services/signed-in-cache';

const env = useTestApp();
type Board = { farms: { farmId: number }[] };
const farmsOn = (board: Board) => board.farms.map((f) => f.farmId).sort((a, b) => a - b);

/** Milliseconds until `check` holds, polling every 100 ms for up to `limitMs`. */
async function msUntil(check: () => Promise<boolean>, limitMs: number): Promise<number> {
  const start = Date.now();
  while (!(await check())) {
    if (Date.now() - start > limitMs) throw new Error(`still not so after ${limitMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
  return Date.now() - start;
}

describe('kept sessions and users', () => {
  it('shows a worker a farm on the next request after the owner grants it, and hides it after it is taken away', async () => {
    const org = await makeOrganisation(env, { farms: 2 });
    for (const farmId of org.farmIds) await makeTank(env, org, farmId, { code: `G${farmId}` });
    const owner = await signedIn(env, org.users.owner.email);
    const worker = await signedIn(env, org.users.worker.email);
    const before = farmsOn((await worker.get('/api/board').expect(200)).body);
    expect(before).toHaveLength(1);

    await call(owner, 'patch', `/api/people/${org.users.worker.id}`, { farmIds: org.farmIds }).expect(200);
    expect(farmsOn((await worker.get('/api/board').expect(200)).body)).toEqual([...org.farmIds].sort((a, b) => a - b));
    const other = org.farmIds.find((id) => !before.includes(id))!;
    await worker.get(`/api/farms/${other}`).expect(200);

    await call(owner, 'patch', `/api/people/${org.users.worker.id}`, { farmIds: before }).expect(200);
    expect(farmsOn((await worker.get('/api/board').expect(200)).body)).toEqual(before);
    await worker.get(`/api/farms/${other}`).expect(403);
  });

  it('applies a role changed through the app on the next request', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    const manager = await signedIn(env, org.users.manager.email);
    expect((await manager.get('/api/auth/me').expect(200)).body.role).toBe('manager');
    await call(owner, 'patch', `/api/people/${org.users.manager.id}`, { role: 'buyer' }).expect(200);
    expect((await manager.get('/api/auth/me').expect(200)).body.role).toBe('buyer');
  });

  it.each([
    ['ends a session deleted', 'DELETE FROM sessions WHERE userId = ?'],
    ['refuses a user deactivated', 'UPDATE users SET active = 0 WHERE id = ?'],
  ])('%s straight in the database within the keep time', async (_what, sql) => {
    const org = await makeOrganisation(env);
    const worker = await signedIn(env, org.users.worker.email);
    await worker.get('/api/board').expect(200);
    await env.ctx.db.sequelize.query(sql, { replacements: [org.users.worker.id] });
    const took = await msUntil(async () => (await worker.get('/api/board')).status === 401, KEEP_MS + 2000);
    expect(took).toBeLessThanOrEqual(KEEP_MS + 1000);
  });
});
