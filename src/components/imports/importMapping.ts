// The column-mapping form's own state (a draft that may be half filled in), the mapping it builds
// for the server, and a first guess from a file's first rows so a new logger needs few clicks.
import {
  DATE_FORMATS,
  dateCellParser,
  importMappingSchema,
  isDateFormat,
  mappingProblem,
  needsTimeZone,
  parseLoggerNumber,
  timeCellParser,
  timestampParser,
  TIME_FORMATS,
  TIMESTAMP_FORMATS,
  type ColumnRef,
  type DateFormat,
  type Delimiter,
  type ImportMapping,
  type TimeFormat,
  type TimestampFormat,
  type ValueKind,
} from '@shared/imports';
import type { TankSetup } from '@shared/readings';
import { fieldErrors } from '@shared/schemas';
import { LENGTH_UNITS, PRESSURE_UNITS, type LengthUnit, type PressureUnit, type TemperatureUnit } from '@shared/units';
import { i18n, sayError } from '@/i18n';
import { checkMessage } from '@/i18n/checkMessage';

/** What the form holds: every choice, a column left empty as null. */
export interface MappingDraft {
  delimiter: Delimiter;
  decimalComma: boolean;
  hasHeader: boolean;
  /** The column with the date and time, or with the date only when the layout is a date layout. */
  timestampColumn: ColumnRef | null;
  timestampFormat: TimestampFormat | DateFormat | null;
  /** The time-of-day column of a file that writes the date and the time in two columns (used with a date layout only). */
  timeColumn: ColumnRef | null;
  timeFormat: TimeFormat;
  timeZone: string;
  valueColumn: ColumnRef | null;
  valueKind: ValueKind;
  valueUnit: LengthUnit | PressureUnit;
  /** null: the file has no temperature column (or it is not wanted). */
  temperatureColumn: ColumnRef | null;
  temperatureUnit: TemperatureUnit;
}

/** Form fields that can carry an error, as the schema's dotted paths name them. */
export const MAPPING_FIELDS = [
  'delimiter',
  'decimalComma',
  'hasHeader',
  'timestamp.column',
  'timestamp.format',
  'timestamp.timeZone',
  'timestamp.time.column',
  'timestamp.time.format',
  'value.column',
  'value.kind',
  'value.unit',
  'temperature.column',
  'temperature.unit',
] as const;
export type MappingField = (typeof MAPPING_FIELDS)[number];

/** A form with nothing chosen yet; local timestamps default to `timeZone` (the farm's). */
export function emptyDraft(timeZone: string): MappingDraft {
  return {
    delimiter: 'auto',
    decimalComma: false,
    hasHeader: true,
    timestampColumn: null,
    timestampFormat: null,
    timeColumn: null,
    timeFormat: 'HH:mm:ss',
    timeZone,
    valueColumn: null,
    valueKind: 'level',
    valueUnit: 'mm',
    temperatureColumn: null,
    temperatureUnit: 'C',
  };
}

/** The form filled in from a saved mapping; an ISO 8601 mapping keeps `fallbackTimeZone` ready in case the format is changed. */
export function draftFromMapping(mapping: ImportMapping, fallbackTimeZone: string): MappingDraft {
  return {
    delimiter: mapping.delimiter,
    decimalComma: mapping.decimalComma,
    hasHeader: mapping.hasHeader,
    timestampColumn: mapping.timestamp.column,
    timestampFormat: mapping.timestamp.format,
    timeColumn: mapping.timestamp.time?.column ?? null,
    timeFormat: mapping.timestamp.time?.format ?? 'HH:mm:ss',
    timeZone: mapping.timestamp.timeZone || fallbackTimeZone,
    valueColumn: mapping.value.column,
    valueKind: mapping.value.kind,
    valueUnit: mapping.value.unit,
    temperatureColumn: mapping.temperature?.column ?? null,
    temperatureUnit: mapping.temperature?.unit ?? 'C',
  };
}

/** The units that fit what the value column measures. */
export function unitsFor(kind: ValueKind): readonly (LengthUnit | PressureUnit)[] {
  return kind === 'pressure' ? PRESSURE_UNITS : LENGTH_UNITS;
}

/** The draft as the mapping JSON the server parses (before the schema's check). */
export function mappingInputOf(d: MappingDraft) {
  return {
    delimiter: d.delimiter,
    decimalComma: d.decimalComma,
    hasHeader: d.hasHeader,
    timestamp: {
      column: d.timestampColumn,
      format: d.timestampFormat,
      ...(d.timestampFormat && needsTimeZone(d.timestampFormat) ? { timeZone: d.timeZone } : {}),
      time: d.timestampFormat && isDateFormat(d.timestampFormat) ? { column: d.timeColumn, format: d.timeFormat } : null,
    },
    value: { column: d.valueColumn, kind: d.valueKind, unit: d.valueUnit },
    temperature: d.temperatureColumn === null ? null : { column: d.temperatureColumn, unit: d.temperatureUnit },
  };
}

export type BuiltMapping = { ok: true; mapping: ImportMapping } | { ok: false; errors: Partial<Record<MappingField, string>> };

/**
 * The mapping the draft makes, checked by the shared schema and, when the tank is known, against the
 * tank's setup (distances need a sensor height); otherwise a message per form field.
 */
export function buildMapping(d: MappingDraft, tank: TankSetup | null): BuiltMapping {
  const errors: Partial<Record<MappingField, string>> = {};
  const t = (key: string) => i18n.global.t(`imports.mapping.errors.${key}`);
  if (d.timestampColumn === null) errors['timestamp.column'] = t('timestampColumn');
  if (d.timestampFormat === null) errors['timestamp.format'] = t('timestampFormat');
  if (d.timestampFormat !== null && isDateFormat(d.timestampFormat) && d.timeColumn === null) errors['timestamp.time.column'] = t('timeColumn');
  if (d.valueColumn === null) errors['value.column'] = t('valueColumn');
  if (Object.keys(errors).length) return { ok: false, errors };
  const parsed = importMappingSchema.safeParse(mappingInputOf(d));
  if (!parsed.success) {
    for (const [path, message] of Object.entries(fieldErrors(parsed.error))) {
      const field =
        MAPPING_FIELDS.find((f) => path === f || path.startsWith(`${f}.`)) ??
        (path === 'timestamp.time' ? 'timestamp.time.column' : path.split('.')[0] === 'temperature' ? 'temperature.column' : undefined);
      // The schema writes English; the catalogue (area errors) says what it knows in the screens' language.
      if (field) errors[field] ??= sayError(message);
      else errors['value.column'] ??= `${path}: ${sayError(message)}`;
    }
    return { ok: false, errors };
  }
  const problem = tank ? mappingProblem(parsed.data, tank) : null;
  if (problem) return { ok: false, errors: { 'value.kind': checkMessage(problem.problem) } };
  return { ok: true, mapping: parsed.data };
}

/** One choice of the column selects. */
export interface ColumnOption {
  value: ColumnRef;
  label: string;
}

function uniqueNames(header: readonly string[]): Set<string> {
  const seen = new Map<string, number>();
  for (const name of header) {
    const key = name.trim().toLowerCase();
    if (key) seen.set(key, (seen.get(key) ?? 0) + 1);
  }
  return new Set([...seen].filter(([, n]) => n === 1).map(([k]) => k));
}

/**
 * Choices for a column select. With a header row a column is named by its header text (so a logger
 * that adds a column later still maps), unless the name is empty or repeated; otherwise by number.
 */
export function columnOptions(header: readonly string[] | null, width: number): ColumnOption[] {
  const unique = header ? uniqueNames(header) : new Set<string>();
  const out: ColumnOption[] = [];
  for (let i = 0; i < width; i++) {
    const name = header?.[i]?.trim() ?? '';
    const byName = name !== '' && unique.has(name.toLowerCase());
    const label = name ? i18n.global.t('imports.mapping.columnNamed', { name, n: i + 1 }) : i18n.global.t('imports.mapping.column', { n: i + 1 });
    out.push({ value: byName ? name : i, label });
  }
  return out;
}

/** The 0-based index a column reference points at in `header`, or null when it is not there. */
export function columnIndex(ref: ColumnRef | null, header: readonly string[] | null): number | null {
  if (ref === null) return null;
  if (typeof ref === 'number') return ref;
  const want = ref.trim().toLowerCase();
  const i = (header ?? []).findIndex((h) => h.trim().toLowerCase() === want);
  return i < 0 ? null : i;
}

/** A reference re-expressed after the header-row switch changed, keeping the same physical column. */
export function rebaseColumn(ref: ColumnRef | null, header: readonly string[] | null, hasHeader: boolean, width: number): ColumnRef | null {
  const index = columnIndex(ref, header);
  if (index === null) return hasHeader ? ref : null;
  const options = columnOptions(hasHeader ? header : null, Math.max(width, index + 1));
  return options[index]?.value ?? index;
}

// Header words loggers commonly print (common practice, no published source).
const TEMPERATURE_RE = /temp|°\s*[cf]\b|deg\s*[cf]\b|celsius|fahrenheit/i;
const FAHRENHEIT_RE = /°\s*f\b|deg\s*f\b|fahrenheit|\(f\)|_f\b/i;
// Distance down from a sensor: named as such, or as the space above the liquid, or "to the water".
const DISTANCE_RE = /dist|ultra|sonic|sonar|radar|air\s*gap|ullage|range|freeboard|head\s*space|empty|\bto\s+(the\s+)?(water|liquid|surface)|from\s+(the\s+)?(top|sensor)|abstand|afstand/i;
const PRESSURE_RE = /press|kpa|\bbar\b|psi|h2o|head/i;
const VALUE_RE = /level|depth|height|dist|press|head|range|stage|ullage|gap|abstand|afstand|sonic|sonar|radar/i;
const UTC_RE = /\butc\b|_utc\b|\bgmt\b|\(z\)/i;

function unitFromHeader(name: string, kind: ValueKind): LengthUnit | PressureUnit {
  const n = name.toLowerCase();
  if (kind === 'pressure') {
    if (/kpa/.test(n)) return 'kPa';
    if (/\bbar\b|\(bar\)|_bar\b/.test(n)) return 'bar';
    if (/psi/.test(n)) return 'psi';
    if (/inh2o|in\s*h2o|in\.?\s*wc/.test(n)) return 'inH2O';
    if (/mh2o|m\s*h2o|mwc/.test(n)) return 'mH2O';
    return 'kPa';
  }
  if (/\bmm\b|\(mm\)|_mm\b/.test(n)) return 'mm';
  if (/\bcm\b|\(cm\)|_cm\b/.test(n)) return 'cm';
  if (/\bin\b|\(in\)|_in\b|inch/.test(n)) return 'in';
  if (/\bft\b|\(ft\)|_ft\b|feet/.test(n)) return 'ft';
  if (/\bm\b|\(m\)|_m\b|metre|meter/.test(n)) return 'm';
  return 'mm';
}

const isBlank = (cells: readonly string[]) => cells.every((c) => c.trim() === '');

/**
 * A first guess at the mapping from the first records of a file (as papaparse split them): header row
 * or not, the timestamp column and layout that read the most rows, the first mostly numeric column as the
 * value (a header naming a level, distance or pressure wins), a temperature column by its header.
 * Keeps `base`'s delimiter and time zone.
 */
export function guessDraft(records: readonly (readonly string[])[], base: MappingDraft): MappingDraft {
  const rows = records.filter((r) => !isBlank(r));
  if (!rows.length) return base;
  const zone = base.timeZone || 'UTC';
  const parsers = TIMESTAMP_FORMATS.map((format) => ({ format, parse: timestampParser(format, zone) }));
  const isTime = (cell: string) => parsers.some((p) => p.parse(cell).ok);
  const first = rows[0];
  const hasHeader = !first.some((c) => isTime(c) || parseLoggerNumber(c, false).ok || parseLoggerNumber(c, true).ok);
  const header = hasHeader ? first.map((c) => c.trim()) : null;
  const data = hasHeader ? rows.slice(1) : rows;
  const width = Math.max(0, ...rows.map((r) => r.length));
  const options = columnOptions(header, width);
  const cellsOf = (i: number) => data.map((r) => r[i] ?? '').filter((c) => c.trim() !== '');

  let best: { column: number; format: TimestampFormat; hits: number } | null = null;
  for (let i = 0; i < width; i++) {
    const cells = cellsOf(i);
    for (const { format, parse } of parsers) {
      const hits = cells.filter((c) => parse(c).ok).length;
      if (hits > 0 && (!best || hits > best.hits)) best = { column: i, format, hits };
    }
  }

  // A date column and a time column beside it: used when that pair reads more rows than any one column.
  const dateParsers = DATE_FORMATS.map((format) => ({ format, parse: dateCellParser(format) }));
  const timeParsers = TIME_FORMATS.map((format) => ({ format, parse: timeCellParser(format) }));
  const bestOf = <F extends string>(list: { format: F; parse: (t: string) => { ok: boolean } }[], skip: number | null) => {
    let top: { column: number; format: F; hits: number } | null = null;
    for (let i = 0; i < width; i++) {
      if (i === skip) continue;
      const cells = cellsOf(i);
      for (const { format, parse } of list) {
        const hits = cells.filter((c) => parse(c).ok).length;
        if (hits > 0 && (!top || hits > top.hits)) top = { column: i, format, hits };
      }
    }
    return top;
  };
  const dateCol = bestOf(dateParsers, null);
  const timeCol = dateCol ? bestOf(timeParsers, dateCol.column) : null;
  const split = dateCol && timeCol && Math.min(dateCol.hits, timeCol.hits) > (best?.hits ?? 0) ? { date: dateCol, time: timeCol } : null;
  const stampColumns = new Set(split ? [split.date.column, split.time.column] : best ? [best.column] : []);

  const decimalComma = base.delimiter !== ',' && data.some((r) => r.some((c) => /^[+-]?\d+,\d+$/.test(c.trim())));
  const numeric: number[] = [];
  for (let i = 0; i < width; i++) {
    if (stampColumns.has(i)) continue;
    const cells = cellsOf(i);
    // Most, not all: a logger writes ERR or similar now and then, and that column is still the reading.
    const ok = cells.filter((c) => parseLoggerNumber(c, decimalComma).ok).length;
    if (cells.length && ok / cells.length >= 0.6) numeric.push(i);
  }
  const nameOf = (i: number) => header?.[i] ?? '';
  const temperature = numeric.find((i) => TEMPERATURE_RE.test(nameOf(i))) ?? null;
  const candidates = numeric.filter((i) => i !== temperature);
  const value = candidates.find((i) => DISTANCE_RE.test(nameOf(i)) || VALUE_RE.test(nameOf(i))) ?? candidates[0] ?? null;
  const valueName = value === null ? '' : nameOf(value);
  const valueKind: ValueKind = DISTANCE_RE.test(valueName) ? 'ultrasonic' : PRESSURE_RE.test(valueName) ? 'pressure' : 'level';

  // A local layout in a column headed "UTC" is UTC wall-clock time, whatever the farm's zone.
  const stampNames = [...stampColumns].map(nameOf);
  const timeZone = stampNames.some((n) => UTC_RE.test(n)) ? 'UTC' : base.timeZone;

  return {
    ...base,
    timeZone,
    decimalComma,
    hasHeader,
    timestampColumn: split ? options[split.date.column].value : best ? options[best.column].value : null,
    timestampFormat: split ? split.date.format : (best?.format ?? null),
    timeColumn: split ? options[split.time.column].value : null,
    timeFormat: split ? split.time.format : base.timeFormat,
    valueColumn: value === null ? null : options[value].value,
    valueKind,
    valueUnit: unitFromHeader(valueName, valueKind),
    temperatureColumn: temperature === null ? null : options[temperature].value,
    temperatureUnit: temperature !== null && FAHRENHEIT_RE.test(nameOf(temperature)) ? 'F' : 'C',
  };
}
