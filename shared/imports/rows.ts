// One logger file, record by record: the header row, then each data row checked and turned into a
// level and volumes with the tank's own setup (the same readingToVolumes a round uses). Bad rows come
// back with their physical line, column and reason; nothing is clamped. A local time that occurs twice
// (clocks going back) is read by the order of the rows and comes back with a notice saying how. Pure:
// the browser preview, the server's import and dry run and the property tests all feed it the records
// papaparse gives.
import { checkProblem, moment, type CheckParam, type CheckProblem } from '../check-problems';
import { readingToVolumes, type ReadingInput, type TankSetup } from '../readings/index';
import { toSI, type LengthUnit, type PressureUnit } from '../units/index';
import { isBlankRow, lineBreaksInside, stripBom, type LineBreak } from './csv';
import type { ColumnRef, DateFormat, ImportMapping, TimestampFormat } from './mapping';
import { parseLoggerNumber } from './numbers';
import { createInstantTally } from './repeats';
import { cellWhat, dateTimeParser, formatInstant, formatOffset, refusal, timestampParser, type Refusal, type RepeatedTime, type TimestampResult } from './timestamps';
import { IMPORT_POLICY_TITLES, isDateFormat } from './mapping';

/** Bounds of a logged temperature in °C (the same bounds a round's temperature has). */
export const TEMPERATURE_RANGE_C = { min: -40, max: 90 } as const;
/** How far past "now" a timestamp may be before it counts as in the future (logger clocks drift), ms. */
export const FUTURE_TOLERANCE_MS = 5 * 60_000;

/** Which mapped column a problem is about ('timestamp' is the date column when the time of day has its own). */
export type ImportField = 'timestamp' | 'time' | 'value' | 'temperature';

/** One problem of one row: 1-based physical line where the record starts, the column, the cell text and why. */
export interface ImportProblem {
  line: number;
  field: ImportField;
  /** The column's header text, or "column N" (1-based) without a header row. */
  column: string;
  value: string;
  reason: string;
  /** The reason as a code of message area `checks` (imports.*) with its values, for screens in other languages. */
  problem: CheckProblem;
}

/** A remark on a row that was read, not refused: how a local time that occurs twice was read. */
export interface ImportNotice {
  line: number;
  field: ImportField;
  column: string;
  value: string;
  note: string;
  /** The note as a code of message area `checks` (imports.note.*) with its values. */
  problem: CheckProblem;
}

/** A good row: UTC instant (epoch ms), level in mm above the floor, volumes in L, temperature in °C or null. */
export interface ImportedReading {
  line: number;
  takenAtMs: number;
  levelMm: number;
  grossL: number;
  usableL: number;
  temperatureC: number | null;
}

/** What one record turned out to be. A fatal result (a mapped column is not in the file) ends the file. */
export type FeedResult =
  | { kind: 'blank'; line: number }
  | { kind: 'header'; line: number; columns: string[] }
  | { kind: 'reading'; reading: ImportedReading; notice?: ImportNotice }
  | { kind: 'rejected'; line: number; problems: ImportProblem[] }
  | ({ kind: 'fatal' } & Refusal);

/** Running counts of a file: data rows seen (blank lines and the header not included), rows refused, blank records skipped (the empty record after a final line break included), rows read with a notice. */
export interface ImportCounts {
  rows: number;
  rejected: number;
  blank: number;
  noticed: number;
}

/** Reads one file's records in order; `end()` says whether the file as a whole was usable. */
export interface ImportReader {
  feed(cells: readonly string[]): FeedResult;
  end(): { ok: true } | ({ ok: false } & Refusal);
  readonly counts: Readonly<ImportCounts>;
  /** Good rows whose instant an earlier good row of this file already had (each instant is stored once). */
  repeatedInFile(): number;
}

/** What a reader needs: the mapping, the tank's setup, and "now" in epoch ms (rows after it are refused). */
export interface ImportReaderOptions {
  mapping: ImportMapping;
  tank: TankSetup;
  nowMs: number;
  /** The record separator papaparse split at (its meta.linebreak); LF when left out, which also counts CRLF files right. */
  newline?: LineBreak;
  /** The zone moments in messages are shown in (the farm's); UTC when left out. */
  displayTimeZone?: string;
}

/** Why this mapping cannot be used with this tank at all (null when it can): e.g. distances need the sensor height. */
export function mappingProblem(mapping: ImportMapping, tank: TankSetup): { field: string; message: string; problem: CheckProblem } | null {
  if (mapping.value.kind === 'ultrasonic' && !(typeof tank.sensorHeightMm === 'number' && Number.isFinite(tank.sensorHeightMm))) {
    return {
      field: 'mapping.value.kind',
      message: "mapping.value.kind: distances from an ultrasonic sensor need the tank's sensor height (sensorHeightMm); set it on the tank first",
      problem: checkProblem('imports.mapping.needsSensorHeight'),
    };
  }
  return null;
}

interface Column {
  index: number;
  label: string;
  /** The label in a reason: the header text as it is, or "column N" said in the screens' language. */
  said: CheckParam;
}

const describeRef = (ref: ColumnRef) => (typeof ref === 'number' ? `column ${ref + 1} (index ${ref})` : `"${ref}"`);
const refProblem = (ref: ColumnRef) => (typeof ref === 'number' ? checkProblem('imports.column.number', { n: String(ref + 1), index: String(ref) }) : checkProblem('imports.column.name', { name: ref }));
/** What a mapped column is called at the start of a reason about it. */
const WHICH_WORDS = { timestamp: 'Timestamp', date: 'Date', time: 'Time', value: 'Value', temperature: 'Temperature' } as const;
const whichColumn = (which: keyof typeof WHICH_WORDS, bad: Refusal): Refusal =>
  refusal(`${WHICH_WORDS[which]} column: ${bad.reason}`, `column.which.${which}`, { detail: bad.problem });

/** A reader for one file. Throws RangeError only for a mapping that failed its schema (unknown zone or format). */
export function createImportReader({ mapping, tank, nowMs, newline = '\n', displayTimeZone = 'UTC' }: ImportReaderOptions): ImportReader {
  const ts = mapping.timestamp;
  const split = ts.time !== null && isDateFormat(ts.format);
  const parseOne = split ? null : timestampParser(ts.format as TimestampFormat, ts.timeZone);
  const parseTwo = split ? dateTimeParser(ts.format as DateFormat, ts.time!.format, ts.timeZone!) : null;
  const counts: ImportCounts = { rows: 0, rejected: 0, blank: 0, noticed: 0 };
  const tally = createInstantTally();
  /** The instant of the last row whose time was read: a repeated local time is read after it. */
  let previousMs: number | null = null;
  let nextLine = 1;
  let first = true;
  let header: string[] | null = null;
  let fatal: Refusal | null = null;
  let columns: { timestamp: Column; time: Column | null; value: Column; temperature: Column | null } | null = null;

  const resolve = (ref: ColumnRef, names: string[] | null): Column | Refusal => {
    if (typeof ref === 'number') {
      if (names && ref >= names.length) {
        return refusal(`The ${describeRef(ref)} is not in the file: the header row has ${names.length} column${names.length === 1 ? '' : 's'}`, names.length === 1 ? 'column.notInFileOne' : 'column.notInFileMany', {
          ref: refProblem(ref),
          count: String(names.length),
        });
      }
      const named = names?.[ref]?.trim();
      return { index: ref, label: named || `column ${ref + 1}`, said: named || checkProblem('imports.column.unnamed', { n: String(ref + 1) }) };
    }
    const want = ref.trim().toLowerCase();
    const index = (names ?? []).findIndex((n) => n.trim().toLowerCase() === want);
    if (index < 0) {
      const found = (names ?? []).map((n) => `"${n.trim()}"`).join(', ');
      return found
        ? refusal(`The column ${describeRef(ref)} is not in the header row (it has ${found})`, 'column.notInHeader', { ref: refProblem(ref), found })
        : refusal(`The column ${describeRef(ref)} is not in the header row (it has no names)`, 'column.notInHeaderNoNames', { ref: refProblem(ref) });
    }
    return { index, label: names![index].trim(), said: names![index].trim() };
  };

  const isRefusal = (r: Column | Refusal): r is Refusal => 'reason' in r;
  const resolveAll = (names: string[] | null): Refusal | null => {
    const stamp = resolve(ts.column, names);
    if (isRefusal(stamp)) return whichColumn(split ? 'date' : 'timestamp', stamp);
    let time: Column | null = null;
    if (split) {
      const t = resolve(ts.time!.column, names);
      if (isRefusal(t)) return whichColumn('time', t);
      time = t;
    }
    const value = resolve(mapping.value.column, names);
    if (isRefusal(value)) return whichColumn('value', value);
    let temperature: Column | null = null;
    if (mapping.temperature) {
      const t = resolve(mapping.temperature.column, names);
      if (isRefusal(t)) return whichColumn('temperature', t);
      temperature = t;
    }
    columns = { timestamp: stamp, time, value, temperature };
    return null;
  };
  if (!mapping.hasHeader) resolveAll(null);

  const { kind, unit } = mapping.value;
  const toInput = (v: number): ReadingInput =>
    kind === 'pressure'
      ? { kind: 'pressure', pressureKPa: toSI(v, unit as PressureUnit) }
      : kind === 'ultrasonic'
        ? { kind: 'ultrasonic', distanceMm: toSI(v, unit as LengthUnit) }
        : { kind: 'level', levelMm: toSI(v, unit as LengthUnit) };

  const zoneName = ts.timeZone ?? 'UTC';
  /** How a local time that occurs twice was read: the first time round unless the rows before it already reached it. */
  const pickRepeated = (rep: RepeatedTime, text: string, col: Column, field: ImportField, line: number): { ms: number; notice: ImportNotice } => {
    const second = previousMs !== null && previousMs >= rep.earlierMs;
    const ms = second ? rep.laterMs : rep.earlierMs;
    const how: 'second' | 'firstAlone' | 'firstAfterEarlier' = second ? 'second' : previousMs === null ? 'firstAlone' : 'firstAfterEarlier';
    const offset = second ? rep.laterOffsetMin : rep.earlierOffsetMin;
    const why =
      how === 'second'
        ? `read as the second time round (${formatOffset(offset)}), because the row before it is at or past the first`
        : how === 'firstAlone'
          ? `read as the first time round (${formatOffset(offset)}), as no row before it tells which`
          : `read as the first time round (${formatOffset(offset)}), because the row before it comes earlier`;
    // Both passes show the same wall-clock time, so the instant is said in UTC, which tells them apart.
    const note = `"${text}" happens twice in ${zoneName} (the clocks go back an hour that night); ${why}. It is stored as ${formatInstant(ms, 'UTC')} UTC.`;
    const problem = checkProblem(`imports.note.${how}`, { text, zone: zoneName, offset: formatOffset(offset), stored: moment(ms, 'UTC') });
    return { ms, notice: { line, field, column: col.label, value: text, note, problem } };
  };

  const readWhen = (
    cols: NonNullable<typeof columns>,
    cell: (c: Column, field: ImportField) => string | null,
    line: number,
    problems: ImportProblem[],
  ): { ms: number; notice?: ImportNotice } | null => {
    const dateText = cell(cols.timestamp, 'timestamp');
    const timeText = cols.time ? cell(cols.time, 'time') : '';
    if (dateText === null || timeText === null) return null;
    let r: TimestampResult;
    let field: ImportField = 'timestamp';
    let col = cols.timestamp;
    let text = dateText.trim();
    if (parseTwo && cols.time) {
      const two = parseTwo(dateText, timeText);
      text = `${dateText.trim()} ${timeText.trim()}`;
      if (!two.ok) {
        const bad = two.part === 'date' ? { field: 'timestamp' as const, col: cols.timestamp, value: dateText } : { field: 'time' as const, col: cols.time, value: timeText };
        problems.push({ line, field: bad.field, column: bad.col.label, value: bad.value, reason: two.reason, problem: two.problem });
        return null;
      }
      r = two;
      field = 'time';
      col = cols.time;
    } else r = parseOne!(dateText);
    const value = field === 'time' ? timeText : dateText;
    if (!r.ok) {
      problems.push({ line, field, column: col.label, value, reason: r.reason, problem: r.problem });
      return null;
    }
    let ms = r.ms;
    let notice: ImportNotice | undefined;
    if (r.repeated) ({ ms, notice } = pickRepeated(r.repeated, text, col, field, line));
    if (ms > nowMs + FUTURE_TOLERANCE_MS) {
      const what = cellWhat(split ? 'dateTime' : 'timestamp', text);
      const future = refusal(`${what.text} is in the future (after ${formatInstant(nowMs, displayTimeZone)}, the farm's time now)`, 'row.future', { what: what.problem, now: moment(nowMs, displayTimeZone) });
      problems.push({ line, field, column: col.label, value, ...future });
      return null;
    }
    previousMs = ms;
    return { ms, notice };
  };

  const readRow = (cells: readonly string[], line: number): FeedResult => {
    const cols = columns!;
    const problems: ImportProblem[] = [];
    const cell = (c: Column, field: ImportField): string | null => {
      if (c.index < cells.length) return cells[c.index];
      const missing = refusal(`Missing: the row has ${cells.length} field${cells.length === 1 ? '' : 's'}, so there is no ${c.label}`, cells.length === 1 ? 'row.missingOne' : 'row.missingMany', {
        count: String(cells.length),
        column: c.said,
      });
      problems.push({ line, field, column: c.label, value: '', ...missing });
      return null;
    };
    const when = readWhen(cols, cell, line, problems);
    const takenAtMs = when?.ms ?? NaN;
    const valueText = cell(cols.value, 'value');
    let volumes: { levelMm: number; grossL: number; usableL: number } | null = null;
    if (valueText !== null) {
      const n = parseLoggerNumber(valueText, mapping.decimalComma);
      if (!n.ok) problems.push({ line, field: 'value', column: cols.value.label, value: valueText, reason: n.reason, problem: n.problem });
      else {
        const r = readingToVolumes(tank, toInput(n.value));
        if (!r.ok) {
          const reading = refusal(`${valueText.trim()} ${unit}: ${r.reason}`, 'row.reading', { value: valueText.trim(), unit, detail: r.problem });
          problems.push({ line, field: 'value', column: cols.value.label, value: valueText, ...reading });
        }
        else volumes = { levelMm: r.levelMm, grossL: r.grossL, usableL: r.usableL };
      }
    }
    let temperatureC: number | null = null;
    if (cols.temperature && mapping.temperature) {
      const text = cells[cols.temperature.index];
      // A logger without a probe reading leaves the cell empty (or the record short): no temperature, not a bad row.
      if (text !== undefined && text.trim() !== '') {
        const n = parseLoggerNumber(text, mapping.decimalComma, 'Temperature');
        if (!n.ok) problems.push({ line, field: 'temperature', column: cols.temperature.label, value: text, reason: n.reason, problem: n.problem });
        else {
          const c = toSI(n.value, mapping.temperature.unit);
          if (c < TEMPERATURE_RANGE_C.min || c > TEMPERATURE_RANGE_C.max) {
            const range = refusal(`Temperature ${text.trim()} °${mapping.temperature.unit} is outside ${TEMPERATURE_RANGE_C.min} to ${TEMPERATURE_RANGE_C.max} °C`, 'row.temperatureRange', {
              value: text.trim(),
              unit: `°${mapping.temperature.unit}`,
              min: String(TEMPERATURE_RANGE_C.min),
              max: String(TEMPERATURE_RANGE_C.max),
            });
            problems.push({ line, field: 'temperature', column: cols.temperature.label, value: text, ...range });
          } else temperatureC = c;
        }
      }
    }
    if (problems.length || !volumes || !when) return { kind: 'rejected', line, problems };
    tally.add(takenAtMs);
    if (when.notice) counts.noticed++;
    return { kind: 'reading', reading: { line, takenAtMs, ...volumes, temperatureC }, ...(when.notice ? { notice: when.notice } : {}) };
  };

  const feed = (raw: readonly string[]): FeedResult => {
    if (fatal) return { kind: 'fatal', ...fatal };
    let cells = raw;
    const atStart = first;
    if (first) {
      first = false;
      if (cells.length) cells = [stripBom(cells[0]), ...cells.slice(1)];
    }
    const line = nextLine;
    nextLine += 1 + lineBreaksInside(cells, newline, atStart);
    if (isBlankRow(cells)) {
      counts.blank++;
      return { kind: 'blank', line };
    }
    if (mapping.hasHeader && !header) {
      header = cells.map((c) => c.trim());
      const bad = resolveAll(header);
      if (bad) {
        fatal = bad;
        return { kind: 'fatal', ...bad };
      }
      return { kind: 'header', line, columns: header };
    }
    counts.rows++;
    const r = readRow(cells, line);
    if (r.kind === 'rejected') counts.rejected++;
    return r;
  };

  const end = (): { ok: true } | ({ ok: false } & Refusal) => {
    if (fatal) return { ok: false, ...fatal };
    if (counts.rows > 0) return { ok: true };
    if (mapping.hasHeader && header) return { ok: false, ...refusal('The file has a header row but no data rows: nothing to import', 'file.headerOnly') };
    return { ok: false, ...refusal('The file is empty: it has no rows to import', 'file.empty') };
  };

  return { feed, end, counts, repeatedInFile: () => tally.repeated() };
}

/** Why a file was refused under 'reject-file': how many rows are bad, in the policy's own words. */
export function refusedFileReason(rejected: number, rows: number): string {
  return `${rejected.toLocaleString('en-GB')} of ${rows.toLocaleString('en-GB')} rows have problems, so nothing from this file was stored ("${IMPORT_POLICY_TITLES['reject-file']}" was chosen)`;
}
