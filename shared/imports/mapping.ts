// The column mapping of a logger file: which column holds the time (or the date and, beside it, the
// time of day), the value and the temperature, what the value means and in which unit, and how the text
// is laid out.
// The browser builds it from the first rows; the server parses every row with it.
import { z } from 'zod';
import { isTimeZone } from '../schemas/farms';
import { LENGTH_UNITS, PRESSURE_UNITS, TEMPERATURE_UNITS } from '../units/index';

/** Timestamp layouts a logger file may use: ISO 8601 with its UTC offset, or local wall-clock patterns read in a time zone. */
export const TIMESTAMP_FORMATS = [
  'iso8601',
  'YYYY-MM-DD HH:mm:ss',
  'YYYY-MM-DD HH:mm',
  'DD/MM/YYYY HH:mm:ss',
  'DD/MM/YYYY HH:mm',
  'MM/DD/YYYY HH:mm:ss',
  'MM/DD/YYYY HH:mm',
  'DD.MM.YYYY HH:mm:ss',
  'DD.MM.YYYY HH:mm',
] as const;
/** A timestamp layout name. */
export type TimestampFormat = (typeof TIMESTAMP_FORMATS)[number];

/** Date-only layouts, for a file that writes the date in one column and the time of day in the next. */
export const DATE_FORMATS = ['YYYY-MM-DD', 'DD/MM/YYYY', 'MM/DD/YYYY', 'DD.MM.YYYY'] as const;
/** A date-only layout name. */
export type DateFormat = (typeof DATE_FORMATS)[number];

/** Time-of-day layouts of a separate time column: 24-hour, or 12-hour with AM/PM. */
export const TIME_FORMATS = ['HH:mm:ss', 'HH:mm', 'hh:mm:ss AM/PM', 'hh:mm AM/PM'] as const;
/** A time-of-day layout name. */
export type TimeFormat = (typeof TIME_FORMATS)[number];

/** True when a layout is a date only, so a time column must go with it (returns a boolean). */
export const isDateFormat = (format: string): format is DateFormat => (DATE_FORMATS as readonly string[]).includes(format);

/** True when a timestamp or date layout carries no offset, so it needs an IANA time zone (returns a boolean). */
export const needsTimeZone = (format: TimestampFormat | DateFormat): boolean => format !== 'iso8601';

/** What a logger's value column measures: level above the floor, distance down from the sensor, or gauge pressure at the sensor. */
export const VALUE_KINDS = ['level', 'ultrasonic', 'pressure'] as const;
/** A value kind (the matching reading kinds of shared/readings). */
export type ValueKind = (typeof VALUE_KINDS)[number];

/** Field separators: 'auto' guesses from the first lines among the other three. */
export const DELIMITERS = ['auto', ',', ';', '\t'] as const;
/** A field separator choice. */
export type Delimiter = (typeof DELIMITERS)[number];

/** What to do with a file that has bad rows: import nothing, or import the good rows and report the bad. */
export const IMPORT_POLICIES = ['reject-file', 'valid-rows'] as const;
/** An import policy name. */
export type ImportPolicy = (typeof IMPORT_POLICIES)[number];

/** The one wording of each policy, used by the choice on the form, the result and the server's messages alike. */
export const IMPORT_POLICY_TITLES: Record<ImportPolicy, string> = {
  'reject-file': 'Refuse the whole file if any row is bad',
  'valid-rows': 'Import the good rows, list the bad ones',
};

/** Largest 0-based column index a mapping may name (files wider than this are not logger exports). */
export const MAX_COLUMN_INDEX = 499;

/** A column: its 0-based position, or its header text (needs a header row; matched trimmed and case-insensitively). */
const columnRef = z.union(
  [z.number().int('must be a whole column number').min(0, 'column numbers start at 0').max(MAX_COLUMN_INDEX, `must be at most ${MAX_COLUMN_INDEX}`), z.string().trim().min(1, 'give the column name or number').max(100, 'At most 100 characters')],
  { error: 'give the column as its 0-based number or its header name' },
);
/** A column reference: 0-based index or header name. */
export type ColumnRef = z.infer<typeof columnRef>;

const VALUE_UNITS = [...LENGTH_UNITS, ...PRESSURE_UNITS] as const;

/** The column mapping of a logger file (sent as JSON with each upload, saved per tank after a successful import). */
export const importMappingSchema = z
  .object(
    {
      delimiter: z.enum(DELIMITERS, { error: "must be 'auto', ',', ';' or a tab" }).default('auto'),
      /** Numbers are written 12,5 rather than 12.5. */
      decimalComma: z.boolean({ error: 'must be true or false' }).default(false),
      /** The first non-blank line names the columns. */
      hasHeader: z.boolean({ error: 'must be true or false' }).default(true),
      timestamp: z.object(
        {
          /** The column with the date and time, or with the date only when `time` names the time column. */
          column: columnRef,
          format: z.enum([...TIMESTAMP_FORMATS, ...DATE_FORMATS], { error: `must be one of ${[...TIMESTAMP_FORMATS, ...DATE_FORMATS].join(', ')}` }),
          /** IANA zone of the logger's clock; required for the local patterns, ignored for ISO 8601. */
          timeZone: z.string().trim().max(64).optional(),
          /** The time-of-day column and its layout, for a file that writes the date and the time in two columns. */
          time: z
            .object({ column: columnRef, format: z.enum(TIME_FORMATS, { error: `must be one of ${TIME_FORMATS.join(', ')}` }) }, { error: 'give the time column and its layout, or null' })
            .nullable()
            .default(null),
        },
        { error: 'give the timestamp column and its format' },
      ),
      value: z.object(
        {
          column: columnRef,
          kind: z.enum(VALUE_KINDS, { error: "must be 'level', 'ultrasonic' or 'pressure'" }),
          unit: z.enum(VALUE_UNITS, { error: `must be one of ${VALUE_UNITS.join(', ')}` }),
        },
        { error: 'give the value column, what it measures and its unit' },
      ),
      temperature: z
        .object({ column: columnRef, unit: z.enum(TEMPERATURE_UNITS, { error: "must be 'C' or 'F'" }) }, { error: 'give the temperature column and unit, or null' })
        .nullable()
        .default(null),
    },
    { error: 'give the column mapping as a JSON object' },
  )
  .superRefine((m, ctx) => {
    const ts = m.timestamp;
    if (isDateFormat(ts.format) && !ts.time) ctx.addIssue({ code: 'custom', path: ['timestamp', 'time'], message: `${ts.format} is a date only: give the column with the time of day and its layout` });
    if (!isDateFormat(ts.format) && ts.time) ctx.addIssue({ code: 'custom', path: ['timestamp', 'format'], message: `${ts.format} has the time in it already: pick a date-only layout for a separate time column, or no time column` });
    if (needsTimeZone(ts.format)) {
      if (!ts.timeZone) ctx.addIssue({ code: 'custom', path: ['timestamp', 'timeZone'], message: `${ts.format} has no UTC offset: give the IANA time zone of the logger's clock (e.g. Europe/Dublin)` });
      else if (!isTimeZone(ts.timeZone)) ctx.addIssue({ code: 'custom', path: ['timestamp', 'timeZone'], message: `"${ts.timeZone}" is not a known IANA time zone` });
    }
    const lengthUnit = (LENGTH_UNITS as readonly string[]).includes(m.value.unit);
    if (m.value.kind === 'pressure' && lengthUnit) ctx.addIssue({ code: 'custom', path: ['value', 'unit'], message: `a pressure needs a pressure unit (${PRESSURE_UNITS.join(', ')})` });
    if (m.value.kind !== 'pressure' && !lengthUnit) ctx.addIssue({ code: 'custom', path: ['value', 'unit'], message: `a ${m.value.kind === 'level' ? 'level' : 'distance'} needs a length unit (${LENGTH_UNITS.join(', ')})` });
    const refs: [string, ColumnRef][] = [
      ['timestamp', ts.column],
      ...(ts.time ? ([['timestamp.time', ts.time.column]] as [string, ColumnRef][]) : []),
      ['value', m.value.column],
      ...(m.temperature ? ([['temperature', m.temperature.column]] as [string, ColumnRef][]) : []),
    ];
    for (const [field, ref] of refs) {
      if (typeof ref === 'string' && !m.hasHeader) ctx.addIssue({ code: 'custom', path: [...field.split('.'), 'column'], message: 'a column name needs a header row: give the 0-based column number instead' });
    }
    const key = (r: ColumnRef) => (typeof r === 'number' ? `#${r}` : r.toLowerCase());
    for (let i = 1; i < refs.length; i++) {
      const clash = refs.slice(0, i).find(([, r]) => key(r) === key(refs[i][1]));
      if (clash) ctx.addIssue({ code: 'custom', path: [...refs[i][0].split('.'), 'column'], message: `is the same column as the ${clash[0] === 'timestamp.time' ? 'time' : clash[0] === 'timestamp' && ts.time ? 'date' : clash[0]}` });
    }
  });
/** A parsed column mapping. */
export type ImportMapping = z.output<typeof importMappingSchema>;
/** A column mapping as sent (defaults may be left out). */
export type ImportMappingInput = z.input<typeof importMappingSchema>;
