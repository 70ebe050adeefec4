// Bad input through the logger import API: random bytes, cut-off files, other encodings, huge cells,
// rows of millions of separators, formula-like cells and random CSV-ish text (the refusals that come
// before any work are in fuzz-import-refusals.test.ts). Every
// answer is below 500 with a message, a row problem names its line, and a refused file changes no
// stored reading and leaves no file behind. Run counts are small so the file stays quick on a slow machine.
import fc from 'fast-check';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { MAX_RECORD_BYTES } from '@shared/imports';
import { useTestApp } from '../support/db';
import { AUTO_MAPPING, changedReadings, expectExplained, freshStart, levelCsv, readingsOf, storedFiles, upload, world, type ImportBody } from '../support/import-bad-input';


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
