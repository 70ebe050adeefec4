// Property tests of the row reader over random CSV text, parsed the way the server parses it
// (papaparse with csvParseOptions): well-formed files with random bad rows, separators, quoting,
// line endings, byte-order marks and blank lines; and arbitrary malformed text.
import fc from 'fast-check';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { createImportReader, csvParseOptions, importMappingSchema, type FeedResult, type ImportProblem, type LineBreak } from '@shared/imports';
import type { TankSetup } from '@shared/readings';

// 1,000 mm wide, 1,500 mm tall upright cylinder.
const TANK: TankSetup = { geometry: { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1500 }, datumOffsetMm: 0, outletHeightMm: 100, safeFillLevelMm: 1400, specificGravity: 1 };
const NOW = Date.parse('2026-01-01T00:00:00Z');
const START = Date.parse('2025-01-01T00:00:00Z');

type RowKind = 'good' | 'not-a-number' | 'over-the-top' | 'below-the-floor' | 'bad-time' | 'future' | 'short';
const BAD_KINDS: RowKind[] = ['not-a-number', 'over-the-top', 'below-the-floor', 'bad-time', 'future', 'short'];

const row = fc.record({
  kind: fc.oneof({ weight: 4, arbitrary: fc.constant<RowKind>('good') }, { weight: 1, arbitrary: fc.constantFrom(...BAD_KINDS) }),
  levelMm: fc.integer({ min: 0, max: 15_000 }).map((x) => x / 10),
  note: fc.oneof(fc.constant(''), fc.string({ unit: fc.constantFrom('a', 'b', ' ', ',', ';', '\t', '"', '\n', '\r\n', 'é', '°'), maxLength: 12 })),
  quoteAll: fc.boolean(),
  blankAfter: fc.boolean(),
});

const file = fc.record({
  delimiter: fc.constantFrom(',' as const, ';' as const, '\t' as const),
  newline: fc.constantFrom('\n', '\r\n'),
  bom: fc.boolean(),
  header: fc.boolean(),
  commaDecimals: fc.boolean(),
  rows: fc.array(row, { minLength: 1, maxLength: 40 }),
});

const breaks = (s: string) => (s.match(/\r\n|\r|\n/g) ?? []).length;

describe('createImportReader on random CSV files', () => {
  it('never throws, reads every good row and reports every bad row with its physical line', () => {
    fc.assert(
      fc.property(file, (f) => {
        const decimalComma = f.commaDecimals && f.delimiter !== ',';
        const cell = (s: string, force: boolean) => (force || /[",;\t\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
        const num = (x: number) => (decimalComma ? String(x).replace('.', ',') : String(x));
        const lines: string[] = [];
        let line = 1;
        if (f.header) {
          lines.push(['time', 'level', 'note'].join(f.delimiter));
          line++;
        }
        const wantBad = new Map<number, RowKind>();
        const wantGood = new Map<number, { levelMm: number; takenAtMs: number }>();
        f.rows.forEach((r, i) => {
          const t = START + i * 60_000;
          const time = r.kind === 'bad-time' ? '2025-02-30T10:00:00Z' : r.kind === 'future' ? '2099-01-01T00:00:00Z' : new Date(t).toISOString();
          const value = r.kind === 'not-a-number' ? 'ERR' : r.kind === 'over-the-top' ? num(1500 + 1 + r.levelMm) : r.kind === 'below-the-floor' ? num(-1 - r.levelMm) : num(r.levelMm);
          const cells = r.kind === 'short' ? [cell(time, r.quoteAll)] : [cell(time, r.quoteAll), cell(value, r.quoteAll), cell(r.note, r.quoteAll)];
          const text = cells.join(f.delimiter);
          lines.push(text);
          if (r.kind === 'good') wantGood.set(line, { levelMm: r.levelMm, takenAtMs: t });
          else wantBad.set(line, r.kind);
          line += 1 + breaks(text);
          if (r.blankAfter) {
            lines.push('');
            line++;
          }
        });
        const text = (f.bom ? '\uFEFF' : '') + lines.join(f.newline) + f.newline;
        const mapping = importMappingSchema.parse({ delimiter: f.delimiter, decimalComma, hasHeader: f.header, timestamp: { column: 0, format: 'iso8601' }, value: { column: 1, kind: 'level', unit: 'mm' } });
        const parsed = Papa.parse<string[]>(text, csvParseOptions(f.delimiter));
        const reader = createImportReader({ mapping, tank: TANK, nowMs: NOW, newline: parsed.meta.linebreak as LineBreak });
        const results: FeedResult[] = parsed.data.map((cells) => reader.feed(cells));

        const good = new Map(results.flatMap((r) => (r.kind === 'reading' ? [[r.reading.line, r.reading] as const] : [])));
        const bad = new Map(results.flatMap((r) => (r.kind === 'rejected' ? [[r.line, r.problems] as const] : [])));
        expect([...bad.keys()].sort((a, b) => a - b)).toEqual([...wantBad.keys()].sort((a, b) => a - b));
        expect([...good.keys()].sort((a, b) => a - b)).toEqual([...wantGood.keys()].sort((a, b) => a - b));
        for (const [l, want] of wantGood) {
          expect(good.get(l)!.levelMm).toBeCloseTo(want.levelMm, 9);
          expect(good.get(l)!.takenAtMs).toBe(want.takenAtMs);
        }
        for (const [l, problems] of bad) {
          expect(problems.length).toBeGreaterThan(0);
          for (const p of problems) expect(p.line).toBe(l);
          const kind = wantBad.get(l)!;
          const field = kind === 'bad-time' || kind === 'future' ? 'timestamp' : 'value';
          expect(problems.map((p) => p.field)).toContain(field);
        }
        expect(reader.counts.rows).toBe(f.rows.length);
        expect(reader.counts.rejected).toBe(wantBad.size);
        expect(reader.end()).toEqual({ ok: true });
      }),
      { numRuns: 300 },
    );
  });
});

describe('createImportReader on malformed text', () => {
  const junk = fc.string({ unit: fc.constantFrom('2', '0', '-', ':', 'T', 'Z', '.', ',', ';', '"', '\n', '\r', '\t', ' ', 'x', '\uFEFF', '\u0000'), maxLength: 300 });

  it('never throws and every problem names a line that exists, in order', () => {
    fc.assert(
      fc.property(junk, fc.constantFrom(',' as const, ';' as const, '\t' as const), fc.boolean(), (text, delimiter, header) => {
        const mapping = importMappingSchema.parse({ delimiter, hasHeader: header, timestamp: { column: 0, format: 'iso8601' }, value: { column: 1, kind: 'level', unit: 'mm' }, temperature: { column: 2, unit: 'C' } });
        const parsed = Papa.parse<string[]>(text, csvParseOptions(delimiter));
        const reader = createImportReader({ mapping, tank: TANK, nowMs: NOW, newline: parsed.meta.linebreak as LineBreak });
        const physicalLines = breaks(text) + 1;
        const problems: ImportProblem[] = [];
        let readings = 0;
        let lastLine = 0;
        for (const cells of parsed.data) {
          const r = reader.feed(cells);
          if (r.kind === 'fatal') break;
          if (r.kind === 'rejected') {
            expect(r.problems.length).toBeGreaterThan(0);
            problems.push(...r.problems);
          }
          const at = r.kind === 'reading' ? r.reading.line : r.line;
          expect(at).toBeGreaterThan(lastLine);
          lastLine = at;
          if (r.kind === 'reading') readings++;
        }
        for (const p of problems) {
          expect(p.line).toBeGreaterThanOrEqual(1);
          expect(p.line).toBeLessThanOrEqual(physicalLines);
          expect(p.reason.length).toBeGreaterThan(0);
        }
        const end = reader.end();
        expect(reader.counts.rows).toBeGreaterThanOrEqual(reader.counts.rejected);
        if (end.ok) expect(readings + reader.counts.rejected).toBe(reader.counts.rows);
        else expect(end.reason.length).toBeGreaterThan(0);
      }),
      { numRuns: 500 },
    );
  });
});
