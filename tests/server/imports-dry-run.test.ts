// Logger imports: the dry run (every row checked, nothing stored, the same counts as the import), the
// two duplicate counts, a date column plus a time column (the MF-F1 sample), local times in the spring
// gap, moments in messages, the one wording of the refuse-the-file choice, and what the form is told
// of a tank (its saved mapping without a 404, and who may change its setup).
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { calibrationVersion, type TankGeometry } from '@shared/calibration';
import { IMPORT_POLICY_TITLES, type ImportMappingInput } from '@shared/imports';
import { useTestApp, type TestEnv } from '../support/db';
import { makeOrganisation, signedIn, type Agent, type OrgFixture } from '../support/fixtures';
import { makeTank } from '../support/tanks';

const LEVEL: ImportMappingInput = { delimiter: ',', hasHeader: true, timestamp: { column: 'time', format: 'iso8601' }, value: { column: 'level_mm', kind: 'level', unit: 'mm' } };
const levelCsv = (rows: [string, string | number][]) => `time,level_mm\n${rows.map(([t, v]) => `${t},${v}`).join('\n')}\n`;
const hourly = (startIso: string, n: number): [string, number][] => Array.from({ length: n }, (_, i) => [new Date(Date.parse(startIso) + i * 3_600_000).toISOString(), 1200 - 10 * i]);

interface UploadOpts {
  tankId: number;
  files: { name: string; content: string | Buffer }[];
  mapping?: ImportMappingInput;
  policy?: 'reject-file' | 'valid-rows';
  dryRun?: boolean;
}
function upload(agent: Agent, o: UploadOpts) {
  let req = agent
    .post(`/api/imports${o.dryRun ? '?dryRun=true' : ''}`)
    .set('x-csrf-token', agent.csrf)
    .field('tankId', String(o.tankId))
    .field('mapping', JSON.stringify(o.mapping ?? LEVEL));
  if (o.policy) req = req.field('policy', o.policy);
  for (const f of o.files) req = req.attach('files', Buffer.isBuffer(f.content) ? f.content : Buffer.from(f.content, 'utf8'), { filename: f.name, contentType: 'text/csv' });
  return req;
}

async function world(env: TestEnv) {
  const org = await makeOrganisation(env);
  const tank = await makeTank(env, org, org.farmIds[0], { code: 'DR' });
  const worker = await signedIn(env, org.users.worker.email);
  return { org, tank, worker };
}

const counts = (r: Record<string, unknown>) => ({ status: r.status, rowsTotal: r.rowsTotal, rowsNew: r.rowsNew, rowsDuplicate: r.rowsDuplicate, rowsRepeated: r.rowsRepeated, rowsRejected: r.rowsRejected, noticeCount: r.noticeCount });

describe('POST /api/imports?dryRun=true', () => {
  const env = useTestApp();

  it('checks every row, stores nothing, and gives the counts the import then gives', async () => {
    const { tank, worker } = await world(env);
    await upload(worker, { tankId: tank.id, files: [{ name: 'first.csv', content: levelCsv(hourly('2025-05-01T00:00:00Z', 10)) }] }).expect(201);
    // 60 rows: 4 overlap the first file, row 3 is written twice, and the bad row is far past the first 20.
    const rows = hourly('2025-05-01T06:00:00Z', 60) as [string, string | number][];
    rows.splice(3, 0, rows[2]);
    rows[50] = [rows[50][0], 'ERR'];
    const file = { name: 'second.csv', content: levelCsv(rows) };
    const readingsBefore = await env.ctx.db.models.Reading.count({ where: { tankId: tank.id } });
    const importsBefore = await env.ctx.db.models.LoggerImport.count({ where: { tankId: tank.id } });

    const dry = await upload(worker, { tankId: tank.id, policy: 'valid-rows', files: [file], dryRun: true }).expect(200);
    expect(dry.body.dryRun).toBe(true);
    const [preview] = dry.body.imports;
    expect(counts(preview)).toEqual({ status: 'imported', rowsTotal: 61, rowsNew: 55, rowsDuplicate: 4, rowsRepeated: 1, rowsRejected: 1, noticeCount: 0 });
    expect(preview.rejectedPreview).toMatchObject([{ line: 52, field: 'value', column: 'level_mm', value: 'ERR', reason: 'Value "ERR" is not a number' }]);
    // The reason's code comes along, so a screen in another language words it (area checks).
    expect(preview.rejectedPreview[0].problem).toEqual({ code: 'imports.number.value.notNumber', params: { text: 'ERR' } });
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: tank.id } })).toBe(readingsBefore);
    expect(await env.ctx.db.models.LoggerImport.count({ where: { tankId: tank.id } })).toBe(importsBefore);
    expect(await env.ctx.db.models.TankLatest.findByPk(tank.id)).toMatchObject({ levelMm: 1110 });

    const real = await upload(worker, { tankId: tank.id, policy: 'valid-rows', files: [file] }).expect(201);
    expect(counts(real.body.imports[0])).toEqual(counts(preview));
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: tank.id } })).toBe(readingsBefore + 55);
  });

  it('says a file would be refused under reject-file, in the words of the choice, and lists every bad row', async () => {
    const { tank, worker } = await world(env);
    const rows = hourly('2025-06-01T00:00:00Z', 40) as [string, string | number][];
    rows[30] = [rows[30][0], 'n/a'];
    const keptBefore = await env.ctx.db.models.LoggerImportRejection.count();
    const dry = await upload(worker, { tankId: tank.id, policy: 'reject-file', files: [{ name: 'bad.csv', content: levelCsv(rows) }], dryRun: true }).expect(200);
    expect(counts(dry.body.imports[0])).toEqual({ status: 'rejected', rowsTotal: 40, rowsNew: 0, rowsDuplicate: 0, rowsRepeated: 0, rowsRejected: 1, noticeCount: 0 });
    expect(dry.body.imports[0].error).toBe(`1 of 40 rows have problems, so nothing from this file was stored ("${IMPORT_POLICY_TITLES['reject-file']}" was chosen)`);
    expect(dry.body.imports[0].rejectedPreview.map((p: { line: number }) => p.line)).toEqual([32]);
    expect(await env.ctx.db.models.LoggerImportRejection.count()).toBe(keptBefore);
  });

  it('tells of an exact file imported already, with the date written as the app writes dates', async () => {
    const { tank, worker } = await world(env);
    const file = { name: 'week.csv', content: levelCsv(hourly('2025-05-04T00:00:00Z', 24)) };
    const first = await upload(worker, { tankId: tank.id, files: [file] }).expect(201);
    const dry = await upload(worker, { tankId: tank.id, files: [file], dryRun: true }).expect(200);
    expect(dry.body.imports[0]).toMatchObject({ status: 'duplicate', rowsNew: 0, rowsDuplicate: 24, duplicateOfId: first.body.imports[0].id });
    const again = await upload(worker, { tankId: tank.id, files: [file] }).expect(201);
    for (const message of [dry.body.imports[0].error, again.body.imports[0].error]) {
      expect(message).toMatch(/\(import \d+, \d{1,2} [A-Z][a-z]{2} \d{4}, \d{2}:\d{2}\)/);
      expect(message).not.toMatch(/\d{4}-\d{2}-\d{2}/);
    }
  });

  it('refuses a dry run with the same field errors as an import and keeps no file', async () => {
    const { tank, worker } = await world(env);
    const res = await upload(worker, { tankId: tank.id, mapping: { ...LEVEL, value: { column: 'level_mm', kind: 'ultrasonic', unit: 'mm' } }, files: [{ name: 'a.csv', content: levelCsv(hourly('2025-05-01T00:00:00Z', 2)) }], dryRun: true }).expect(422);
    expect(res.body.error).toMatchObject({ code: 'mapping_unfit', field: 'mapping.value.kind' });
  });
});

describe('duplicates in two counts', () => {
  const env = useTestApp();

  it('counts rows repeated inside the file apart from rows an earlier file stored', async () => {
    const { tank, worker } = await world(env);
    await upload(worker, { tankId: tank.id, files: [{ name: 'a.csv', content: levelCsv(hourly('2025-07-01T00:00:00Z', 6)) }] }).expect(201);
    const rows = hourly('2025-07-01T04:00:00Z', 6);
    // Two rows of the earlier file (04:00, 05:00), and 06:00 and 09:00 each written twice, one out of order.
    const file = levelCsv([...rows.slice(0, 3), rows[2], ...rows.slice(3), rows[5]]);
    const res = await upload(worker, { tankId: tank.id, files: [{ name: 'b.csv', content: file }] }).expect(201);
    expect(counts(res.body.imports[0])).toEqual({ status: 'imported', rowsTotal: 8, rowsNew: 4, rowsDuplicate: 2, rowsRepeated: 2, rowsRejected: 0, noticeCount: 0 });
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: tank.id } })).toBe(10);
    const again = await upload(worker, { tankId: tank.id, files: [{ name: 'b again.csv', content: file }] }).expect(201);
    expect(counts(again.body.imports[0])).toMatchObject({ status: 'duplicate', rowsNew: 0, rowsDuplicate: 6, rowsRepeated: 2 });
  });
});

describe('local time in a logger file', () => {
  const env = useTestApp();

  it('refuses a row in the spring-forward gap on its line and stores the rest', async () => {
    const { tank, worker } = await world(env);
    // Europe/Dublin goes from 01:00 to 02:00 on 29 Mar 2026 (IANA Time Zone Database, europe file: Rule EU, lastSun Mar 1:00u).
    const mapping: ImportMappingInput = { ...LEVEL, timestamp: { column: 'time', format: 'YYYY-MM-DD HH:mm', timeZone: 'Europe/Dublin' } };
    const res = await upload(worker, { tankId: tank.id, mapping, policy: 'valid-rows', files: [{ name: 'spring.csv', content: 'time,level_mm\n2026-03-29 00:30,900\n2026-03-29 01:30,899\n2026-03-29 02:30,898\n' }] }).expect(201);
    expect(res.body.imports[0]).toMatchObject({ status: 'imported', rowsNew: 2, rowsRejected: 1 });
    expect(res.body.imports[0].rejectedPreview[0]).toMatchObject({ line: 3, field: 'timestamp', value: '2026-03-29 01:30', reason: expect.stringMatching(/does not exist in Europe\/Dublin: the clocks went forward from 01:00 to 02:00 on 29 Mar 2026/) });
    const times = (await env.ctx.db.models.Reading.findAll({ where: { tankId: tank.id }, order: [['takenAt', 'ASC']] })).map((r) => r.takenAt.toISOString());
    expect(times).toEqual(['2026-03-29T00:30:00.000Z', '2026-03-29T01:30:00.000Z']);
  });
});

// The MF-F1 fertigation tote of samples/demo/scenario.json: a 1,200 × 1,000 × 1,000 mm box, outlet 30 mm.
const MF_F1_GEOMETRY: TankGeometry = { shape: 'box', lengthMm: 1200, widthMm: 1000, heightMm: 1000 };
async function fertigationTote(env: TestEnv, org: OrgFixture) {
  const version = calibrationVersion(MF_F1_GEOMETRY, 0);
  const tank = await env.ctx.db.models.Tank.create({
    organisationId: org.organisationId, farmId: org.farmIds[0], name: 'Fertigation tote', code: 'MF-F1', contents: 'fertilizer', contentsNote: '', geometry: MF_F1_GEOMETRY, datumOffsetMm: 0,
    outletHeightMm: 30, safeFillLevelMm: 960, lowStockL: 200, specificGravity: 1.05, sensorHeightMm: null, walkOrder: 0, calibrationVersion: version, archivedAt: null,
  });
  await env.ctx.db.models.TankCalibration.create({ organisationId: org.organisationId, tankId: tank.id, version, geometry: MF_F1_GEOMETRY, datumOffsetMm: 0 });
  return tank;
}
const MF_F1: ImportMappingInput = {
  delimiter: ',',
  hasHeader: true,
  timestamp: { column: 'Date', format: 'DD/MM/YYYY', timeZone: 'Europe/Dublin', time: { column: 'Time', format: 'HH:mm:ss' } },
  value: { column: 'Level (cm)', kind: 'level', unit: 'cm' },
  temperature: { column: 'Water temp (C)', unit: 'C' },
};

describe('sample logger file with the date and the time in two columns (samples/loggers/README.md)', () => {
  const env = useTestApp();

  it('imports mf-f1-date-time-2026-03-26.csv: 335 rows, 334 new, 1 repeated in the file', async () => {
    const org = await makeOrganisation(env);
    const tank = await fertigationTote(env, org);
    const worker = await signedIn(env, org.users.worker.email);
    const content = readFileSync(join(process.cwd(), 'samples/loggers/mf-f1-date-time-2026-03-26.csv'));
    const res = await upload(worker, { tankId: tank.id, mapping: MF_F1, files: [{ name: 'mf-f1-date-time-2026-03-26.csv', content }] }).expect(201);
    expect(counts(res.body.imports[0])).toEqual({ status: 'imported', rowsTotal: 335, rowsNew: 334, rowsDuplicate: 0, rowsRepeated: 1, rowsRejected: 0, noticeCount: 0 });
    const readings = await env.ctx.db.models.Reading.findAll({ where: { tankId: tank.id }, order: [['takenAt', 'ASC']] });
    // 26/03/2026 00:00 is Irish winter time (UTC+0); from 29 Mar 02:00 local it is summer time (UTC+1).
    expect(readings[0].takenAt.toISOString()).toBe('2026-03-26T00:00:00.000Z');
    expect(readings[0]).toMatchObject({ levelMm: 820, temperatureC: 6.3 });
    const times = readings.map((r) => r.takenAt.toISOString());
    expect(times).toContain('2026-03-29T00:30:00.000Z');
    expect(times).toContain('2026-03-29T01:00:00.000Z');
    expect(times.at(-1)).toBe('2026-04-01T22:30:00.000Z');
  });
});

describe('GET /api/tanks/:id/import-mapping', () => {
  const env = useTestApp();

  it('answers 200 with no saved mapping for a new tank, and names who may change the tank', async () => {
    const { org, tank, worker } = await world(env);
    await env.ctx.db.models.User.create({ organisationId: org.organisationId, email: `invited-${tank.id}@test.example`, name: 'Invited Manager', role: 'manager', passwordHash: null, lastSignInAt: null });
    const res = await worker.get(`/api/tanks/${tank.id}/import-mapping`).expect(200);
    expect(res.body.saved).toBeNull();
    const owner = await env.ctx.db.models.User.findByPk(org.users.owner.id);
    const manager = await env.ctx.db.models.User.findByPk(org.users.manager.id);
    // Owners first, then managers; someone still to take up an invitation is left out.
    expect(res.body.tankEditors).toEqual([
      { name: owner!.name, role: 'owner' },
      { name: manager!.name, role: 'manager' },
    ]);
  });
});
