// Refusals of the logger import API before any work: declared type, compressed or binary content,
// size and file count, a body that is not an upload, and path-like file names. Every answer is below
// 500 with a message naming the files field, and a refused file leaves no file behind.
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { useTestApp } from '../support/db';
import { LEVEL_MAPPING, expectExplained, freshStart, levelCsv, readingsOf, storedFiles, upload, world } from '../support/import-bad-input';

describe('POST /api/imports refusals before any work', () => {
  const env = useTestApp({ UPLOAD_MAX_MB: '1' });
  let shared: ReturnType<typeof world> | undefined;
  const sharedWorld = () => (shared ??= world(env));

  it.each([
    ['image/png', Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])],
    ['application/zip', Buffer.from('time,level_mm\n')],
    ['application/pdf', Buffer.from('time,level_mm\n')],
    ['application/x-msdownload', Buffer.from('time,level_mm\n')],
  ])('refuses a file sent as %s with 415 naming the files field, storing nothing', async (type, content) => {
    const { tank, worker } = await sharedWorld();
    const before = await readingsOf(env, tank.id);
    const files = storedFiles(env);
    const res = await upload(worker, tank.id, [{ name: 'logger.csv', content, type }]).expect(415);
    expect(res.body.error).toEqual({ code: 'not_csv', field: 'files', message: `files: "logger.csv" cannot be imported: it was sent as ${type}, not as CSV text; choose the logger's CSV export` });
    expect(storedFiles(env)).toEqual(files);
    expect(await readingsOf(env, tank.id)).toEqual(before);
  });

  it.each([['text/plain'], ['application/vnd.ms-excel'], ['application/octet-stream'], ['text/csv; charset=utf-8']])('accepts a CSV file sent as %s', async (type) => {
    const { tank, worker } = await sharedWorld();
    const res = await upload(worker, tank.id, [{ name: 'ok.csv', content: levelCsv(freshStart(), 3), type }]).expect(201);
    expect(res.body.imports[0]).toMatchObject({ status: 'imported', rowsNew: 3 });
  });

  // A compression bomb named .csv: 64 MB of zeros gzip to about 64 kB, under the upload limit. The
  // first bytes (gzip ID1 ID2 = 1F 8B, RFC 1952 §2.3.1, recalled from memory) give it away; it is never inflated.
  it('refuses a gzip bomb disguised as CSV by its first bytes, without inflating it', async () => {
    const { tank, worker } = await sharedWorld();
    const bomb = gzipSync(Buffer.alloc(64 * 1_048_576));
    expect(bomb.length).toBeLessThan(1_048_576);
    const rss = process.memoryUsage().rss;
    const res = await upload(worker, tank.id, [{ name: 'readings.csv', content: bomb }]).expect(415);
    expect(res.body.error.message).toMatch(/"readings\.csv" cannot be imported: it is a gzip-compressed file/);
    expect(process.memoryUsage().rss - rss).toBeLessThan(100 * 1_048_576);
  });

  it('refuses a ZIP archive and binary content with NUL bytes however they are named', async () => {
    const { tank, worker } = await sharedWorld();
    const zip = Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04]), Buffer.alloc(64, 0x41)]);
    const res = await upload(worker, tank.id, [{ name: 'data.csv', content: zip }]).expect(415);
    expect(res.body.error.message).toMatch(/ZIP archive/);
    const nul = Buffer.concat([Buffer.from(levelCsv(freshStart(), 2)), Buffer.from([0x00, 0x41])]);
    const res2 = await upload(worker, tank.id, [{ name: 'data.csv', content: nul }]).expect(415);
    expect(res2.body.error.message).toMatch(/NUL bytes/);
  });

  it('refuses a file over the limit with 413 and too many files with 413, keeping no file', async () => {
    const { tank, worker } = await sharedWorld();
    const files = storedFiles(env);
    const big = await upload(worker, tank.id, [{ name: 'big.csv', content: Buffer.alloc(1_048_576 + 1, 0x31) }]).expect(413);
    expect(big.body.error).toMatchObject({ code: 'file_too_large', field: 'files' });
    expect(big.body.error.message).toMatch(/upload limit of 1 MB \(1,048,576 bytes\)/);
    const many = Array.from({ length: 21 }, (_, i) => ({ name: `f${i}.csv`, content: levelCsv(freshStart(), 1) }));
    const tooMany = await upload(worker, tank.id, many).expect(413);
    expect(tooMany.body.error).toMatchObject({ code: 'too_many_files', field: 'files' });
    expect(storedFiles(env)).toEqual(files);
  });

  it('answers a request that is not a file upload with a 4xx naming the files field', async () => {
    const { tank, worker } = await sharedWorld();
    const json = await worker.post('/api/imports').set('x-csrf-token', worker.csrf).send({ tankId: tank.id, mapping: LEVEL_MAPPING }).expect(400);
    expect(json.body.error).toMatchObject({ field: 'files', message: 'files: attach at least one CSV file' });
    for (const [type, body] of [['text/plain', 'time,level_mm\n'], ['application/json', '[1,2]'], ['application/octet-stream', 'PK\u0003\u0004']]) {
      const other = await worker.post('/api/imports').set('x-csrf-token', worker.csrf).set('content-type', type).send(body).expect(415);
      expect(other.body.error).toMatchObject({ code: 'bad_upload', field: 'files' });
      expect(other.body.error.message).toMatch(/^files: send the CSV files as a multipart\/form-data upload/);
    }
    const noBoundary = await worker.post('/api/imports').set('x-csrf-token', worker.csrf).set('content-type', 'multipart/form-data').send('xx').expect(400);
    expect(noBoundary.body.error.message).toMatch(/The upload could not be read/);
  });

  // Each name is either kept as a label beside a generated stored name (201) or refused as an unreadable
  // part header by the form parser (400); which one is fixed per name, and nothing lands outside the folder.
  it.each([
    ['../../etc/passwd', 201],
    ['..\\..\\windows\\system32\\x.csv', 201],
    ['C:\\x\\y.csv', 201],
    ['/var/lib/brimstock/uploads/other.csv', 201],
    ['a\u0000../../b.csv', 201],
    ['a\u0007b\u001b.csv', 400],
    ['%2e%2e%2f%2e%2e%2fescape.csv', 201],
    [`${'n'.repeat(1000)}.csv`, 201],
    ['\u202Evsc.exe', 201],
  ])('keeps an upload named %j inside the upload folder under a generated name (or refuses it): %i', async (name, status) => {
    const { tank, worker } = await sharedWorld();
    const parent = readdirSync(dirname(env.ctx.config.uploadDir)).sort();
    const files = storedFiles(env);
    const res = await upload(worker, tank.id, [{ name, content: levelCsv(freshStart(), 2) }]);
    expectExplained(res);
    expect(res.status, res.text).toBe(status);
    expect(readdirSync(dirname(env.ctx.config.uploadDir)).sort()).toEqual(parent);
    if (status !== 201) {
      expect(res.body.error).toMatchObject({ code: 'bad_upload', message: 'The upload could not be read (Malformed part header)' });
      expect(storedFiles(env)).toEqual(files);
      return;
    }
    const rec = (await env.ctx.db.models.LoggerImport.findByPk(res.body.imports[0].id))!;
    expect(rec.storedName).toMatch(/^[0-9a-f-]{36}\.csv$/);
    expect(storedFiles(env)).toContain(rec.storedName);
    expect(storedFiles(env).every((f) => /^[0-9a-f-]{36}\.csv$/.test(f))).toBe(true);
    const label: string = res.body.imports[0].originalName;
    expect(label.length).toBeGreaterThan(0);
    expect(label.length).toBeLessThanOrEqual(255);
    expect(label).not.toMatch(/[\u0000-\u001f\u007f]/);
    expect(join(env.ctx.config.uploadDir, rec.storedName).startsWith(env.ctx.config.uploadDir)).toBe(true);
  });
});
