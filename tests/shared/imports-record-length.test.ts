// The record-length guard (shared/imports/record-length.ts) that runs over an upload before the CSV parser, and the UTF-8 part of the
// content check. Oracle for the guard: papaparse's own writer (Papa.unparse) lays out random rows, so
// each record's bytes and the line it starts on are known; the guard must refuse exactly the first
// record longer than the limit, at that line, however the bytes are split into chunks.
import fc from 'fast-check';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { MAX_RECORD_BYTES, createRecordGuard, sniffCsv } from '@shared/imports';

const enc = new TextEncoder();

/** Runs the guard over `bytes` cut at the given offsets. */
function guardOver(bytes: Uint8Array, delimiter: string, max: number, cuts: number[] = []) {
  const guard = createRecordGuard(delimiter, max);
  const at = [...new Set(cuts.map((c) => Math.min(c, bytes.length)))].sort((a, b) => a - b);
  let from = 0;
  for (const to of [...at, bytes.length]) {
    // Node's Buffer, as the server's read stream gives it.
    const problem = guard.push(Buffer.from(bytes.subarray(from, to)));
    if (problem) return problem;
    from = to;
  }
  return null;
}

const lineBreaks = (s: string) => (s.match(/\r\n|\r|\n/g) ?? []).length;

describe('createRecordGuard', () => {
  it('refuses exactly the first record longer than the limit, on the line it starts, for any chunking', () => {
    const cellText = fc.stringMatching(/^[a-z0-9 ,;"\r\né°]{0,12}$/);
    fc.assert(
      fc.property(
        fc.array(fc.array(cellText, { minLength: 1, maxLength: 5 }), { minLength: 1, maxLength: 30 }),
        fc.constantFrom(',', ';', '\t'),
        fc.constantFrom('\n', '\r\n'),
        fc.integer({ min: 8, max: 60 }),
        fc.array(fc.nat({ max: 2000 }), { maxLength: 6 }),
        (rows, delimiter, newline, max, cuts) => {
          const records = rows.map((r) => Papa.unparse([r], { delimiter, newline }));
          const text = records.join(newline);
          let expected: number | null = null;
          let offset = 0;
          for (const r of records) {
            if (enc.encode(r).length > max) {
              expected = 1 + lineBreaks(text.slice(0, offset));
              break;
            }
            offset += r.length + newline.length;
          }
          const problem = guardOver(enc.encode(text), delimiter, max, cuts);
          expect(problem?.line ?? null).toBe(expected);
          if (problem) expect(problem.reason).toContain(`the row on line ${expected} `);
        },
      ),
      { numRuns: 400 },
    );
  });

  it('passes a long file of short rows whatever its line endings, and counts lone CR lines', () => {
    const lf = `time,level\n${'2025-01-01T00:00:00Z,1200.5\n'.repeat(20_000)}`;
    expect(guardOver(enc.encode(lf), ',', MAX_RECORD_BYTES, [65_536, 65_537, 300_000])).toBeNull();
    expect(guardOver(enc.encode(lf.replace(/\n/g, '\r\n')), ',', MAX_RECORD_BYTES, [65_536])).toBeNull();
    // Cut between the CR and the LF of one line break: still one break, so the long row is on line 3.
    const crlf = enc.encode(`a,b\r\n1,2\r\n${'x'.repeat(50)}\r\n`);
    expect(guardOver(crlf, ',', 40, [4])?.line).toBe(3);
    expect(guardOver(crlf, ',', 40, [4, 5, 9])?.line).toBe(3);
    const cr = `a,b\r1,2\r${'x'.repeat(50)}\r`;
    expect(guardOver(enc.encode(cr), ',', 40)).toEqual({ line: 3, reason: expect.stringContaining('the row on line 3 is longer than 40 bytes') });
  });

  it('names a quote that is never closed, and takes a stray quote inside a bare field as text', () => {
    const open = `time,level\n2025-01-01T00:00:00Z,"12\n${'2025-01-01T01:00:00Z,13\n'.repeat(100)}`;
    const problem = guardOver(enc.encode(open), ',', 1000);
    expect(problem).toEqual({ line: 2, reason: 'the row on line 2 has a quoted field running past 1,000 bytes (a logger row is a few dozen); is a closing quote (") missing?' });
    // 12" is a bare field with a quote in it (papaparse reads it as text), so nothing stays open.
    const stray = `size,level\n12",5\n${'1,2\n'.repeat(500)}`;
    expect(guardOver(enc.encode(stray), ',', 100)).toBeNull();
    // Spaces after a closing quote before the separator still close the field, as papaparse reads it.
    const spaced = `a,b\n"x"  ,1\n${'1,2\n'.repeat(500)}`;
    expect(guardOver(enc.encode(spaced), ',', 100)).toBeNull();
  });

  it('refuses a row of a million separators at once and keeps refusing', () => {
    const guard = createRecordGuard(',');
    const wide = Buffer.from(`time,level\n${','.repeat(1_000_000)}\n`);
    const first = guard.push(wide);
    expect(first?.line).toBe(2);
    expect(guard.push(Buffer.from('1,2\n'))).toEqual(first);
  });
});

describe('sniffCsv and UTF-8', () => {
  it('refuses Latin-1 bytes naming the line they are on', () => {
    const latin1 = Uint8Array.from([...enc.encode('time,level\n2025-01-01T00:00:00Z,5\nTemp '), 0xb0, ...enc.encode('C\n')]);
    expect(sniffCsv(latin1)).toMatchObject({ ok: false, reason: 'it is not UTF-8 text (line 3 has bytes that are not UTF-8, as in a Latin-1 or Windows-1252 file); save or export it as UTF-8 CSV' });
  });

  it('passes UTF-8 whose last character is cut off at the end of the sniffed bytes', () => {
    const bytes = enc.encode('Füllstand;Temp °C\n');
    const degree = bytes.indexOf(0xb0);
    // The first byte of ° (C2 B0) only: the rest would come after the sniffed head.
    expect(sniffCsv(bytes.subarray(0, degree))).toEqual({ ok: true });
  });
});
