// The sample logger files of samples/loggers through the import API, on tanks made as the demo
// scenario describes them; the counts and volumes are those samples/loggers/README.md states.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { calibrationVersion, type TankGeometry } from '@shared/calibration';
import type { ImportMappingInput } from '@shared/imports';
import type { TankContents } from '@shared/schemas';
import { useTestApp, type TestEnv } from '../support/db';
import { makeOrganisation, signedIn, type OrgFixture } from '../support/fixtures';
import { upload } from '../support/import-uploads';

// The demo scenario's tanks, made exactly as samples/demo/scenario.json describes them.
interface ScenarioTank {
  farm: string;
  code: string;
  name: string;
  contents: TankContents;
  geometry: TankGeometry;
  datumOffsetMm: number;
  outletHeightMm: number;
  safeFillLevelMm: number;
  lowStockL: number;
  specificGravity: number;
}
const scenario = JSON.parse(readFileSync(join(process.cwd(), 'samples/demo/scenario.json'), 'utf8')) as { tanks: ScenarioTank[] };
const sample = (name: string) => readFileSync(join(process.cwd(), 'samples/loggers', name));

async function scenarioTank(env: TestEnv, org: OrgFixture, code: string, sensorHeightMm: number | null = null) {
  const t = scenario.tanks.find((x) => x.code === code)!;
  const version = calibrationVersion(t.geometry, t.datumOffsetMm);
  const tank = await env.ctx.db.models.Tank.create({
    organisationId: org.organisationId, farmId: org.farmIds[0], name: t.name, code: t.code, contents: t.contents, contentsNote: '', geometry: t.geometry, datumOffsetMm: t.datumOffsetMm,
    outletHeightMm: t.outletHeightMm, safeFillLevelMm: t.safeFillLevelMm, lowStockL: t.lowStockL, specificGravity: t.specificGravity, sensorHeightMm, walkOrder: 0, calibrationVersion: version, archivedAt: null,
  });
  await env.ctx.db.models.TankCalibration.create({ organisationId: org.organisationId, tankId: tank.id, version, geometry: t.geometry, datumOffsetMm: t.datumOffsetMm });
  return tank;
}

// The mappings and counts samples/loggers/README.md states.
const MF_W1: ImportMappingInput = { delimiter: ',', hasHeader: true, timestamp: { column: 'Timestamp', format: 'iso8601' }, value: { column: 'Level (mm)', kind: 'level', unit: 'mm' } };
const HR_W1: ImportMappingInput = { delimiter: 'auto', decimalComma: true, hasHeader: true, timestamp: { column: 0, format: 'DD/MM/YYYY HH:mm', timeZone: 'Europe/Dublin' }, value: { column: 1, kind: 'ultrasonic', unit: 'cm' }, temperature: { column: 2, unit: 'C' } };
const HR_C1: ImportMappingInput = { delimiter: ',', hasHeader: true, timestamp: { column: 'time_utc', format: 'YYYY-MM-DD HH:mm:ss', timeZone: 'UTC' }, value: { column: 'pressure_kpa', kind: 'pressure', unit: 'kPa' }, temperature: { column: 'temp_c', unit: 'C' } };
const SO_W1: ImportMappingInput = { delimiter: ',', hasHeader: true, timestamp: { column: 'time', format: 'iso8601' }, value: { column: 'level_m', kind: 'level', unit: 'm' } };

describe('sample logger files (samples/loggers/README.md)', () => {
  const env = useTestApp();

  it('imports the MF-W1 level files: 336 new, then 144 new and 48 duplicate for the overlapping one', async () => {
    const org = await makeOrganisation(env);
    const tank = await scenarioTank(env, org, 'MF-W1');
    const worker = await signedIn(env, org.users.worker.email);
    const first = await upload(worker, { tankId: tank.id, mapping: MF_W1, files: [{ name: 'mf-w1-level-2025-07-07.csv', content: sample('mf-w1-level-2025-07-07.csv') }] }).expect(201);
    expect(first.body.imports[0]).toMatchObject({ status: 'imported', rowsTotal: 336, rowsNew: 336, rowsDuplicate: 0, rowsRejected: 0 });
    const second = await upload(worker, { tankId: tank.id, mapping: MF_W1, files: [{ name: 'mf-w1-level-2025-07-13.csv', content: sample('mf-w1-level-2025-07-13.csv') }] }).expect(201);
    expect(second.body.imports[0]).toMatchObject({ status: 'imported', rowsTotal: 192, rowsNew: 144, rowsDuplicate: 48, rowsRejected: 0 });
    const again = await upload(worker, { tankId: tank.id, mapping: MF_W1, files: [{ name: 'mf-w1-level-2025-07-07.csv', content: sample('mf-w1-level-2025-07-07.csv') }] }).expect(201);
    expect(again.body.imports[0]).toMatchObject({ status: 'duplicate', rowsNew: 0, rowsDuplicate: 336 });
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: tank.id } })).toBe(480);
  });

  it('imports the HR-W1 ultrasonic file across the end of summer time: 338 new, the repeated hour read in row order', async () => {
    const org = await makeOrganisation(env);
    const tank = await scenarioTank(env, org, 'HR-W1', 2450);
    const worker = await signedIn(env, org.users.worker.email);
    const res = await upload(worker, { tankId: tank.id, mapping: HR_W1, files: [{ name: 'hr-w1-ultrasonic-2025-10-23.csv', content: sample('hr-w1-ultrasonic-2025-10-23.csv') }] }).expect(201);
    expect(res.body.imports[0]).toMatchObject({ status: 'imported', delimiter: ';', rowsTotal: 338, rowsNew: 338, rowsDuplicate: 0, rowsRepeated: 0, rowsRejected: 0, noticeCount: 4 });
    // Each row of the repeated hour is noted on its line: the first 01:00 and 01:30 as the summer-time pass, the second as winter time.
    expect(res.body.imports[0].notices.map((n: { note: string }) => /first time round/.test(n.note))).toEqual([true, true, false, false]);
    const readings = await env.ctx.db.models.Reading.findAll({ where: { tankId: tank.id }, order: [['takenAt', 'ASC']] });
    // 23/10/2025 00:00 Irish summer time (UTC+1) is 22 Oct 23:00 UTC; on 26 Oct the clocks go back at
    // 02:00 (01:00 UTC, Directive 2000/84/EC), so 01:00 and 01:30 come twice: UTC+1, then UTC+0.
    expect(readings[0].takenAt.toISOString()).toBe('2025-10-22T23:00:00.000Z');
    expect(readings[0].levelMm).toBeCloseTo(2450 - 247, 6);
    expect(readings[0].temperatureC).toBe(9.4);
    const times = readings.map((r) => r.takenAt.toISOString());
    expect(times).toContain('2025-10-26T00:00:00.000Z');
    expect(times).toContain('2025-10-26T00:30:00.000Z');
    expect(times).toContain('2025-10-26T01:00:00.000Z');
    expect(times).toContain('2025-10-26T01:30:00.000Z');
    expect(times).toContain('2025-10-26T02:00:00.000Z');
    expect(times.at(-1)).toBe('2025-10-29T23:30:00.000Z');
  });

  it('imports the HR-C1 pressure file with the culture temperature: 288 new', async () => {
    const org = await makeOrganisation(env);
    const tank = await scenarioTank(env, org, 'HR-C1');
    const worker = await signedIn(env, org.users.worker.email);
    const res = await upload(worker, { tankId: tank.id, mapping: HR_C1, files: [{ name: 'hr-c1-pressure-2025-08-11.csv', content: sample('hr-c1-pressure-2025-08-11.csv') }] }).expect(201);
    expect(res.body.imports[0]).toMatchObject({ status: 'imported', rowsTotal: 288, rowsNew: 288, rowsDuplicate: 0, rowsRejected: 0 });
    const first = (await env.ctx.db.models.Reading.findOne({ where: { tankId: tank.id }, order: [['takenAt', 'ASC']] }))!;
    // 10.746 kPa / (1.01 × 9.80665 m/s² × 1000 kg/m³) = 1.08491 m of culture above the sensor.
    expect(first.levelMm).toBeCloseTo((10.746 / (1.01 * 9.80665)) * 1000, 6);
    expect(first.temperatureC).toBe(21.9);
  });

  it('reports the four bad rows of the SO-W1 file by line: 212 new under valid-rows, nothing under reject-file', async () => {
    const org = await makeOrganisation(env);
    const tank = await scenarioTank(env, org, 'SO-W1');
    const worker = await signedIn(env, org.users.worker.email);
    const file = [{ name: 'so-w1-level-bad-rows-2025-09-01.csv', content: sample('so-w1-level-bad-rows-2025-09-01.csv') }];
    const strict = await upload(worker, { tankId: tank.id, mapping: SO_W1, policy: 'reject-file', files: file }).expect(201);
    expect(strict.body.imports[0]).toMatchObject({ status: 'rejected', rowsTotal: 216, rowsNew: 0, rowsRejected: 4 });
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: tank.id } })).toBe(0);
    const lenient = await upload(worker, { tankId: tank.id, mapping: SO_W1, policy: 'valid-rows', files: file }).expect(201);
    const imp = lenient.body.imports[0];
    expect(imp).toMatchObject({ status: 'imported', rowsTotal: 216, rowsNew: 212, rowsDuplicate: 0, rowsRejected: 4 });
    expect(imp.rejectedPreview.map((p: { line: number; field: string }) => [p.line, p.field])).toEqual([
      [55, 'value'],
      [80, 'timestamp'],
      [104, 'timestamp'],
      [154, 'value'],
    ]);
    expect(imp.rejectedPreview[0].reason).toBe('Value "ERR" is not a number');
    expect(imp.rejectedPreview[1].reason).toMatch(/no UTC offset/);
    expect(imp.rejectedPreview[2].reason).toMatch(/in the future/);
    expect(imp.rejectedPreview[3].reason).toMatch(/2\.150 m: Level 2,150 mm is 150 mm above the top of the tank \(2,000 mm\)/);
  });
});
