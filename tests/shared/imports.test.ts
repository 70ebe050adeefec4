// Logger import: mapping schema, timestamps (ISO 8601 offsets and local time across daylight-saving
// changes), numbers, the content check of an upload, and the row reader.
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import {
  createImportReader,
  csvParseOptions,
  delimiterCandidates,
  importMappingSchema,
  lineBreaksInside,
  mappingProblem,
  parseLoggerNumber,
  sniffCsv,
  timestampParser,
  type FeedResult,
  type ImportMappingInput,
  type LineBreak,
} from '@shared/imports';
import type { TankSetup } from '@shared/readings';

const iso = (ms: number) => new Date(ms).toISOString();
const parseAt = (format: Parameters<typeof timestampParser>[0], text: string, zone?: string) => {
  const r = timestampParser(format, zone)(text);
  return r.ok ? iso(r.ms) : r.reason;
};

describe('timestampParser with ISO 8601', () => {
  // RFC 3339 §5.8 examples (recalled from memory, not re-checked).
  it.each([
    ['RFC 3339 §5.8: 1985-04-12T23:20:50.52Z', '1985-04-12T23:20:50.52Z', '1985-04-12T23:20:50.520Z'],
    ['RFC 3339 §5.8: 1996-12-19T16:39:57-08:00 is 00:39:57 UTC the next day', '1996-12-19T16:39:57-08:00', '1996-12-20T00:39:57.000Z'],
    ['offset without a colon', '2025-07-07T06:00:00+0100', '2025-07-07T05:00:00.000Z'],
    ['hour-only offset and no seconds', '2025-07-07T06:00+01', '2025-07-07T05:00:00.000Z'],
    ['a space instead of T (RFC 3339 §5.6 note)', '2025-07-07 06:00:00Z', '2025-07-07T06:00:00.000Z'],
    ['Nepal +05:45', '2025-01-01T05:45:00+05:45', '2025-01-01T00:00:00.000Z'],
  ])('reads %s', (_name, text, want) => {
    expect(parseAt('iso8601', text)).toBe(want);
  });

  it.each([
    ['no offset', '2025-07-07T06:00:00', /no UTC offset/],
    ['30 February', '2025-02-30T06:00:00Z', /day 30 does not exist in 2025-02 \(it has 28 days\)/],
    ['hour 24', '2025-07-07T24:00:00Z', /hour 24/],
    ['a leap second (stored readings have no 60th second)', '2016-12-31T23:59:60Z', /second 60/],
    ['a year before 1970', '1969-12-31T23:00:00Z', /before 1970/],
    ['words', 'yesterday', /not ISO 8601/],
    ['an empty cell', '  ', /empty/],
  ])('refuses %s with a reason', (_name, text, reason) => {
    expect(parseAt('iso8601', text)).toMatch(reason);
  });
});

describe('timestampParser with local patterns', () => {
  // Summer time in the EU starts and ends at 01:00 UTC on the last Sunday of March and of October
  // (Directive 2000/84/EC, Articles 2 and 3); Ireland is UTC+1 in summer and UTC+0 in winter.
  it.each([
    ['Dublin winter', 'DD/MM/YYYY HH:mm', '15/01/2025 08:00', '2025-01-15T08:00:00.000Z'],
    ['Dublin summer', 'DD/MM/YYYY HH:mm', '15/07/2025 08:00', '2025-07-15T07:00:00.000Z'],
    ['the last minute before summer time', 'YYYY-MM-DD HH:mm:ss', '2025-03-30 00:59:00', '2025-03-30T00:59:00.000Z'],
    ['the first minute of summer time', 'YYYY-MM-DD HH:mm:ss', '2025-03-30 02:00:00', '2025-03-30T01:00:00.000Z'],
    ['the repeated hour in October: its first occurrence (the reader picks by row order)', 'DD.MM.YYYY HH:mm', '26.10.2025 01:30', '2025-10-26T00:30:00.000Z'],
    ['just after the repeated hour', 'DD.MM.YYYY HH:mm:ss', '26.10.2025 02:00:00', '2025-10-26T02:00:00.000Z'],
    ['single-digit day, month and hour', 'DD/MM/YYYY HH:mm', '5/7/2025 6:05', '2025-07-05T05:05:00.000Z'],
  ])('reads %s in Europe/Dublin', (_name, format, text, want) => {
    expect(parseAt(format as Parameters<typeof timestampParser>[0], text, 'Europe/Dublin')).toBe(want);
  });

  // RFC 5545 §3.3.5 worked examples (recalled from memory, not re-checked): in America/New_York,
  // 2007-03-11 02:30 does not exist; 2007-11-04 01:30 occurs twice, first as EDT.
  it('refuses the RFC 5545 §3.3.5 gap example instead of moving it', () => {
    expect(parseAt('YYYY-MM-DD HH:mm', '2007-03-11 02:30', 'America/New_York')).toMatch(/does not exist in America\/New_York: the clocks went forward from 02:00 to 03:00 on 11 Mar 2007/);
  });
  it.each([
    ['RFC 5545 §3.3.5 repeated-hour example (first occurrence)', '2007-11-04 01:30', '2007-11-04T05:30:00.000Z'],
    ['the same day an hour later (EST)', '2007-11-04 02:30', '2007-11-04T07:30:00.000Z'],
  ])('follows %s', (_name, text, want) => {
    expect(parseAt('YYYY-MM-DD HH:mm', text, 'America/New_York')).toBe(want);
  });

  it('reads US-style month-first dates and a zone with a quarter-hour offset', () => {
    expect(parseAt('MM/DD/YYYY HH:mm', '07/05/2025 06:00', 'America/New_York')).toBe('2025-07-05T10:00:00.000Z');
    // Chatham Islands: UTC+13:45 in the southern summer.
    expect(parseAt('YYYY-MM-DD HH:mm', '2025-01-01 13:45', 'Pacific/Chatham')).toBe('2025-01-01T00:00:00.000Z');
  });

  it('gives the same answer from the cache as on first use', () => {
    const parse = timestampParser('YYYY-MM-DD HH:mm:ss', 'Europe/Dublin');
    const texts = ['2025-10-26 01:10:00', '2025-10-26 01:20:00', '2025-03-30 00:59:59', '2025-03-30 02:14:59', '2025-03-30 01:05:00'];
    const first = texts.map((t) => parse(t));
    const again = texts.map((t) => parse(t));
    expect(again).toEqual(first);
    expect(first.slice(0, 4).map((r) => (r.ok ? iso(r.ms) : r.reason))).toEqual(['2025-10-26T00:10:00.000Z', '2025-10-26T00:20:00.000Z', '2025-03-30T00:59:59.000Z', '2025-03-30T01:14:59.000Z']);
    expect(first[4]).toMatchObject({ ok: false, reason: expect.stringMatching(/does not exist/) });
  });

  it('refuses text that does not match the pattern and dates that do not exist', () => {
    expect(parseAt('DD/MM/YYYY HH:mm', '2025-07-05 06:00', 'UTC')).toBe('Timestamp "2025-07-05 06:00" does not match DD/MM/YYYY HH:mm');
    expect(parseAt('DD/MM/YYYY HH:mm', '05/07/2025 06:00:00', 'UTC')).toMatch(/does not match/);
    expect(parseAt('DD/MM/YYYY HH:mm', '29/02/2025 06:00', 'UTC')).toMatch(/day 29 does not exist in 2025-02/);
    // 2024 is a leap year (Gregorian rule: divisible by 4, not by 100 unless by 400).
    expect(parseAt('DD/MM/YYYY HH:mm', '29/02/2024 06:00', 'UTC')).toBe('2024-02-29T06:00:00.000Z');
    expect(parseAt('MM/DD/YYYY HH:mm', '13/01/2025 06:00', 'UTC')).toMatch(/month 13/);
  });

  it('throws for a missing or unknown time zone (the mapping schema refuses those first)', () => {
    expect(() => timestampParser('DD/MM/YYYY HH:mm')).toThrow(RangeError);
    expect(() => timestampParser('DD/MM/YYYY HH:mm', 'Mars/Olympus')).toThrow(RangeError);
  });
});

describe('parseLoggerNumber (the shared parseDecimal without grouping)', () => {
  it.each([
    ['12.5', false, 12.5],
    [' -0.25 ', false, -0.25],
    ['+3', false, 3],
    ['.5', false, 0.5],
    ['1e3', false, 1000],
    ['12,5', true, 12.5],
    ['-0,25', true, -0.25],
    ['7', true, 7],
  ])('reads %j (decimal comma %s) as %d', (text, comma, want) => {
    expect(parseLoggerNumber(text, comma)).toEqual({ ok: true, value: want });
  });

  it.each([
    ['12,5', false, /decimal comma: turn on "decimal comma"/],
    ['12.5', true, /has a decimal point/],
    ['1.234,5', true, /not a number/],
    ['1,234.5', false, /not a number/],
    ['ERR', false, /"ERR" is not a number/],
    ['NaN', false, /not a number/],
    ['Infinity', false, /not a number/],
    ['1e999', false, /too large/],
    ['', false, /is empty/],
  ])('refuses %j (decimal comma %s)', (text, comma, reason) => {
    const r = parseLoggerNumber(text, comma);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(reason);
  });
});

describe('sniffCsv', () => {
  const text = (s: string) => new TextEncoder().encode(s);
  // Signatures as each format's specification gives them (section numbers recalled from memory, not re-checked):
  // ZIP local header "PK\x03\x04" (PKWARE APPNOTE.TXT §4.3.7), gzip 1F 8B (RFC 1952 §2.3.1), "%PDF-" (ISO 32000-1 §7.5.2),
  // PNG 89 50 4E 47 0D 0A 1A 0A (PNG specification §5.2), UTF-16 little-endian byte-order mark FF FE (Unicode §23.8).
  it.each([
    ['ZIP', [0x50, 0x4b, 0x03, 0x04, 0x14, 0x00], /ZIP archive/],
    ['gzip', [0x1f, 0x8b, 0x08, 0x00], /gzip/],
    ['PDF', [...text('%PDF-1.7\n')], /PDF/],
    ['PNG', [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a], /PNG/],
    ['UTF-16', [0xff, 0xfe, 0x74, 0x00, 0x69, 0x00], /UTF-16/],
    ['NUL bytes', [...text('time,level\n1,2'), 0x00], /NUL/],
    ['control characters', [...text('ab'), ...Array.from({ length: 20 }, () => 0x01), ...text('cd'.repeat(100))], /control characters/],
  ])('refuses %s', (_name, bytes, reason) => {
    const r = sniffCsv(Uint8Array.from(bytes));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(reason);
  });

  it.each([
    ['plain CSV', 'time,level\n2025-01-01T00:00:00Z,5\n'],
    ['CSV with a byte-order mark, CRLF and a tab', '\uFEFFtime\tlevel\r\n1\t2\r\n'],
    ['text with °C and accents', 'Zeit;Füllstand;Temp °C\n'],
    ['an empty file', ''],
  ])('passes %s', (_name, s) => {
    expect(sniffCsv(text(s))).toEqual({ ok: true });
  });
});

describe('importMappingSchema', () => {
  const base: ImportMappingInput = { timestamp: { column: 0, format: 'iso8601' }, value: { column: 1, kind: 'level', unit: 'mm' } };
  const issue = (m: unknown) => {
    const r = importMappingSchema.safeParse(m);
    return r.success ? null : { path: r.error.issues[0].path.join('.'), message: r.error.issues[0].message };
  };

  it('fills the defaults: auto delimiter, decimal point, a header row, no temperature', () => {
    expect(importMappingSchema.parse(base)).toEqual({ ...base, timestamp: { ...base.timestamp, time: null }, delimiter: 'auto', decimalComma: false, hasHeader: true, temperature: null });
  });

  it.each([
    ['a local pattern without a time zone', { ...base, timestamp: { column: 0, format: 'DD/MM/YYYY HH:mm' } }, 'timestamp.timeZone', /IANA time zone/],
    ['an unknown time zone', { ...base, timestamp: { column: 0, format: 'DD/MM/YYYY HH:mm', timeZone: 'Dublin' } }, 'timestamp.timeZone', /not a known IANA time zone/],
    ['a pressure in mm', { ...base, value: { column: 1, kind: 'pressure', unit: 'mm' } }, 'value.unit', /pressure unit/],
    ['a distance in kPa', { ...base, value: { column: 1, kind: 'ultrasonic', unit: 'kPa' } }, 'value.unit', /length unit/],
    ['a column name without a header row', { ...base, hasHeader: false, value: { column: 'level', kind: 'level', unit: 'mm' } }, 'value.column', /needs a header row/],
    ['the same column twice', { ...base, temperature: { column: 1, unit: 'C' } }, 'temperature.column', /same column as the value/],
    ['the same name twice in other case', { ...base, timestamp: { column: 'Time', format: 'iso8601' }, value: { column: 'time', kind: 'level', unit: 'mm' } }, 'value.column', /same column as the timestamp/],
    ['a negative column', { ...base, value: { column: -1, kind: 'level', unit: 'mm' } }, 'value.column', /.+/],
    ['an unknown unit', { ...base, value: { column: 1, kind: 'level', unit: 'furlong' } }, 'value.unit', /must be one of/],
    ['a missing value column', { timestamp: base.timestamp }, 'value', /value column/],
  ])('refuses %s, naming the field', (_name, m, path, message) => {
    expect(issue(m)).toMatchObject({ path, message: expect.stringMatching(message) });
  });
});

describe('delimiterCandidates and csvParseOptions', () => {
  it('keeps the comma out of the guesses when numbers use a decimal comma', () => {
    expect(delimiterCandidates({ delimiter: 'auto', decimalComma: false })).toEqual([',', ';', '\t']);
    expect(delimiterCandidates({ delimiter: 'auto', decimalComma: true })).toEqual([';', '\t']);
    expect(delimiterCandidates({ delimiter: '\t', decimalComma: true })).toEqual(['\t']);
  });

  it('counts the line breaks inside quoted cells, CRLF once, and not the half of a CRLF the separator took', () => {
    expect(lineBreaksInside(['a', 'b'], '\n')).toBe(0);
    expect(lineBreaksInside(['one\ntwo', 'x\r\ny'], '\n')).toBe(2);
    expect(lineBreaksInside(['a\rb', 'c'], '\r\n')).toBe(1);
    // LF-separated CRLF text leaves its CR at the end of the record.
    expect(lineBreaksInside(['a', 'b\r'], '\n')).toBe(0);
    expect(lineBreaksInside(['a', 'b\r'], '\r\n')).toBe(1);
    // CR-separated CRLF text starts each later record with the LF.
    expect(lineBreaksInside(['\nb', 'c'], '\r')).toBe(0);
    expect(lineBreaksInside(['\nb', 'c'], '\r', true)).toBe(1);
  });
});

// A 1,000 mm wide, 1,500 mm tall upright cylinder: 785.398 L per metre of level (π/4 · 1 m² · 1 m).
const TANK: TankSetup = { geometry: { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1500 }, datumOffsetMm: 0, outletHeightMm: 100, safeFillLevelMm: 1400, specificGravity: 1 };
const NOW = Date.parse('2026-01-01T00:00:00Z');
const readAll = (text: string, mapping: ImportMappingInput, tank: TankSetup = TANK, delimiter: ',' | ';' | '\t' = ',') => {
  const parsed = Papa.parse<string[]>(text, csvParseOptions(delimiter));
  const reader = createImportReader({ mapping: importMappingSchema.parse(mapping), tank, nowMs: NOW, newline: parsed.meta.linebreak as LineBreak });
  const results: FeedResult[] = parsed.data.map((cells) => reader.feed(cells));
  return { results, end: reader.end(), counts: reader.counts };
};

describe('createImportReader', () => {
  const mapping: ImportMappingInput = { timestamp: { column: 'Time', format: 'iso8601' }, value: { column: 'Level', kind: 'level', unit: 'cm' }, temperature: { column: 'Temp', unit: 'F' } };

  it('turns each row into a level in mm, litres and °C, skipping the header and blank lines', () => {
    const { results, end, counts } = readAll('\uFEFFtime,LEVEL,temp\n2025-06-01T00:00:00Z,50,68\n\n2025-06-01T01:00:00Z,49.5,\n', mapping);
    expect(end).toEqual({ ok: true });
    // One blank line, and the empty record after the final line break.
    expect(counts).toEqual({ rows: 2, rejected: 0, blank: 2, noticed: 0 });
    const readings = results.flatMap((r) => (r.kind === 'reading' ? [r.reading] : []));
    // 68 °F = 20 °C exactly ((68 − 32) × 5/9); 50 cm = 500 mm.
    expect(readings.map((r) => [r.line, iso(r.takenAtMs), r.levelMm, r.temperatureC])).toEqual([
      [2, '2025-06-01T00:00:00.000Z', 500, 20],
      [4, '2025-06-01T01:00:00.000Z', 495, null],
    ]);
    expect(readings[0].grossL).toBeCloseTo(500 * (Math.PI / 4), 9);
    expect(readings[0].usableL).toBeCloseTo(400 * (Math.PI / 4), 9);
  });

  it('reports the physical line of a row that follows a quoted cell spanning lines', () => {
    const text = 'time,level,note\r\n2025-06-01T00:00:00Z,500,"pump\r\nserviced"\r\n2025-06-01T01:00:00Z,lots,\r\n';
    const { results } = readAll(text, { timestamp: { column: 0, format: 'iso8601' }, value: { column: 1, kind: 'level', unit: 'mm' } });
    const bad = results.find((r) => r.kind === 'rejected');
    expect(bad).toMatchObject({ kind: 'rejected', line: 4, problems: [{ line: 4, field: 'value', column: 'level', value: 'lots', reason: 'Value "lots" is not a number' }] });
  });

  it('reports every problem of a row, each with its column', () => {
    const { results, counts } = readAll('time,level,temp\n2099-01-01T00:00:00Z,1600,200\n2025-06-01T00:00:00Z\n', mapping);
    expect(counts).toEqual({ rows: 2, rejected: 2, blank: 1, noticed: 0 });
    const [first, second] = results.filter((r) => r.kind === 'rejected') as Extract<FeedResult, { kind: 'rejected' }>[];
    expect(first.problems.map((p) => [p.field, p.column])).toEqual([
      ['timestamp', 'time'],
      ['value', 'level'],
      ['temperature', 'temp'],
    ]);
    expect(first.problems[0].reason).toMatch(/in the future/);
    expect(first.problems[1].reason).toBe('1600 cm: Level 16,000 mm is 14,500 mm above the top of the tank (1,500 mm)');
    // 200 °F = 93.3 °C, above the 90 °C bound.
    expect(first.problems[2].reason).toMatch(/outside -40 to 90 °C/);
    expect(second.problems).toMatchObject([{ line: 3, field: 'value', column: 'level', value: '', reason: 'Missing: the row has 1 field, so there is no level' }]);
  });

  it('converts distances and pressures with the tank setup', () => {
    const distance = readAll('2025-06-01T00:00:00Z;123,4\n', { hasHeader: false, decimalComma: true, timestamp: { column: 0, format: 'iso8601' }, value: { column: 1, kind: 'ultrasonic', unit: 'cm' } }, { ...TANK, sensorHeightMm: 1600 }, ';');
    expect(distance.results[0]).toMatchObject({ kind: 'reading', reading: { line: 1, levelMm: 1600 - 1234 } });
    // 1 psi = 6.894757 kPa and 1 mH₂O = 9.80665 kPa (NIST SP 811 Appendix B.8, recalled from memory): 1 psi of water is 0.703070 m.
    const pressure = readAll('2025-06-01T00:00:00Z\t1\n', { hasHeader: false, timestamp: { column: 0, format: 'iso8601' }, value: { column: 1, kind: 'pressure', unit: 'psi' } }, TANK, '\t');
    expect(pressure.results[0]).toMatchObject({ kind: 'reading' });
    if (pressure.results[0].kind === 'reading') expect(pressure.results[0].reading.levelMm).toBeCloseTo(703.0696, 3);
  });

  it('ends the file at once when a mapped column is not in the header row', () => {
    const { results, end } = readAll('when,level\n2025-06-01T00:00:00Z,5\n', mapping);
    expect(results[0]).toMatchObject({ kind: 'fatal', reason: 'Timestamp column: The column "Time" is not in the header row (it has "when", "level")' });
    expect(results[1].kind).toBe('fatal');
    expect(end).toMatchObject({ ok: false, reason: results[0].kind === 'fatal' ? results[0].reason : '' });
  });

  it('says whether a file was empty or had only its header row', () => {
    expect(readAll('', mapping).end).toMatchObject({ ok: false, reason: 'The file is empty: it has no rows to import' });
    expect(readAll('\n\n', { ...mapping, hasHeader: false, timestamp: { column: 0, format: 'iso8601' }, value: { column: 1, kind: 'level', unit: 'mm' }, temperature: null }).end).toMatchObject({ reason: /empty/ });
    expect(readAll('time,level,temp\n', mapping).end).toMatchObject({ ok: false, reason: 'The file has a header row but no data rows: nothing to import' });
  });

  it('refuses distances for a tank without a sensor height before any row is read', () => {
    const m = importMappingSchema.parse({ timestamp: { column: 0, format: 'iso8601' }, value: { column: 1, kind: 'ultrasonic', unit: 'cm' } });
    expect(mappingProblem(m, TANK)).toMatchObject({ field: 'mapping.value.kind' });
    expect(mappingProblem(m, { ...TANK, sensorHeightMm: 1600 })).toBeNull();
  });
});
