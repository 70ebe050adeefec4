// Logger file import API: upload, both policies, duplicates and overlaps, content checks and size
// limit, refused-rows download, farm isolation, progress events and retry (the sample files are in
// imports-samples.test.ts).
// Expected volumes are hand derivations for the 1,000 mm test cylinder (π/4 · (1 m)² = 785.398 L per m).
import { gzipSync } from 'node:zlib';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import type { ImportMappingInput } from '@shared/imports';
import type { ImportProgress } from '@shared/schemas';
import { recoverInterruptedImports } from '../../server/services/imports';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn } from '../support/fixtures';
import { makeTank } from '../support/tanks';
import { LEVEL_MAPPING, hourly, levelCsv, storedFiles, upload, world } from '../support/import-uploads';

const L_PER_MM = Math.PI / 4;

describe('POST /api/imports', () => {
  const env = useTestApp();

  it('stores every row of a clean file with litres from the shared conversion and saves the mapping', async () => {
    const { org, tank, worker } = await world(env);
    expect((await worker.get(`/api/tanks/${tank.id}/import-mapping`).expect(200)).body.saved).toBeNull();
    const res = await upload(worker, { tankId: tank.id, files: [{ name: 'clean.csv', content: levelCsv(hourly('2025-05-01T00:00:00Z', 5)) }] }).expect(201);
    const [imp] = res.body.imports;
    expect(imp).toMatchObject({ status: 'imported', rowsTotal: 5, rowsNew: 5, rowsDuplicate: 0, rowsRejected: 0, originalName: 'clean.csv', tankId: tank.id, farmId: org.farmIds[0], delimiter: ',', policy: 'reject-file' });
    expect(imp.sha256).toMatch(/^[0-9a-f]{64}$/);
    const readings = await env.ctx.db.models.Reading.findAll({ where: { tankId: tank.id }, order: [['takenAt', 'ASC']] });
    expect(readings.map((r) => r.levelMm)).toEqual([1200, 1190, 1180, 1170, 1160]);
    expect(readings[0]).toMatchObject({ source: 'logger', importId: imp.id });
    expect(readings[0].grossL).toBeCloseTo(1200 * L_PER_MM, 6);
    expect(readings[0].usableL).toBeCloseTo(1100 * L_PER_MM, 6);
    expect((await env.ctx.db.models.TankLatest.findByPk(tank.id))!.levelMm).toBe(1160);
    const saved = await worker.get(`/api/tanks/${tank.id}/import-mapping`).expect(200);
    expect(saved.body.saved).toMatchObject({ tankId: tank.id, policy: 'reject-file', mapping: { timestamp: { column: 'time', format: 'iso8601' }, value: { kind: 'level', unit: 'mm' }, decimalComma: false, temperature: null } });
  });

  it('imports nothing and lists the bad row when one row is bad under reject-file', async () => {
    const { tank, worker } = await world(env);
    const rows = hourly('2025-05-02T00:00:00Z', 5) as [string, string | number][];
    rows[2] = [rows[2][0], 'n/a'];
    const res = await upload(worker, { tankId: tank.id, policy: 'reject-file', files: [{ name: 'one-bad.csv', content: levelCsv(rows) }] }).expect(201);
    const [imp] = res.body.imports;
    expect(imp).toMatchObject({ status: 'rejected', rowsTotal: 5, rowsNew: 0, rowsRejected: 1 });
    expect(imp.error).toMatch(/1 of 5 rows have problems, so nothing/);
    // Header on line 1, so the third data row is on line 4.
    expect(imp.rejectedPreview).toEqual([{ line: 4, field: 'value', column: 'level_mm', value: 'n/a', reason: 'Value "n/a" is not a number' }]);
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: tank.id } })).toBe(0);
    expect((await worker.get(`/api/tanks/${tank.id}/import-mapping`).expect(200)).body.saved).toBeNull();
  });

  it('imports the good rows and reports the bad one under valid-rows', async () => {
    const { tank, worker } = await world(env);
    const rows = hourly('2025-05-03T00:00:00Z', 5) as [string, string | number][];
    rows[4] = [rows[4][0], 1600];
    const res = await upload(worker, { tankId: tank.id, policy: 'valid-rows', files: [{ name: 'one-bad.csv', content: levelCsv(rows) }] }).expect(201);
    const [imp] = res.body.imports;
    expect(imp).toMatchObject({ status: 'imported', rowsTotal: 5, rowsNew: 4, rowsDuplicate: 0, rowsRejected: 1, error: null });
    expect(imp.rejectedPreview[0]).toMatchObject({ line: 6, field: 'value', value: '1600' });
    expect(imp.rejectedPreview[0].reason).toMatch(/above the top of the tank/);
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: tank.id } })).toBe(4);
  });

  it('reports a re-upload of the same file as a duplicate and adds nothing', async () => {
    const { tank, worker } = await world(env);
    const file = { name: 'week.csv', content: levelCsv(hourly('2025-05-04T00:00:00Z', 24)) };
    const first = await upload(worker, { tankId: tank.id, files: [file] }).expect(201);
    const filesAfterFirst = storedFiles(env).length;
    const again = await upload(worker, { tankId: tank.id, files: [{ ...file, name: 'week (copy).csv' }] }).expect(201);
    expect(again.body.imports[0]).toMatchObject({ status: 'duplicate', rowsNew: 0, rowsDuplicate: 24, duplicateOfId: first.body.imports[0].id, sha256: first.body.imports[0].sha256 });
    expect(again.body.imports[0].error).toMatch(/imported into this tank already/);
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: tank.id } })).toBe(24);
    expect(storedFiles(env).length).toBe(filesAfterFirst);
  });

  it('adds only the new rows of a file that overlaps an earlier one', async () => {
    const { tank, worker } = await world(env);
    await upload(worker, { tankId: tank.id, files: [{ name: 'a.csv', content: levelCsv(hourly('2025-05-05T00:00:00Z', 10)) }] }).expect(201);
    const res = await upload(worker, { tankId: tank.id, files: [{ name: 'b.csv', content: levelCsv(hourly('2025-05-05T06:00:00Z', 10)) }] }).expect(201);
    expect(res.body.imports[0]).toMatchObject({ status: 'imported', rowsTotal: 10, rowsNew: 6, rowsDuplicate: 4 });
    expect(await env.ctx.db.models.Reading.count({ where: { tankId: tank.id } })).toBe(16);
  });

  it('imports several files of one upload one after the other', async () => {
    const { tank, worker } = await world(env);
    const res = await upload(worker, {
      tankId: tank.id,
      files: [
        { name: 'one.csv', content: levelCsv(hourly('2025-05-06T00:00:00Z', 3)) },
        { name: 'two.csv', content: levelCsv(hourly('2025-05-06T03:00:00Z', 3)) },
      ],
    }).expect(201);
    expect(res.body.imports.map((i: { originalName: string; rowsNew: number }) => [i.originalName, i.rowsNew])).toEqual([['one.csv', 3], ['two.csv', 3]]);
  });

  it.each([
    ['an empty file', '', /The file is empty/],
    ['a file of blank lines and a byte-order mark', '\uFEFF\r\n\r\n', /The file is empty/],
    ['a header-only file', 'time,level_mm\r\n', /header row but no data rows/],
  ])('rejects %s with a clear message', async (_name, content, message) => {
    const { tank, worker } = await world(env);
    const res = await upload(worker, { tankId: tank.id, files: [{ name: 'empty.csv', content }] }).expect(201);
    expect(res.body.imports[0]).toMatchObject({ status: 'rejected', rowsTotal: 0, rowsNew: 0 });
    expect(res.body.imports[0].error).toMatch(message);
  });

  it('rejects the file when a mapped column is not in the header row', async () => {
    const { tank, worker } = await world(env);
    const res = await upload(worker, { tankId: tank.id, mapping: { ...LEVEL_MAPPING, value: { column: 'depth', kind: 'level', unit: 'mm' } }, files: [{ name: 'x.csv', content: levelCsv(hourly('2025-05-07T00:00:00Z', 2)) }] }).expect(201);
    expect(res.body.imports[0].status).toBe('rejected');
    expect(res.body.imports[0].error).toBe('Value column: The column "depth" is not in the header row (it has "time", "level_mm")');
  });

  // Signatures: ZIP local file header "PK\x03\x04" (PKWARE APPNOTE.TXT §4.3.7), gzip made by Node's zlib
  // (RFC 1952 §2.3.1 ID1 ID2 = 1F 8B), a NUL byte; section numbers recalled from memory, not re-checked.
  it.each([
    ['a ZIP archive', Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x00, 0x00, 0x08, 0x00]), /ZIP archive/],
    ['a gzip file', gzipSync(Buffer.from(levelCsv(hourly('2025-05-08T00:00:00Z', 3)))), /gzip-compressed/],
    ['a file with NUL bytes', Buffer.concat([Buffer.from('time,level_mm\n2025-05-08T00:00:00Z,5'), Buffer.from([0, 0, 0])]), /NUL bytes/],
    ['UTF-16 text', Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('time,level_mm\n', 'utf16le')]), /UTF-16/],
  ])('refuses %s with 415, stores nothing and keeps no file', async (_name, content, message) => {
    const { tank, worker } = await world(env);
    const before = storedFiles(env).length;
    const res = await upload(worker, { tankId: tank.id, files: [{ name: 'good.csv', content: levelCsv(hourly('2025-05-08T00:00:00Z', 2)) }, { name: 'logger.csv', content }] }).expect(415);
    expect(res.body.error).toMatchObject({ code: 'not_csv', field: 'files' });
    expect(res.body.error.message).toMatch(/"logger\.csv" cannot be imported/);
    expect(res.body.error.message).toMatch(message);
    expect(await env.ctx.db.models.LoggerImport.count({ where: { tankId: tank.id } })).toBe(0);
    expect(storedFiles(env).length).toBe(before);
  });

  it('keeps a path-like file name as a label and stores the file under a generated name', async () => {
    const { tank, worker } = await world(env);
    const res = await upload(worker, { tankId: tank.id, files: [{ name: '../../outside/evil.csv', content: levelCsv(hourly('2025-05-09T00:00:00Z', 2)) }] }).expect(201);
    const rec = (await env.ctx.db.models.LoggerImport.findByPk(res.body.imports[0].id))!;
    expect(rec.storedName).toMatch(/^[0-9a-f-]{36}\.csv$/);
    expect(storedFiles(env)).toContain(rec.storedName);
    expect(res.body.imports[0].originalName).not.toContain('/..');
    expect(res.body.imports[0].originalName).toMatch(/evil\.csv$/);
    const accented = await upload(worker, { tankId: tank.id, files: [{ name: 'Füllstand °C.csv', content: levelCsv(hourly('2025-05-09T02:00:00Z', 2)) }] }).expect(201);
    expect(accented.body.imports[0].originalName).toBe('Füllstand °C.csv');
  });

  it('names the field when the mapping or the form is wrong', async () => {
    const { tank, worker } = await world(env);
    const file = [{ name: 'x.csv', content: levelCsv(hourly('2025-05-10T00:00:00Z', 2)) }];
    const notJson = await upload(worker, { tankId: tank.id, mapping: '{not json', files: file }).expect(400);
    expect(notJson.body.error).toMatchObject({ field: 'mapping', message: 'mapping: must be the column mapping as JSON text' });
    const noZone = await upload(worker, { tankId: tank.id, mapping: { ...LEVEL_MAPPING, timestamp: { column: 0, format: 'DD/MM/YYYY HH:mm' } }, files: file }).expect(400);
    expect(noZone.body.error.field).toBe('mapping.timestamp.timeZone');
    const badPolicy = await upload(worker, { tankId: tank.id, policy: 'maybe' as never, files: file }).expect(400);
    expect(badPolicy.body.error.field).toBe('policy');
    const noFiles = await call(worker, 'post', '/api/imports', { tankId: tank.id, mapping: LEVEL_MAPPING }).expect(400);
    expect(noFiles.body.error.field).toBe('files');
    const distance = await upload(worker, { tankId: tank.id, mapping: { ...LEVEL_MAPPING, value: { column: 1, kind: 'ultrasonic', unit: 'cm' } }, files: file }).expect(422);
    expect(distance.body.error).toMatchObject({ field: 'mapping.value.kind' });
    expect(distance.body.error.message).toMatch(/sensor height/);
    expect(await env.ctx.db.models.LoggerImport.count({ where: { tankId: tank.id } })).toBe(0);
  });

  it('keeps imports to the farms the uploader may see', async () => {
    const { org, worker } = await world(env);
    const other = await makeTank(env, org, org.farmIds[1], { code: 'OF' });
    const stranger = await makeOrganisation(env);
    const foreign = await makeTank(env, stranger, stranger.farmIds[0], { code: 'FR' });
    const file = [{ name: 'x.csv', content: levelCsv(hourly('2025-05-11T00:00:00Z', 2)) }];
    await upload(worker, { tankId: other.id, files: file }).expect(403);
    await upload(worker, { tankId: foreign.id, files: file }).expect(404);
    const buyer = await signedIn(env, org.users.buyer.email);
    await upload(buyer, { tankId: (await makeTank(env, org, org.farmIds[0], { code: 'BY' })).id, files: file }).expect(403);
    const manager = await signedIn(env, org.users.manager.email);
    const hidden = await upload(manager, { tankId: other.id, files: file }).expect(201);
    const hiddenId = hidden.body.imports[0].id;
    await worker.get(`/api/imports/${hiddenId}`).expect(403);
    await worker.get(`/api/imports/${hiddenId}/rejected.csv`).expect(403);
    await call(worker, 'post', `/api/imports/${hiddenId}/retry`).expect(403);
    const list = await worker.get('/api/imports').expect(200);
    expect(list.body.map((i: { id: number }) => i.id)).not.toContain(hiddenId);
    await worker.get(`/api/imports?farmId=${org.farmIds[1]}`).expect(403);
    const all = await manager.get(`/api/imports?farmId=${org.farmIds[1]}`).expect(200);
    expect(all.body.map((i: { id: number }) => i.id)).toEqual([hiddenId]);
    const strangerOwner = await signedIn(env, stranger.users.owner.email);
    await strangerOwner.get(`/api/imports/${hiddenId}`).expect(404);
  });

  it('lists a tank\'s imports newest first with who uploaded them', async () => {
    const { org, tank, worker } = await world(env);
    const a = await upload(worker, { tankId: tank.id, files: [{ name: 'first.csv', content: levelCsv(hourly('2025-05-12T00:00:00Z', 2)) }] }).expect(201);
    const b = await upload(worker, { tankId: tank.id, files: [{ name: 'second.csv', content: levelCsv(hourly('2025-05-12T02:00:00Z', 2)) }] }).expect(201);
    const list = await worker.get(`/api/imports?tankId=${tank.id}`).expect(200);
    expect(list.body.map((i: { id: number }) => i.id)).toEqual([b.body.imports[0].id, a.body.imports[0].id]);
    expect(list.body[0]).toMatchObject({ uploadedById: org.users.worker.id, tankCode: 'LG', tankName: 'Tank LG' });
    const one = await worker.get(`/api/imports/${a.body.imports[0].id}`).expect(200);
    expect(one.body).toMatchObject({ id: a.body.imports[0].id, rowsNew: 2, rejectedPreview: [], rejectedProblems: 0 });
  });

  it('downloads the refused rows as CSV with formula-like cells escaped', async () => {
    const { tank, worker } = await world(env);
    const rows = hourly('2025-05-13T00:00:00Z', 4) as [string, string | number][];
    rows[1] = [rows[1][0], '=1+2'];
    rows[3] = ['13/05/2025 03:00', 900];
    const res = await upload(worker, { tankId: tank.id, policy: 'valid-rows', files: [{ name: 'bad.csv', content: levelCsv(rows) }] }).expect(201);
    const id = res.body.imports[0].id;
    const csv = await worker.get(`/api/imports/${id}/rejected.csv`).expect(200);
    expect(csv.headers['content-type']).toMatch(/^text\/csv/);
    expect(csv.headers['content-disposition']).toBe(`attachment; filename=import-${id}-rejected.csv`);
    expect(csv.text.split('\r\n').slice(0, 2).every((line) => line.length > 0)).toBe(true);
    const parsed = Papa.parse<Record<string, string>>(csv.text.replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: true });
    expect(parsed.data).toHaveLength(2);
    // escapeFormulae prefixes a cell that starts with = + - @ with a quote so a spreadsheet shows it as text.
    expect(parsed.data[0]).toMatchObject({ line: '3', field: 'value', column: 'level_mm', value: "'=1+2" });
    expect(parsed.data[1]).toMatchObject({ line: '5', field: 'timestamp', column: 'time', value: '13/05/2025 03:00' });
    expect(parsed.data[1].reason).toMatch(/not ISO 8601/);
  });

  it('pushes throttled progress to the uploader and a final event, then tells boards about the new readings', async () => {
    const { org, tank, worker } = await world(env);
    const events: { userId: number; event: string; payload: ImportProgress; at: number }[] = [];
    const boards: { organisationId: number; farmIds: number[] }[] = [];
    const onUser = (e: { userId: number; event: string; payload: ImportProgress }) => events.push({ ...e, at: Date.now() });
    const onReadings = (e: { organisationId: number; farmIds: number[] }) => boards.push(e);
    env.ctx.events.on('user-event', onUser);
    env.ctx.events.on('readings', onReadings);
    const n = 30_000;
    const start = Date.parse('2024-01-01T00:00:00Z');
    const content = levelCsv(Array.from({ length: n }, (_, i) => [new Date(start + i * 60_000).toISOString(), 200 + (i % 1000)]));
    const t0 = Date.now();
    const res = await upload(worker, { tankId: tank.id, files: [{ name: 'month.csv', content }] }).expect(201);
    const took = Date.now() - t0;
    env.ctx.events.off('user-event', onUser);
    env.ctx.events.off('readings', onReadings);
    const id = res.body.imports[0].id;
    expect(res.body.imports[0]).toMatchObject({ status: 'imported', rowsNew: n });
    const mine = events.filter((e) => e.event === 'import:progress' && e.payload.importId === id);
    expect(mine.every((e) => e.userId === org.users.worker.id)).toBe(true);
    expect(mine[0].payload.status).toBe('importing');
    expect(mine.at(-1)!.payload).toEqual({ importId: id, rowsRead: n, bytesRead: Buffer.byteLength(content), totalBytes: Buffer.byteLength(content), status: 'imported' });
    // Start + end, and at most one per 250 ms between them.
    expect(mine.length).toBeLessThanOrEqual(2 + Math.ceil(took / 250));
    const middle = mine.slice(1, -1);
    for (let i = 1; i < middle.length; i++) expect(middle[i].at - middle[i - 1].at).toBeGreaterThanOrEqual(240);
    expect(boards).toContainEqual({ organisationId: org.organisationId, farmIds: [org.farmIds[0]] });
  });

  it('marks interrupted imports failed at start-up and retries one from its stored file', async () => {
    const { org, tank, worker } = await world(env);
    const res = await upload(worker, { tankId: tank.id, files: [{ name: 'crash.csv', content: levelCsv(hourly('2025-05-14T00:00:00Z', 6)) }] }).expect(201);
    const id = res.body.imports[0].id;
    // As if the server had died mid-file: the transaction's readings are gone, the record says importing.
    await env.ctx.db.models.Reading.destroy({ where: { importId: id } });
    await env.ctx.db.models.LoggerImport.update({ status: 'importing', rowsNew: 0 }, { where: { id } });
    await call(worker, 'post', `/api/imports/${id}/retry`).expect(409);
    expect(await recoverInterruptedImports(env.ctx)).toBeGreaterThanOrEqual(1);
    const failed = await worker.get(`/api/imports/${id}`).expect(200);
    expect(failed.body.status).toBe('failed');
    expect(failed.body.error).toMatch(/server stopped/);
    const again = await call(worker, 'post', `/api/imports/${id}/retry`).expect(200);
    expect(again.body).toMatchObject({ id, status: 'imported', rowsNew: 6, rowsTotal: 6, error: null, uploadedById: org.users.worker.id });
    expect(await env.ctx.db.models.Reading.count({ where: { importId: id } })).toBe(6);
    await call(worker, 'post', `/api/imports/${id}/retry`).expect(409);
  });

  it('reads semicolons, decimal commas, quoted fields, CRLF, a byte-order mark and local time', async () => {
    const { tank, worker } = await world(env);
    const content = '\uFEFF"Zeit";"Füllstand cm";"Temp"\r\n"31/03/2025 10:00";"50,5";"19,5"\r\n31/03/2025 10:30;"49,0";\r\n';
    const mapping: ImportMappingInput = { delimiter: 'auto', decimalComma: true, hasHeader: true, timestamp: { column: 0, format: 'DD/MM/YYYY HH:mm', timeZone: 'Europe/Dublin' }, value: { column: 'Füllstand cm', kind: 'level', unit: 'cm' }, temperature: { column: 2, unit: 'C' } };
    const res = await upload(worker, { tankId: tank.id, mapping, files: [{ name: 'semi.csv', content }] }).expect(201);
    expect(res.body.imports[0]).toMatchObject({ status: 'imported', rowsNew: 2, delimiter: ';' });
    const readings = await env.ctx.db.models.Reading.findAll({ where: { tankId: tank.id }, order: [['takenAt', 'ASC']] });
    // 31 March 2025 is Irish summer time (UTC+1), so 10:00 local is 09:00 UTC.
    expect(readings.map((r) => [r.takenAt.toISOString(), r.levelMm, r.temperatureC])).toEqual([
      ['2025-03-31T09:00:00.000Z', 505, 19.5],
      ['2025-03-31T09:30:00.000Z', 490, null],
    ]);
  });
});

describe('POST /api/imports size limit', () => {
  const env = useTestApp({ UPLOAD_MAX_MB: '0.01' });

  it('refuses a file over the limit with 413 naming the limit, and keeps no file', async () => {
    const { tank, worker } = await world(env);
    const big = levelCsv(hourly('2025-06-01T00:00:00Z', 600));
    expect(Buffer.byteLength(big)).toBeGreaterThan(0.01 * 1024 * 1024);
    const res = await upload(worker, { tankId: tank.id, files: [{ name: 'big.csv', content: big }] }).expect(413);
    expect(res.body.error).toMatchObject({ code: 'file_too_large', field: 'files' });
    expect(res.body.error.message).toContain('0.01 MB (10,486 bytes)');
    expect(storedFiles(env)).toEqual([]);
    expect(await env.ctx.db.models.LoggerImport.count()).toBe(0);
    await upload(worker, { tankId: tank.id, files: [{ name: 'small.csv', content: levelCsv(hourly('2025-06-01T00:00:00Z', 20)) }] }).expect(201);
  });
});
