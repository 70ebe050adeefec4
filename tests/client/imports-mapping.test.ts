// The Logger files screen's mapping helpers: the guess from a file's first lines, the mapping the
// form builds (checked with the shared importMappingSchema the server parses uploads with), and the
// browser preview check, run on the invented logger files in samples/loggers.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { importMappingSchema, type ImportMapping } from '@shared/imports';
import type { TankSetup } from '@shared/readings';
import { buildMapping, columnOptions, draftFromMapping, emptyDraft, guessDraft, mappingInputOf, rebaseColumn, type MappingDraft } from '@/components/imports/importMapping';
import { checkPreview, previewRecords, readFileHead, resolveDelimiter, PREVIEW_RECORDS } from '@/components/imports/importPreview';

const root = join(import.meta.dirname, '../..');
const scenario = JSON.parse(readFileSync(join(root, 'samples/demo/scenario.json'), 'utf8')) as { tanks: (TankSetup & { code: string; sensorHeightMm?: number | null })[] };

function demoTank(code: string): TankSetup {
  const t = scenario.tanks.find((x) => x.code === code)!;
  return { geometry: t.geometry, datumOffsetMm: t.datumOffsetMm, outletHeightMm: t.outletHeightMm, safeFillLevelMm: t.safeFillLevelMm, specificGravity: t.specificGravity, sensorHeightMm: t.sensorHeightMm ?? undefined };
}

function sampleFile(name: string): File {
  return new File([readFileSync(join(root, 'samples/loggers', name))], name, { type: 'text/csv' });
}

/** The first records of a sample, split the way the screen splits them for `draft`. */
async function recordsOf(name: string, draft: Pick<MappingDraft, 'delimiter' | 'decimalComma'> = { delimiter: 'auto', decimalComma: false }) {
  const head = await readFileHead(sampleFile(name));
  expect(head.problem).toBeNull();
  return { head, records: previewRecords(head, resolveDelimiter(head.text, draft)) };
}

const NOW_MS = Date.UTC(2026, 11, 1);
// Lines of samples/loggers/so-w1-level-bad-rows-2025-09-01.csv made bad on purpose: ERR, no offset, 2099, above the tank.
const BAD_LINES = [55, 80, 104, 154];

describe('guessDraft on the sample logger files', () => {
  it.each([
    ['mf-w1-level-2025-07-07.csv', { format: 'iso8601', ts: 'Timestamp', value: 'Level (mm)', kind: 'level', unit: 'mm', temperature: null, decimalComma: false }],
    ['hr-c1-pressure-2025-08-11.csv', { format: 'YYYY-MM-DD HH:mm:ss', ts: 'time_utc', value: 'pressure_kpa', kind: 'pressure', unit: 'kPa', temperature: 'temp_c', decimalComma: false }],
    ['hr-w1-ultrasonic-2025-10-23.csv', { format: 'DD/MM/YYYY HH:mm', ts: 'Date/time', value: 'Distance (cm)', kind: 'ultrasonic', unit: 'cm', temperature: 'Air temp (C)', decimalComma: true }],
    ['so-w1-level-bad-rows-2025-09-01.csv', { format: 'iso8601', ts: 'time', value: 'level_m', kind: 'level', unit: 'm', temperature: null, decimalComma: false }],
  ] as const)('reads the columns of %s from its header and first rows', async (name, want) => {
    const { records } = await recordsOf(name);
    // A first guess with decimalComma set splits the file again the way the guess says.
    const first = guessDraft(records, emptyDraft('Europe/Dublin'));
    const again = first.decimalComma ? guessDraft((await recordsOf(name, first)).records, emptyDraft('Europe/Dublin')) : first;

    expect(again.hasHeader).toBe(true);
    expect(again.timestampFormat).toBe(want.format);
    expect(again.timestampColumn).toBe(want.ts);
    expect(again.valueColumn).toBe(want.value);
    expect(again.valueKind).toBe(want.kind);
    expect(again.valueUnit).toBe(want.unit);
    expect(again.temperatureColumn).toBe(want.temperature);
    expect(again.decimalComma).toBe(want.decimalComma);
  });

  it('reads a local layout under a "utc" header as UTC, not the farm zone', async () => {
    const { records } = await recordsOf('hr-c1-pressure-2025-08-11.csv');

    expect(guessDraft(records, emptyDraft('Europe/Dublin')).timeZone).toBe('UTC');
  });

  it('numbers the columns when the first line holds data, not names', () => {
    const records = [
      ['2026-03-01 06:00', '812.5'],
      ['2026-03-01 06:30', '811.0'],
    ];

    const draft = guessDraft(records, emptyDraft('Europe/Lisbon'));

    expect(draft.hasHeader).toBe(false);
    expect(draft.timestampColumn).toBe(0);
    expect(draft.valueColumn).toBe(1);
    expect(draft.timeZone).toBe('Europe/Lisbon');
  });
});

describe('buildMapping', () => {
  it.each([
    ['mf-w1-level-2025-07-07.csv', 'MF-W1'],
    ['mf-w1-level-2025-07-13.csv', 'MF-W1'],
    ['hr-c1-pressure-2025-08-11.csv', 'HR-C1'],
  ])('builds from the guess for %s a mapping importMappingSchema accepts, and every preview row of it reads in %s', async (name, code) => {
    const { records } = await recordsOf(name);
    const draft = guessDraft(records, emptyDraft('Europe/Dublin'));

    const built = buildMapping(draft, demoTank(code));

    expect(built.ok).toBe(true);
    if (!built.ok) return;
    expect(importMappingSchema.parse(JSON.parse(JSON.stringify(built.mapping)))).toEqual(built.mapping);
    const check = checkPreview(records, built.mapping, demoTank(code), NOW_MS);
    expect(check.fatal).toBeNull();
    expect(check.bad).toBe(0);
    expect(check.good).toBe(PREVIEW_RECORDS - 1);
  });

  it('names the missing choices instead of sending a half-filled mapping', () => {
    const built = buildMapping(emptyDraft('Europe/Dublin'), null);

    expect(built).toEqual({
      ok: false,
      errors: {
        'timestamp.column': 'Choose the column that holds the date and time',
        'timestamp.format': 'Choose how the date and time are written',
        'value.column': 'Choose the column that holds the level, distance or pressure',
      },
    });
  });

  it('puts the schema messages under the form fields they are about', () => {
    const draft: MappingDraft = { ...emptyDraft('Mars/Olympus'), timestampColumn: 'Timestamp', timestampFormat: 'DD/MM/YYYY HH:mm', valueColumn: 'timestamp', valueKind: 'pressure', valueUnit: 'mm' };
    const parsed = importMappingSchema.safeParse(mappingInputOf(draft));
    expect(parsed.success).toBe(false);

    const built = buildMapping(draft, null);

    expect(built.ok).toBe(false);
    if (built.ok) return;
    expect(built.errors['timestamp.timeZone']).toBe('"Mars/Olympus" is not a known IANA time zone');
    expect(built.errors['value.unit']).toMatch(/^a pressure needs a pressure unit/);
    expect(built.errors['value.column']).toBe('is the same column as the timestamp');
  });

  it("says an ultrasonic file needs the tank's sensor height when the tank has none", async () => {
    const { records } = await recordsOf('hr-w1-ultrasonic-2025-10-23.csv', { delimiter: 'auto', decimalComma: true });
    const draft = guessDraft(records, emptyDraft('Europe/Dublin'));

    const built = buildMapping(draft, demoTank('HR-W1'));

    expect(built.ok).toBe(false);
    if (built.ok) return;
    expect(built.errors['value.kind']).toMatch(/sensor height/);
  });

  it('gives back exactly a saved mapping it was filled from, so a saved logger needs no clicks', () => {
    const saved: ImportMapping = importMappingSchema.parse({
      delimiter: ';',
      decimalComma: true,
      hasHeader: true,
      timestamp: { column: 'Date/time', format: 'DD/MM/YYYY HH:mm', timeZone: 'Europe/Dublin' },
      value: { column: 2, kind: 'pressure', unit: 'mH2O' },
      temperature: { column: 'Air temp (C)', unit: 'F' },
    });

    expect(buildMapping(draftFromMapping(saved, 'UTC'), null)).toEqual({ ok: true, mapping: saved });
  });
});

describe('checkPreview', () => {
  it('numbers rows by physical line past a quoted two-line note and refuses the ERR row of the bad-rows sample', async () => {
    const head = await readFileHead(sampleFile('so-w1-level-bad-rows-2025-09-01.csv'));
    const Papa = (await import('papaparse')).default;
    const all = Papa.parse<string[]>(head.text, { delimiter: ',', quoteChar: '"', escapeChar: '"', skipEmptyLines: false }).data;
    const mapping = importMappingSchema.parse({ timestamp: { column: 'time', format: 'iso8601' }, value: { column: 'level_m', kind: 'level', unit: 'm' } });

    const check = checkPreview(all, mapping, demoTank('SO-W1'), NOW_MS);

    const bad = check.rows.filter((r) => r.kind === 'rejected');
    expect(bad.map((r) => r.line)).toEqual(BAD_LINES);
    expect(bad[0].problems[0]).toMatchObject({ field: 'value', column: 'level_m', value: 'ERR' });
    expect(check.rows.find((r) => r.kind === 'reading' && r.reading?.line === 34)?.cells[0]).toBe('2025-09-02T07:00:00Z');
    expect(check.rows[1].reading?.levelMm).toBeCloseTo(1640, 6);
  });

  it('refuses a value above the tank and a timestamp without offset, naming the line', () => {
    const records = [
      ['Timestamp', 'Level (mm)'],
      ['2025-07-20T03:00:00+01:00', '1702.4'],
      ['2025-07-20T04:00:00', '1400'],
      ['2025-07-20T05:00:00+01:00', 'ERR'],
      ['2025-07-20T06:00:00+01:00', '1401.5'],
    ];
    const mapping = importMappingSchema.parse({ timestamp: { column: 'Timestamp', format: 'iso8601' }, value: { column: 'Level (mm)', kind: 'level', unit: 'mm' } });

    const check = checkPreview(records, mapping, demoTank('MF-W1'), NOW_MS);

    expect(check.rows.map((r) => [r.line, r.kind])).toEqual([
      [1, 'header'],
      [2, 'rejected'],
      [3, 'rejected'],
      [4, 'rejected'],
      [5, 'reading'],
    ]);
    expect(check.rows[1].problems[0].reason).toMatch(/above the top of the tank/);
    expect(check.rows[2].problems[0].reason).toMatch(/no UTC offset/);
    expect(check.rows[3].problems[0].reason).toBe('Value "ERR" is not a number');
    expect([check.good, check.bad]).toEqual([1, 3]);
  });

  it('says why the whole file cannot be read when a mapped column is missing', () => {
    const mapping = importMappingSchema.parse({ timestamp: { column: 'Time', format: 'iso8601' }, value: { column: 'Level', kind: 'level', unit: 'mm' } });

    const check = checkPreview([['When', 'Level'], ['2025-07-20T03:00:00Z', '100']], mapping, demoTank('MF-W1'), NOW_MS);

    expect(check.fatal).toMatch(/^Timestamp column: The column "Time" is not in the header row/);
    expect(check.rows.every((r) => r.kind === 'unchecked')).toBe(true);
  });
});

describe('readFileHead', () => {
  it('refuses a workbook by its content, whatever its name', async () => {
    const zip = new File([new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x14, 0, 0, 0])], 'levels.csv');

    const head = await readFileHead(zip);

    expect(head.problem).toMatch(/ZIP archive/);
  });

  it('drops the byte-order mark so the first header name matches', async () => {
    const { records } = await recordsOf('hr-w1-ultrasonic-2025-10-23.csv', { delimiter: 'auto', decimalComma: true });

    expect(records[0][0]).toBe('Date/time');
    expect(records[0]).toHaveLength(3);
  });
});

describe('column references', () => {
  it('names a column by its header text unless the name is repeated or empty', () => {
    expect(columnOptions(['Time', 'Level', 'level', ''], 4).map((o) => o.value)).toEqual(['Time', 1, 2, 3]);
  });

  it('keeps pointing at the same column when the header switch changes', () => {
    const header = ['Time', 'Level'];

    expect(rebaseColumn('Level', header, false, 2)).toBe(1);
    expect(rebaseColumn(1, header, true, 2)).toBe('Level');
  });
});
