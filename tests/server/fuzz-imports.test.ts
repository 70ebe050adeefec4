// Bad input through the logger import API: random bytes, cut-off files, other encodings, huge cells,
// rows of millions of separators, formula-like cells and random CSV-ish text, plus the refusals that
// come before any work (declared type, compressed or binary content, size, path-like names). Every
// answer is below 500 with a message, a row problem names its line, and a refused file changes no
// stored reading and leaves no file behind. Run counts are small so the file stays quick on a slow machine.
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { gzipSync } from 'node:zlib';
import fc from 'fast-check';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { MAX_RECORD_BYTES, type ImportMappingInput } from '@shared/imports';
import { useTestApp, type TestEnv } from '../support/db';
import { makeOrganisation, signedIn, type Agent } from '../support/fixtures';
import { makeTank } from '../support/tanks';

const LEVEL_MAPPING: ImportMappingInput = { delimiter: ',', hasHeader: true, timestamp: { column: 'time', format: 'iso8601' }, value: { column: 'level_mm', kind: 'level', unit: 'mm' } };
const AUTO_MAPPING: ImportMappingInput = { ...LEVEL_MAPPING, delimiter: 'auto' };

/** A level file with a header row: one row per hour from `startMs`, 1,200 mm going down 10 mm an hour. */
const levelCsv = (startMs: number, n: number) =>
  `time,level_mm\n${Array.from({ length: n }, (_, i) => `${new Date(startMs + i * 3_600_000).toISOString()},${1200 - 10 * i}`).join('\n')}\n`;

// Each file gets hours of its own, so no two files of this test share bytes or instants by chance.
let nextStart = Date.parse('2020-01-01T00:00:00Z');
const freshStart = () => (nextStart += 2 * 86_400_000);

interface FileSpec {
  name: string;
  content: string | Buffer;
  type?: string;
}
function upload(agent: Agent, tankId: number, files: FileSpec[], o: { mapping?: ImportMappingInput; policy?: string } = {}) {
  let req = agent.post('/api/imports').set('x-csrf-token', agent.csrf).field('tankId', String(tankId)).field('mapping', JSON.stringify(o.mapping ?? LEVEL_MAPPING));
  if (o.policy) req = req.field('policy', o.policy);
  for (const f of files) req = req.attach('files', Buffer.isBuffer(f.content) ? f.content : Buffer.from(f.content, 'utf8'), { filename: f.name, contentType: f.type ?? 'text/csv' });
  return req;
}

const storedFiles = (env: TestEnv) => {
  try {
    return readdirSync(env.ctx.config.uploadDir).sort();
  } catch {
    return [];
  }
};

/** The tank's stored readings as comparable text (instant, source, level, litres). */
async function readingsOf(env: TestEnv, tankId: number): Promise<string[]> {
  const rows = await env.ctx.db.models.Reading.findAll({ where: { tankId }, order: [['takenAt', 'ASC'], ['id', 'ASC']] });
  return rows.map((r) => `${r.takenAt.toISOString()} ${r.source} ${r.levelMm} ${r.grossL} ${r.usableL}`);
}

interface ImportBody {
  id: number;
  status: string;
  error: string | null;
  rowsTotal: number;
  rowsNew: number;
  rowsRejected: number;
  rejectedPreview: { line: number; field: string; value: string; reason: string }[];
}

/** The common promise of every answer: below 500, a JSON error with a message (no stack) or import records that explain themselves. */
function expectExplained(res: { status: number; body: { error?: { message?: unknown }; imports?: ImportBody[] }; text: string }) {
  expect(res.status, res.text).toBeLessThan(500);
  expect(res.text).not.toMatch(/\bat .+\.(ts|js):\d+/);
  if (res.status >= 400) {
    expect(typeof res.body.error?.message).toBe('string');
    expect((res.body.error!.message as string).length).toBeGreaterThan(10);
    return;
  }
  expect(res.status).toBe(201);
  for (const imp of res.body.imports!) {
    expect(['imported', 'rejected', 'duplicate']).toContain(imp.status);
    if (imp.status === 'rejected') expect(imp.error?.length ?? 0).toBeGreaterThan(10);
    for (const p of imp.rejectedPreview) {
      expect(p.line).toBeGreaterThanOrEqual(1);
      expect(p.reason.length).toBeGreaterThan(5);
    }
  }
}

const changedReadings = (res: { status: number; body: { imports?: ImportBody[] } }) => res.status === 201 && res.body.imports!.some((i) => i.status === 'imported' && i.rowsNew > 0);

async function world(env: TestEnv) {
  const org = await makeOrganisation(env);
  const tank = await makeTank(env, org, org.farmIds[0], { code: 'FZ' });
  const worker = await signedIn(env, org.users.worker.email);
  // Readings that are there before the bad input, so "unchanged" means something.
  await upload(worker, tank.id, [{ name: 'base.csv', content: levelCsv(freshStart(), 5) }]).expect(201);
  return { org, tank, worker };
}

describe('POST /api/imports under bad input', () => {
  const env = useTestApp({ UPLOAD_MAX_MB: '8' });
  let shared: ReturnType<typeof world> | undefined;
  const sharedWorld = () => (shared ??= world(env));
  const rssAtStart = process.memoryUsage().rss;
  let rssPeak = rssAtStart;
  const sampleRss = () => (rssPeak = Math.max(rssPeak, process.memoryUsage().rss));

  it('answers random bytes with a refusal or a rejected file and keeps the readings', async () => {
    const { tank, worker } = await sharedWorld();
    await fc.assert(
      fc.asyncProperty(fc.uint8Array({ minLength: 0, maxLength: 4096 }), fc.constantFrom('reject-file', 'valid-rows'), async (bytes, policy) => {
        const before = await readingsOf(env, tank.id);
        const files = storedFiles(env);
        const res = await upload(worker, tank.id, [{ name: 'random.csv', content: Buffer.from(bytes) }], { mapping: AUTO_MAPPING, policy });
        expectExplained(res);
        if (!changedReadings(res)) expect(await readingsOf(env, tank.id)).toEqual(before);
        if (res.status >= 400) expect(storedFiles(env)).toEqual(files);
        sampleRss();
      }),
      { numRuns: 25 },
    );
  });

  it('answers random CSV-like text with line numbers for every refused row', async () => {
    const { tank, worker } = await sharedWorld();
    const cell = fc.stringMatching(/^[0-9TZ:.,;\t" \r\n=+@éß°-]{0,24}$/);
    await fc.assert(
      fc.asyncProperty(fc.array(cell, { maxLength: 40 }), fc.constantFrom('reject-file', 'valid-rows'), async (cells, policy) => {
        const content = `time,level_mm\n${cells.join('\n')}`;
        const before = await readingsOf(env, tank.id);
        const res = await upload(worker, tank.id, [{ name: 'text.csv', content }], { policy });
        expectExplained(res);
        const physicalLines = content.split(/\r\n|\r|\n/).length;
        for (const imp of res.body.imports ?? []) for (const p of imp.rejectedPreview) expect(p.line).toBeLessThanOrEqual(physicalLines);
        if (!changedReadings(res)) expect(await readingsOf(env, tank.id)).toEqual(before);
        sampleRss();
      }),
      { numRuns: 25 },
    );
  });

  it('imports the whole rows of a cut-off file or rejects it naming the cut line, never more rows than were sent', async () => {
    const { tank, worker } = await sharedWorld();
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 2, max: 30 }), fc.double({ min: 0, max: 1, noNaN: true }), async (n, at) => {
        const full = levelCsv(freshStart(), n);
        const cut = full.slice(0, Math.floor(full.length * at));
        const before = await readingsOf(env, tank.id);
        const res = await upload(worker, tank.id, [{ name: 'cut.csv', content: cut }]);
        expectExplained(res);
        expect(res.status).toBe(201);
        const [imp] = res.body.imports!;
        expect(imp.rowsTotal).toBeLessThanOrEqual(n);
        const lines = cut.split('\n').length;
        if (imp.status === 'rejected') {
          expect(await readingsOf(env, tank.id)).toEqual(before);
          // The only bad row a cut can make is the last one.
          for (const p of imp.rejectedPreview) expect(p.line).toBe(lines);
        } else {
          expect(imp.status).toBe('imported');
          expect((await readingsOf(env, tank.id)).length).toBe(before.length + imp.rowsNew);
        }
        sampleRss();
      }),
      { numRuns: 20 },
    );
  });

  it('refuses UTF-16 and Latin-1 files with 415 saying to save as UTF-8, storing nothing', async () => {
    const { tank, worker } = await sharedWorld();
    const encodings: [string, (s: string) => Buffer, RegExp][] = [
      ['UTF-16LE with a byte-order mark', (s) => Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(s, 'utf16le')]), /UTF-16/],
      ['UTF-16BE with a byte-order mark', (s) => Buffer.concat([Buffer.from([0xfe, 0xff]), Buffer.from(s, 'utf16le').swap16()]), /UTF-16/],
      ['UTF-16LE without a byte-order mark', (s) => Buffer.from(s, 'utf16le'), /NUL bytes/],
      ['Latin-1', (s) => Buffer.from(s, 'latin1'), /not UTF-8 text \(line \d+ .*Latin-1.*save or export it as UTF-8/],
    ];
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 1, max: 20 }), fc.constantFrom(...encodings), fc.constantFrom('Füllstand', 'Temp °C', 'Niveau (mm) à la cuve'), async (n, [, encode, message], note) => {
        // The non-ASCII text goes on a line of its own after the data rows, so the line named is known.
        const text = `${levelCsv(freshStart(), n)}${note}\n`;
        const before = await readingsOf(env, tank.id);
        const files = storedFiles(env);
        const imports = await env.ctx.db.models.LoggerImport.count({ where: { tankId: tank.id } });
        const res = await upload(worker, tank.id, [{ name: 'encoded.csv', content: encode(text) }]);
        expectExplained(res);
        expect(res.status).toBe(415);
        expect(res.body.error).toMatchObject({ code: 'not_csv', field: 'files' });
        expect(res.body.error.message).toMatch(message);
        if (/Latin/.test(message.source)) expect(res.body.error.message).toContain(`line ${n + 2} `);
        expect(await readingsOf(env, tank.id)).toEqual(before);
        expect(storedFiles(env)).toEqual(files);
        expect(await env.ctx.db.models.LoggerImport.count({ where: { tankId: tank.id } })).toBe(imports);
      }),
      { numRuns: 12 },
    );
  });

  it('refuses a cell of megabytes with 422 naming its line, before any import record exists', async () => {
    const { tank, worker } = await sharedWorld();
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 0, max: 5 }), fc.integer({ min: MAX_RECORD_BYTES + 1, max: 4_000_000 }), fc.boolean(), async (row, size, quoted) => {
        const rows = levelCsv(freshStart(), 6).split('\n');
        const big = 'x'.repeat(size);
        // Row 0 is the header (line 1); a quoted cell of megabytes is as bad as a bare one.
        rows[row] = `${rows[row]},${quoted ? `"${big}"` : big}`;
        const before = await readingsOf(env, tank.id);
        const files = storedFiles(env);
        const imports = await env.ctx.db.models.LoggerImport.count({ where: { tankId: tank.id } });
        const res = await upload(worker, tank.id, [{ name: 'huge-cell.csv', content: rows.join('\n') }]);
        sampleRss();
        expectExplained(res);
        expect(res.status).toBe(422);
        expect(res.body.error).toMatchObject({ code: 'record_too_long', field: 'files' });
        expect(res.body.error.message).toContain(`"huge-cell.csv" cannot be imported: the row on line ${row + 1} `);
        expect(res.body.error.message).toMatch(quoted ? /has a quoted field running past 65,536 bytes/ : /is longer than 65,536 bytes/);
        expect(await readingsOf(env, tank.id)).toEqual(before);
        expect(storedFiles(env)).toEqual(files);
        expect(await env.ctx.db.models.LoggerImport.count({ where: { tankId: tank.id } })).toBe(imports);
      }),
      { numRuns: 6 },
    );
  });

  it('refuses an unclosed quote that swallows the rest of the file, naming the line it opens on', async () => {
    const { tank, worker } = await sharedWorld();
    const rows = levelCsv(Date.parse('2019-01-01T00:00:00Z'), 8000).split('\n');
    rows[3] = `${rows[3]},"note that never ends`;
    const before = await readingsOf(env, tank.id);
    const res = await upload(worker, tank.id, [{ name: 'open-quote.csv', content: rows.join('\n') }]).expect(422);
    expect(res.body.error.message).toBe(`files: "open-quote.csv" cannot be imported: the row on line 4 has a quoted field running past 65,536 bytes (a logger row is a few dozen); is a closing quote (") missing?`);
    expect(await readingsOf(env, tank.id)).toEqual(before);
  });

  it('refuses a row of millions of separators with 422 naming the line, in bounded memory', async () => {
    const { tank, worker } = await sharedWorld();
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 0, max: 3 }), fc.integer({ min: 1_000_000, max: 7_000_000 }), fc.constantFrom(',', ';'), async (row, commas, sep) => {
        const rows = levelCsv(freshStart(), 4).split('\n');
        rows[row] = `${rows[row]}${sep.repeat(commas)}`;
        const content = Buffer.from(rows.join('\n'));
        const before = await readingsOf(env, tank.id);
        const rssBefore = process.memoryUsage().rss;
        const timer = setInterval(sampleRss, 20);
        let res;
        try {
          res = await upload(worker, tank.id, [{ name: 'wide.csv', content }], { mapping: AUTO_MAPPING });
        } finally {
          clearInterval(timer);
        }
        sampleRss();
        expectExplained(res);
        expect(res.status).toBe(422);
        expect(res.body.error.message).toContain(`"wide.csv" cannot be imported: the row on line ${row + 1} is longer than 65,536 bytes`);
        expect(await readingsOf(env, tank.id)).toEqual(before);
        // The check streams the file: holding one row of millions of fields would cost hundreds of MB.
        expect(process.memoryUsage().rss - rssBefore).toBeLessThan(150 * 1_048_576);
      }),
      { numRuns: 4 },
    );
  });

  it('stores formula-like cells as refused text with their line and escapes them in the download', async () => {
    const { tank, worker } = await sharedWorld();
    const formula = fc.tuple(fc.constantFrom('=', '+', '-', '@'), fc.constantFrom('SUM(A1:A9)', 'cmd|calc', 'HYPERLINK("http://x.example")', 'A1', 'x')).map(([p, s]) => p + s);
    await fc.assert(
      fc.asyncProperty(fc.array(fc.option(formula, { nil: null, freq: 2 }), { minLength: 1, maxLength: 12 }), fc.boolean(), async (cells, inTime) => {
        const start = freshStart();
        const rows = cells.map((f, i) => {
          const t = new Date(start + i * 3_600_000).toISOString();
          const level = String(1000 - i);
          return f === null ? [t, level] : inTime ? [f, level] : [t, f];
        });
        const content = Papa.unparse({ fields: ['time', 'level_mm'], data: rows }, { newline: '\n' });
        const res = await upload(worker, tank.id, [{ name: 'formulae.csv', content }], { policy: 'valid-rows' });
        expectExplained(res);
        const [imp] = res.body.imports as ImportBody[];
        const bad = cells.flatMap((f, i) => (f === null ? [] : [{ line: i + 2, value: f }]));
        expect(imp.rowsRejected).toBe(bad.length);
        expect(imp.rowsNew).toBe(cells.length - bad.length);
        expect(imp.rejectedPreview.map((p) => ({ line: p.line, value: p.value }))).toEqual(bad);
        expect(imp.rejectedPreview.every((p) => p.field === (inTime ? 'timestamp' : 'value'))).toBe(true);
        if (!bad.length) return;
        const csv = await worker.get(`/api/imports/${imp.id}/rejected.csv`).expect(200);
        const parsed = Papa.parse<Record<string, string>>(csv.text.replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: true });
        expect(parsed.data.map((r) => r.value)).toEqual(bad.map((b) => `'${b.value}`));
      }),
      { numRuns: 10 },
    );
  });

  it('keeps the memory of the test process bounded over all of the above', () => {
    sampleRss();
    // Generous: a file that held whole rows of millions of fields (or re-read a growing record) would pass it by far.
    expect(rssPeak - rssAtStart).toBeLessThan(400 * 1_048_576);
  });
});

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
