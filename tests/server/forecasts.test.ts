import { describe, expect, it } from 'vitest';
import { useTestApp } from '../support/db';
import { makeOrganisation, signedIn } from '../support/fixtures';
import { makeTank } from '../support/tanks';
import { insertReadings, type NewReading } from '../../server/services/readings';
import { computeForecast, queueForecastRefresh } from '../../server/services/forecasts';
import { addDays, farmDayStart } from '@shared/time';

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

// Europe/Madrid follows Directive 2000/84/EC, art. 2 and 3: summer time from 01:00 UTC on the last Sunday
// of March to 01:00 UTC on the last Sunday of October (IANA tzdb "Rule EU"); in 2026 29 March and 25 October.
describe('tank forecast days in the farm zone', () => {
  // A day before the window, then 14 days alternating 100 L and 20 L: mean 60 L/day, sample spread
  // √(14 · 40² / 13) = 41.510 L/day (hand computation).
  const USES = [20, ...Array.from({ length: 14 }, (_, i) => (i % 2 === 0 ? 100 : 20))];
  const SD = Math.sqrt((14 * 1600) / 13);

  it.each([
    ['spring', '2026-03-21', '2026-04-05T10:00:00Z'],
    ['autumn', '2026-10-17', '2026-11-01T10:00:00Z'],
  ])('bins readings taken at each local midnight by the farm day they start, across the %s change', async (_season, firstDate, now) => {
    const org = await makeOrganisation(env);
    const tank = await makeTank(env, org, org.farmIds[0], { code: `Z${firstDate.slice(5, 7)}` });
    let grossL = 1400 * L_PER_MM;
    const rows: NewReading[] = [];
    for (let i = 0; i <= USES.length; i++) {
      if (i > 0) grossL -= USES[i - 1];
      const levelMm = grossL / L_PER_MM;
      rows.push({
        organisationId: org.organisationId, farmId: tank.farmId, tankId: tank.id, takenAt: new Date(farmDayStart(addDays(firstDate, i), 'Europe/Madrid')), source: 'round', levelMm,
        grossL, usableL: (levelMm - 100) * L_PER_MM, temperatureC: null, calibrationVersion: tank.calibrationVersion, enteredById: null, importId: null, note: '', idempotencyKey: null,
      });
    }
    await env.ctx.db.sequelize.transaction((t) => insertReadings(env.ctx, rows, new Map([[tank.farmId, 'Europe/Madrid']]), t));
    const f = await computeForecast(env.ctx, tank, 'Europe/Madrid', { store: false, now: Date.parse(now) });
    expect(f.days).toBe(14);
    expect(f.meanLPerDay).toBeCloseTo(60, 6);
    expect(f.sdLPerDay).toBeCloseTo(SD, 6);
    // The same readings binned with one offset for the whole window (UTC here) mix neighbouring days.
    const utc = await computeForecast(env.ctx, tank, 'UTC', { store: false, now: Date.parse(now) });
    expect(utc.sdLPerDay).toBeLessThan(SD - 1);
  });
});
