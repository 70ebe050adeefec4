// The tank page's history series: day and week points follow the farm's own calendar. Pacific/Auckland keeps
// NZDT (UTC+13) from the last Sunday of September to the first Sunday of April (New Zealand Daylight Time Order
// 2007; recalled from memory); ISO 8601:2004 §2.2.10 and §3.2.2 start the calendar week on Monday.
// 3 December 2026 is a Thursday. Readings invented.
import { describe, expect, it } from 'vitest';
import { insertReadings, type NewReading } from '../../server/services/readings';
import { useTestApp } from '../support/db';
import { makeOrganisation, signedIn } from '../support/fixtures';
import { makeTank } from '../support/tanks';

const env = useTestApp();
const L_PER_MM = Math.PI / 4;

async function aucklandTank(instants: string[]) {
  const org = await makeOrganisation(env);
  const farmId = org.farmIds[0];
  await env.ctx.db.models.Farm.update({ timeZone: 'Pacific/Auckland' }, { where: { id: farmId } });
  const tank = await makeTank(env, org, farmId, { code: 'AK-S1', contents: 'water' });
  const rows: NewReading[] = instants.map((at, i) => ({
    organisationId: org.organisationId, farmId, tankId: tank.id, takenAt: new Date(at), source: 'round', levelMm: 1000 - i * 50, grossL: (1000 - i * 50) * L_PER_MM,
    usableL: (900 - i * 50) * L_PER_MM, temperatureC: null, calibrationVersion: tank.calibrationVersion, enteredById: null, importId: null, note: '', idempotencyKey: null,
  }));
  await env.ctx.db.sequelize.transaction((t) => insertReadings(env.ctx, rows, new Map([[farmId, 'Pacific/Auckland']]), t));
  const manager = await signedIn(env, org.users.manager.email);
  const series = async (bucket: string) =>
    (await manager.get(`/api/tanks/${tank.id}/series`).query({ from: '2026-11-30T00:00:00Z', to: '2026-12-10T00:00:00Z', bucket }).expect(200)).body.map((p: { t: string }) => p.t);
  return { series };
}

describe('tank series buckets', () => {
  it('keeps the last reading of each farm-local day, not of each UTC day (Auckland, UTC+13)', async () => {
    const { series } = await aucklandTank([
      '2026-12-02T20:00:00Z', // 09:00 on 3 December in Auckland (2 December in UTC)
      '2026-12-03T09:00:00Z', // 22:00 on 3 December
      '2026-12-03T12:00:00Z', // 01:00 on 4 December (still 3 December in UTC)
    ]);
    expect(await series('day')).toEqual(['2026-12-03T09:00:00.000Z', '2026-12-03T12:00:00.000Z']);
  });

  it('splits weeks at the farm\'s Monday midnight, not at UTC\'s', async () => {
    const { series } = await aucklandTank([
      '2026-12-06T10:00:00Z', // 23:00 on Sunday 6 December in Auckland
      '2026-12-06T12:00:00Z', // 01:00 on Monday 7 December (still Sunday in UTC)
    ]);
    expect(await series('week')).toEqual(['2026-12-06T10:00:00.000Z', '2026-12-06T12:00:00.000Z']);
  });

  it('keeps each clock hour\'s last reading and every reading when raw', async () => {
    const { series } = await aucklandTank(['2026-12-03T09:05:00Z', '2026-12-03T09:40:00Z', '2026-12-03T10:10:00Z']);
    expect(await series('hour')).toEqual(['2026-12-03T09:40:00.000Z', '2026-12-03T10:10:00.000Z']);
    expect(await series('raw')).toHaveLength(3);
  });
});
