import { describe, expect, it } from 'vitest';
import { useTestApp } from '../support/db';
import { makeOrganisation, signedIn } from '../support/fixtures';
import { makeTank } from '../support/tanks';
import { insertReadings, type NewReading } from '../../server/services/readings';
import { queueForecastRefresh } from '../../server/services/forecasts';

const env = useTestApp();
const L_PER_MM = Math.PI / 4;

/** Daily readings falling 40 mm (31.4 L) a day for 18 days, the last an hour ago. */
function steadyDraw(tank: { id: number; farmId: number; calibrationVersion: string }, organisationId: number, today: Date): NewReading[] {
  return Array.from({ length: 18 }, (_, i) => {
    const levelMm = 1380 - 40 * i;
    return {
      organisationId, farmId: tank.farmId, tankId: tank.id, takenAt: new Date(today.getTime() - (17 - i) * 86_400_000), source: 'round', levelMm,
      grossL: levelMm * L_PER_MM, usableL: (levelMm - 100) * L_PER_MM, temperatureC: null, calibrationVersion: tank.calibrationVersion, enteredById: null, importId: null, note: '', idempotencyKey: null,
    };
  });
}

describe('tank forecasts', () => {
  it('gives the use rate and days of cover of a steady draw, counted from the latest reading, on the tank and on the board', async () => {
    const org = await makeOrganisation(env);
    const tank = await makeTank(env, org, org.farmIds[0], { code: 'F1' });
    // Daily readings falling 40 mm (31.4 L) a day for 18 days, the last an hour ago.
    const today = new Date(Date.now() - 3_600_000);
    const rows: NewReading[] = Array.from({ length: 18 }, (_, i) => {
      const levelMm = 1380 - 40 * i;
      return {
        organisationId: org.organisationId, farmId: tank.farmId, tankId: tank.id, takenAt: new Date(today.getTime() - (17 - i) * 86_400_000), source: 'round', levelMm,
        grossL: levelMm * L_PER_MM, usableL: (levelMm - 100) * L_PER_MM, temperatureC: null, calibrationVersion: tank.calibrationVersion, enteredById: null, importId: null, note: '', idempotencyKey: null,
      };
    });
    await env.ctx.db.sequelize.transaction((t) => insertReadings(env.ctx, rows, new Map([[tank.farmId, 'Europe/Dublin']]), t));
    const manager = await signedIn(env, org.users.manager.email);
    const f = (await manager.get(`/api/tanks/${tank.id}/forecast`).expect(200)).body;
    // 40 mm a day of a 1 m cylinder = 40 · π/4 = 31.416 L/day (hand derivation); usable now (700 − 100) mm.
    expect(f.meanLPerDay).toBeCloseTo(40 * L_PER_MM, 3);
    // Cover counts from the last reading: what has been drawn since then is already gone.
    const sinceDays = (Date.now() - today.getTime()) / 86_400_000;
    expect(f.daysOfCover).toBeCloseTo(600 / 40 - sinceDays, 2);
    expect(f.leaks).toEqual([]);
    const board = (await manager.get('/api/board').expect(200)).body;
    const tile = board.farms[0].tanks.find((t: { tankId: number }) => t.tankId === tank.id);
    expect(tile.daysOfCover).toBeCloseTo(15 - (Date.now() - today.getTime()) / 86_400_000, 2);
  });

  it('answers the board with the cached rate and refreshes a stale one in the background, then announces the farm', async () => {
    const org = await makeOrganisation(env);
    const tank = await makeTank(env, org, org.farmIds[0], { code: 'F2' });
    const today = new Date(Date.now() - 3_600_000);
    await env.ctx.db.sequelize.transaction((t) => insertReadings(env.ctx, steadyDraw(tank, org.organisationId, today), new Map([[tank.farmId, 'Europe/Dublin']]), t));
    const announced: { organisationId: number; farmIds: number[] }[] = [];
    const listen = (e: { organisationId: number; farmIds: number[] }) => announced.push(e);
    env.ctx.events.on('forecasts', listen);
    try {
      const manager = await signedIn(env, org.users.manager.email);
      const tileOf = (board: { farms: { tanks: { tankId: number; useLPerDay: number | null; daysOfCover: number | null }[] }[] }) => board.farms.flatMap((f) => f.tanks).find((t) => t.tankId === tank.id)!;
      // No rate has been computed yet: the board does not wait for it.
      expect(tileOf((await manager.get('/api/board').expect(200)).body).useLPerDay).toBeNull();
      await queueForecastRefresh(env.ctx, []);
      expect(announced).toContainEqual({ organisationId: org.organisationId, farmIds: [tank.farmId] });
      const tile = tileOf((await manager.get('/api/board').expect(200)).body);
      // 40 mm a day of a 1 m cylinder = 40 · π/4 = 31.416 L/day (hand derivation, as above).
      expect(tile.useLPerDay).toBeCloseTo(40 * L_PER_MM, 3);
      expect(tile.daysOfCover).toBeCloseTo(15 - (Date.now() - today.getTime()) / 86_400_000, 2);
      // Fresh now: a further board read queues nothing and announces nothing.
      announced.length = 0;
      await manager.get('/api/board').expect(200);
      await queueForecastRefresh(env.ctx, []);
      expect(announced).toEqual([]);
    } finally {
      env.ctx.events.off('forecasts', listen);
    }
  });
});
