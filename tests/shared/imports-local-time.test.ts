// Logger files that keep local time: the spring-forward gap and the repeated autumn hour (refused, or
// read by the order of the rows with a notice), a date column plus a time column, repeated instants
// inside one file, and moments in messages written as the app writes dates.
//
// Europe/Madrid follows the EU rule: summer time from 01:00 UTC on the last Sunday of March to 01:00 UTC on
// the last Sunday of October (IANA Time Zone Database, europe file: "Rule EU … lastSun Mar 1:00u" and
// "lastSun Oct 1:00u", Zone Europe/Madrid on EU rules since 1979). In 2026 those Sundays are 29 March
// (02:00 CET → 03:00 CEST, UTC+1 → UTC+2) and 25 October (03:00 CEST → 02:00 CET).
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import {
  createImportReader,
  createInstantTally,
  csvParseOptions,
  dateTimeParser,
  formatInstant,
  importMappingSchema,
  refusedFileReason,
  timeCellParser,
  timestampParser,
  zoneConverter,
  type FeedResult,
  type ImportMappingInput,
} from '@shared/imports';
import type { TankSetup } from '@shared/readings';

const iso = (ms: number) => new Date(ms).toISOString();
const TANK: TankSetup = { geometry: { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1500 }, datumOffsetMm: 0, outletHeightMm: 100, safeFillLevelMm: 1400, specificGravity: 1 };
const NOW = Date.parse('2027-01-01T00:00:00Z');

const readAll = (text: string, mapping: ImportMappingInput, nowMs = NOW) => {
  const parsed = Papa.parse<string[]>(text, csvParseOptions(','));
  const reader = createImportReader({ mapping: importMappingSchema.parse(mapping), tank: TANK, nowMs, displayTimeZone: 'Europe/Madrid' });
  const results: FeedResult[] = parsed.data.map((cells) => reader.feed(cells));
  return { results, reader };
};
const readings = (results: FeedResult[]) => results.flatMap((r) => (r.kind === 'reading' ? [r] : []));

describe('zoneConverter on the IANA Time Zone Database, europe file (Europe/Madrid 2026)', () => {
  const toUtc = zoneConverter('Europe/Madrid');
  const wall = (text: string) => Date.parse(`${text}Z`);

  it.each([
    ['the last minute before the spring change', '2026-03-29T01:59:00', '2026-03-29T00:59:00.000Z'],
    ['the first minute of summer time', '2026-03-29T03:00:00', '2026-03-29T01:00:00.000Z'],
    ['the minute before the repeated hour', '2026-10-25T01:59:00', '2026-10-24T23:59:00.000Z'],
    ['the first minute after the repeated hour', '2026-10-25T03:00:00', '2026-10-25T02:00:00.000Z'],
  ])('gives one instant for %s', (_name, text, want) => {
    const r = toUtc(wall(text));
    expect(r.kind).toBe('single');
    if (r.kind === 'single') expect(iso(r.ms)).toBe(want);
  });

  it.each(['2026-03-29T02:00:00', '2026-03-29T02:30:00', '2026-03-29T02:59:00'])('finds no instant for %s (02:00→03:00 gap)', (text) => {
    expect(toUtc(wall(text))).toMatchObject({ kind: 'gap', reason: expect.stringContaining('from 02:00 to 03:00 on 29 Mar 2026') });
  });

  it.each([
    ['2026-10-25T02:00:00', '2026-10-25T00:00:00.000Z', '2026-10-25T01:00:00.000Z'],
    ['2026-10-25T02:30:00', '2026-10-25T00:30:00.000Z', '2026-10-25T01:30:00.000Z'],
  ])('finds both instants of %s (03:00→02:00 repeat)', (text, earlier, later) => {
    const r = toUtc(wall(text));
    expect(r.kind).toBe('repeated');
    if (r.kind === 'repeated') expect([iso(r.earlierMs), iso(r.laterMs), r.earlierOffsetMin, r.laterOffsetMin]).toEqual([earlier, later, 120, 60]);
  });

  it('throws for an unknown zone', () => {
    expect(() => zoneConverter('Mars/Olympus')).toThrow(RangeError);
  });
});

describe('timestampParser in the spring gap', () => {
  it('refuses a local time that does not exist, saying when the clocks went forward', () => {
    expect(timestampParser('DD/MM/YYYY HH:mm', 'Europe/Madrid')('29/03/2026 02:30')).toMatchObject({
      ok: false,
      reason: 'Timestamp "29/03/2026 02:30" does not exist in Europe/Madrid: the clocks went forward from 02:00 to 03:00 on 29 Mar 2026, so no reading was taken at that local time (check the logger\'s clock and its time zone)',
    });
  });
});

describe('createImportReader with a repeated local hour', () => {
  const mapping: ImportMappingInput = { timestamp: { column: 'time', format: 'YYYY-MM-DD HH:mm', timeZone: 'Europe/Madrid' }, value: { column: 'level', kind: 'level', unit: 'mm' } };

  it('reads the two passes of the hour by the order of the rows and notes each row', () => {
    const file = 'time,level\n2026-10-25 01:30,900\n2026-10-25 02:00,899\n2026-10-25 02:30,898\n2026-10-25 02:00,897\n2026-10-25 02:30,896\n2026-10-25 03:00,895\n';
    const { results, reader } = readAll(file, mapping);
    const got = readings(results);
    expect(got.map((r) => iso(r.reading.takenAtMs))).toEqual([
      '2026-10-24T23:30:00.000Z',
      '2026-10-25T00:00:00.000Z',
      '2026-10-25T00:30:00.000Z',
      '2026-10-25T01:00:00.000Z',
      '2026-10-25T01:30:00.000Z',
      '2026-10-25T02:00:00.000Z',
    ]);
    expect(got.map((r) => r.notice?.line ?? null)).toEqual([null, 3, 4, 5, 6, null]);
    expect(got[1].notice?.note).toMatch(/happens twice in Europe\/Madrid.*first time round \(UTC\+02:00\)/);
    expect(got[3].notice?.note).toMatch(/second time round \(UTC\+01:00\).*stored as 25 Oct 2026, 01:00 UTC\.$/);
    expect(reader.counts.noticed).toBe(4);
    expect(reader.repeatedInFile()).toBe(0);
  });

  it('reads an hourly logger whose one repeated 02:00 is written twice as two hours', () => {
    const { results, reader } = readAll('time,level\n2026-10-25 01:00,900\n2026-10-25 02:00,899\n2026-10-25 02:00,898\n2026-10-25 03:00,897\n', mapping);
    expect(readings(results).map((r) => iso(r.reading.takenAtMs))).toEqual(['2026-10-24T23:00:00.000Z', '2026-10-25T00:00:00.000Z', '2026-10-25T01:00:00.000Z', '2026-10-25T02:00:00.000Z']);
    expect(reader.repeatedInFile()).toBe(0);
  });

  it('refuses a row in the spring gap on its own line and keeps the others', () => {
    const { results } = readAll('time,level\n2026-03-29 01:30,900\n2026-03-29 02:30,899\n2026-03-29 03:30,898\n', mapping);
    expect(results[2]).toMatchObject({ kind: 'rejected', line: 3, problems: [{ line: 3, field: 'timestamp', column: 'time', value: '2026-03-29 02:30', reason: expect.stringMatching(/does not exist in Europe\/Madrid/) }] });
    expect(readings(results).map((r) => iso(r.reading.takenAtMs))).toEqual(['2026-03-29T00:30:00.000Z', '2026-03-29T01:30:00.000Z']);
  });

  it('counts rows repeating an instant of the same file, even out of order', () => {
    const { reader } = readAll('time,level\n2026-06-01 06:00,900\n2026-06-01 07:00,899\n2026-06-01 06:00,900\n2026-06-01 07:00,899\n2026-06-01 08:00,898\n', mapping);
    expect(reader.counts.rows).toBe(5);
    expect(reader.repeatedInFile()).toBe(2);
  });

  it('writes the moment in a "future" message as the app shows dates, never ISO text', () => {
    const { results } = readAll('time,level\n2026-06-01 06:00,900\n', mapping, Date.parse('2026-05-01T10:00:00Z'));
    const reason = results[1].kind === 'rejected' ? results[1].problems[0].reason : '';
    expect(reason).toBe('Timestamp "2026-06-01 06:00" is in the future (after 1 May 2026, 12:00, the farm\'s time now)');
    expect(reason).not.toMatch(/\dT\d/);
  });
});

describe('a date column and a time column', () => {
  const mapping: ImportMappingInput = {
    timestamp: { column: 'Date', format: 'DD/MM/YYYY', timeZone: 'Europe/Madrid', time: { column: 'Time', format: 'HH:mm:ss' } },
    value: { column: 'Level (mm)', kind: 'level', unit: 'mm' },
  };

  it('reads the two cells as one local time', () => {
    const { results } = readAll('Date,Time,Level (mm)\n01/07/2026,06:00:00,900\n01/07/2026,18:30:15,880\n', mapping);
    expect(readings(results).map((r) => iso(r.reading.takenAtMs))).toEqual(['2026-07-01T04:00:00.000Z', '2026-07-01T16:30:15.000Z']);
  });

  it('reports a bad date on the date column and a bad or missing time on the time column', () => {
    const { results } = readAll('Date,Time,Level (mm)\n31/06/2026,06:00:00,900\n01/07/2026,25:00:00,880\n29/03/2026,02:15:00,870\n', mapping);
    const problems = results.flatMap((r) => (r.kind === 'rejected' ? r.problems : []));
    expect(problems.map((p) => [p.line, p.field, p.column, p.value])).toEqual([
      [2, 'timestamp', 'Date', '31/06/2026'],
      [3, 'time', 'Time', '25:00:00'],
      [4, 'time', 'Time', '02:15:00'],
    ]);
    expect(problems[0].reason).toMatch(/day 31 does not exist in 2026-06/);
    expect(problems[2].reason).toMatch(/"29\/03\/2026 02:15:00" does not exist in Europe\/Madrid/);
  });

  it('reads 12-hour times with AM/PM', () => {
    const read = timeCellParser('hh:mm:ss AM/PM');
    expect(['12:00:00 AM', '01:30:00 PM', '12:15:00 pm', '11:59:59 p.m.'].map((t) => read(t))).toMatchObject([
      { ok: true, time: { hour: 0 } },
      { ok: true, time: { hour: 13, minute: 30 } },
      { ok: true, time: { hour: 12, minute: 15 } },
      { ok: true, time: { hour: 23, second: 59 } },
    ]);
    expect(read('13:00:00 PM')).toMatchObject({ ok: false, reason: expect.stringMatching(/1–12/) });
    expect(dateTimeParser('YYYY-MM-DD', 'hh:mm AM/PM', 'UTC')('2026-07-01', '6:05 PM')).toEqual({ ok: true, ms: Date.parse('2026-07-01T18:05:00Z') });
  });

  it.each([
    ['a date layout without a time column', { ...mapping, timestamp: { column: 'Date', format: 'DD/MM/YYYY', timeZone: 'UTC' } }, 'timestamp.time', /date only/],
    ['a full layout with a time column too', { ...mapping, timestamp: { column: 'Date', format: 'DD/MM/YYYY HH:mm', timeZone: 'UTC', time: { column: 'Time', format: 'HH:mm' } } }, 'timestamp.format', /has the time in it already/],
    ['the time column also as the value', { ...mapping, value: { column: 'time', kind: 'level', unit: 'mm' } }, 'value.column', /same column as the time/],
    ['the date column also as the time', { ...mapping, timestamp: { ...mapping.timestamp, time: { column: 'date', format: 'HH:mm' } } }, 'timestamp.time.column', /same column as the date/],
  ])('refuses %s, naming the field', (_name, m, path, message) => {
    const r = importMappingSchema.safeParse(m);
    expect(r.success ? null : { path: r.error.issues[0].path.join('.'), message: r.error.issues[0].message }).toMatchObject({ path, message: expect.stringMatching(message) });
  });
});

describe('createInstantTally', () => {
  it('counts nothing for a file moving forward and every repeat otherwise', () => {
    const forward = createInstantTally();
    for (let i = 0; i < 5000; i++) forward.add(i * 1000);
    expect(forward.repeated()).toBe(0);
    const mixed = createInstantTally();
    for (const ms of [5, 1, 5, 5, 2, 1, 9]) mixed.add(ms);
    expect(mixed.repeated()).toBe(3);
  });
});

describe('formatInstant and the refuse-the-file wording', () => {
  it('writes a moment as "29 Mar 2026, 03:00" in the zone asked for', () => {
    expect(formatInstant(Date.parse('2026-03-29T01:00:00Z'), 'Europe/Madrid')).toBe('29 Mar 2026, 03:00');
  });

  it('names the policy with the same words as its choice on the form', () => {
    expect(refusedFileReason(4, 216)).toBe('4 of 216 rows have problems, so nothing from this file was stored ("Refuse the whole file if any row is bad" was chosen)');
  });
});
