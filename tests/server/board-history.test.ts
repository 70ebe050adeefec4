// The board history's days: each farm's tanks follow the farm's local days, the dates end at the latest
// farm-local today, and the answer names each farm's zone. Offsets from the IANA Time Zone Database:
// Pacific/Auckland keeps NZDT (UTC+13) from the last Sunday of September to the first Sunday of April
// (New Zealand Daylight Time Order 2007; recalled from memory), America/Los_Angeles keeps PST (UTC−8)
// from the first Sunday of November (Energy Policy Act of 2005 §110, 15 U.S.C. §260a). Readings invented.
import { describe, expect, it } from 'vitest';
import type { SessionUser } from '@shared/schemas';
import { farmDayOf } from '@shared/time';
import { boardHistory } from '../../server/services/board';
import { insertReadings, type NewReading } from '../../server/services/readings';
import { useTestApp } from '../support/db';
import { makeOrganisation, signedIn } from '../support/fixtures';
import { makeTank } from '../support/tanks';

const env = useTestApp();
const L_PER_MM = Math.PI / 4;
// 13:57 UTC on Thursday 3 December 2026: 02:57 on Friday 4 December in Auckland, 05:57 on 3 December in Los Angeles.
const NOW = Date.parse('2026-12-03T13:57:00Z');

async function twoZoneFarms() {
  const org = await makeOrganisation(env);
  const [auckland, losAngeles] = org.farmIds;
  await env.ctx.db.models.Farm.update({ timeZone: 'Pacific/Auckland' }, { where: { id: auckland } });
  await env.ctx.db.models.Farm.update({ timeZone: 'America/Los_Angeles' }, { where: { id: losAngeles } });
  const water = await makeTank(env, org, auckland, { code: 'AK-W1', contents: 'water' });
  const fertilizer = await makeTank(env, org, losAngeles, { code: 'LA-F1', contents: 'fertilizer' });
  const reading = (tank: typeof water, at: string, levelMm: number): NewReading => ({
    organisationId: org.organisationId, farmId: tank.farmId, tankId: tank.id, takenAt: new Date(at), source: 'round', levelMm, grossL: levelMm * L_PER_MM, usableL: (levelMm - 100) * L_PER_MM,
    temperatureC: null, calibrationVersion: tank.calibrationVersion, enteredById: null, importId: null, note: '', idempotencyKey: null,
  });
  const rows = [
    reading(water, '2026-12-02T20:00:00Z', 1100), // 09:00 NZDT on 3 December
    reading(water, '2026-12-03T12:00:00Z', 900), // 01:00 NZDT on 4 December
    reading(fertilizer, '2026-12-03T06:00:00Z', 800), // 22:00 PST on 2 December
    reading(fertilizer, '2026-12-03T13:00:00Z', 600), // 05:00 PST on 3 December
  ];
  const zones = new Map([[auckland, 'Pacific/Auckland'], [losAngeles, 'America/Los_Angeles']]);
  await env.ctx.db.sequelize.transaction((t) => insertReadings(env.ctx, rows, zones, t));
  return { org, auckland, losAngeles };
}

describe('board history days', () => {
  it('labels each farm\'s figures by its own local day and ends at the latest farm-local today (Auckland and Los Angeles)', async () => {
    const { org, auckland, losAngeles } = await twoZoneFarms();
    const actor = { organisationId: org.organisationId, farmIds: org.farmIds } as SessionUser;
    const history = await boardHistory(env.ctx, actor, 14, NOW);
    expect(history.days).toHaveLength(14);
    expect(history.days[0]).toBe('2026-11-21');
    expect(history.days.at(-1)).toBe('2026-12-04');
    expect(history.farms.map(({ farmId, timeZone, today }) => ({ farmId, timeZone, today })).sort((a, b) => a.farmId - b.farmId)).toEqual([
      { farmId: auckland, timeZone: 'Pacific/Auckland', today: '2026-12-04' },
      { farmId: losAngeles, timeZone: 'America/Los_Angeles', today: '2026-12-03' },
    ]);
    const on = (contents: string, date: string) => history.series.find((s) => s.contents === contents)!.usableL[history.days.indexOf(date)];
    // Auckland's morning of 4 December already has a reading; 3 December holds the one before it.
    expect(on('water', '2026-12-02')).toBeNull();
    expect(on('water', '2026-12-03')).toBeCloseTo(1000 * L_PER_MM, 6);
    expect(on('water', '2026-12-04')).toBeCloseTo(800 * L_PER_MM, 6);
    // Los Angeles' evening of 2 December and morning of 3 December; not yet at 4 December, it counts its latest there.
    expect(on('fertilizer', '2026-12-01')).toBeNull();
    expect(on('fertilizer', '2026-12-02')).toBeCloseTo(700 * L_PER_MM, 6);
    expect(on('fertilizer', '2026-12-03')).toBeCloseTo(500 * L_PER_MM, 6);
    expect(on('fertilizer', '2026-12-04')).toBeCloseTo(500 * L_PER_MM, 6);
  });

  it('ends at the farm\'s own today for someone who sees only the Los Angeles farm', async () => {
    const { org, losAngeles } = await twoZoneFarms();
    const history = await boardHistory(env.ctx, { organisationId: org.organisationId, farmIds: [losAngeles] } as SessionUser, 14, NOW);
    expect(history.days.at(-1)).toBe('2026-12-03');
    expect(history.farms.map((f) => f.timeZone)).toEqual(['America/Los_Angeles']);
    expect(history.series.find((s) => s.contents === 'water')!.usableL.every((v) => v === null)).toBe(true);
  });

  it('answers GET /api/board/history with each farm\'s zone and today', async () => {
    const { org } = await twoZoneFarms();
    const manager = await signedIn(env, org.users.manager.email);
    const body = (await manager.get('/api/board/history').expect(200)).body;
    const now = Date.now();
    expect(body.farms).toHaveLength(2);
    for (const f of body.farms) expect(f.today).toBe(farmDayOf(now, f.timeZone));
    expect(body.days.at(-1)).toBe([...body.farms.map((f: { today: string }) => f.today)].sort().at(-1));
  });
});
