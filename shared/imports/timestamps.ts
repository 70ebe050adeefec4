// Logger timestamps → UTC instants. ISO 8601 carries its own offset; the local layouts are wall-clock
// times in an IANA time zone, whose offsets come from @date-fns/tz (the runtime's time-zone database).
//
// Daylight saving, where a wall-clock time is not one instant:
// - a local time that never occurs (clocks go forward, e.g. Europe/Madrid 29 Mar 2026 02:00→03:00) is
//   refused with the reason; it is never moved onto another instant;
// - a local time that occurs twice (clocks go back, e.g. Europe/Madrid 25 Oct 2026 03:00→02:00) comes back
//   with both instants, and the row reader picks one by the order of the rows (see rows.ts), saying so.
import { tzOffset, tzScan } from '@date-fns/tz';
import { checkProblem, moment, type CheckProblem } from '../check-problems';
import type { DateFormat, TimeFormat, TimestampFormat } from './mapping';

/** A local time that occurs twice: both UTC instants (epoch ms) and the offsets (minutes east of UTC) they are read with. */
export interface RepeatedTime {
  earlierMs: number;
  laterMs: number;
  earlierOffsetMin: number;
  laterOffsetMin: number;
}

/** A parsed timestamp: epoch milliseconds (UTC; for a repeated local time the earlier one, with both in `repeated`), or why the text is not one. */
export type TimestampResult = { ok: true; ms: number; repeated?: RepeatedTime } | ({ ok: false } & Refusal);

/** Which of the two cells of a split date and time a problem is about. */
export type DateTimePart = 'date' | 'time';

/** A parsed date cell plus time cell, or why not and in which of the two cells. */
export type DateTimeResult = { ok: true; ms: number; repeated?: RepeatedTime } | ({ ok: false; part: DateTimePart } & Refusal);

/** Why a cell was refused: in English (`reason`, the API's) and as a code of message area `checks` (imports.*) with its values. */
export interface Refusal {
  reason: string;
  problem: CheckProblem;
}

/** What a reason is about, in English and as a code: `Timestamp "…"`, `Date "…"`, `Time "…"`, `Date and time "…"`. */
export interface CellWhat {
  text: string;
  problem: CheckProblem;
}

const WHAT_WORDS = { timestamp: 'Timestamp', date: 'Date', time: 'Time', dateTime: 'Date and time' } as const;

/** The cell `text` of kind `kind`, as reasons name it. */
export function cellWhat(kind: keyof typeof WHAT_WORDS, text: string): CellWhat {
  return { text: `${WHAT_WORDS[kind]} "${text}"`, problem: checkProblem(`imports.what.${kind}`, { text }) };
}

/** A refusal: `reason` in English and `code` (under imports.) with its values. */
export function refusal(reason: string, code: string, params: CheckProblem['params'] = {}): Refusal {
  return { reason, problem: checkProblem(`imports.${code}`, params) };
}

/** Earliest year accepted: time-zone data before 1970 is patchy, and no logger file reaches that far back. */
export const MIN_TIMESTAMP_YEAR = 1970;

const MINUTE_MS = 60_000;
const DAY_MS = 86_400_000;

interface DateFields {
  year: number;
  month: number;
  day: number;
}
interface TimeFields {
  hour: number;
  minute: number;
  second: number;
  ms: number;
}
type Fields = DateFields & TimeFields;

type Order = 'ymd' | 'dmy' | 'mdy';

const DATE_PART: Record<Order, string> = { ymd: '(\\d{4})-(\\d{1,2})-(\\d{1,2})', dmy: '(\\d{1,2})\\/(\\d{1,2})\\/(\\d{4})', mdy: '(\\d{1,2})\\/(\\d{1,2})\\/(\\d{4})' };
const DOT_DATE = '(\\d{1,2})\\.(\\d{1,2})\\.(\\d{4})';

const LOCAL_PATTERNS: Record<Exclude<TimestampFormat, 'iso8601'>, { re: RegExp; order: Order; seconds: boolean }> = {
  'YYYY-MM-DD HH:mm:ss': { re: new RegExp(`^${DATE_PART.ymd}[T ]+(\\d{1,2}):(\\d{2}):(\\d{2})$`), order: 'ymd', seconds: true },
  'YYYY-MM-DD HH:mm': { re: new RegExp(`^${DATE_PART.ymd}[T ]+(\\d{1,2}):(\\d{2})$`), order: 'ymd', seconds: false },
  'DD/MM/YYYY HH:mm:ss': { re: new RegExp(`^${DATE_PART.dmy} +(\\d{1,2}):(\\d{2}):(\\d{2})$`), order: 'dmy', seconds: true },
  'DD/MM/YYYY HH:mm': { re: new RegExp(`^${DATE_PART.dmy} +(\\d{1,2}):(\\d{2})$`), order: 'dmy', seconds: false },
  'MM/DD/YYYY HH:mm:ss': { re: new RegExp(`^${DATE_PART.mdy} +(\\d{1,2}):(\\d{2}):(\\d{2})$`), order: 'mdy', seconds: true },
  'MM/DD/YYYY HH:mm': { re: new RegExp(`^${DATE_PART.mdy} +(\\d{1,2}):(\\d{2})$`), order: 'mdy', seconds: false },
  'DD.MM.YYYY HH:mm:ss': { re: new RegExp(`^${DOT_DATE} +(\\d{1,2}):(\\d{2}):(\\d{2})$`), order: 'dmy', seconds: true },
  'DD.MM.YYYY HH:mm': { re: new RegExp(`^${DOT_DATE} +(\\d{1,2}):(\\d{2})$`), order: 'dmy', seconds: false },
};

const DATE_PATTERNS: Record<DateFormat, { re: RegExp; order: Order }> = {
  'YYYY-MM-DD': { re: new RegExp(`^${DATE_PART.ymd}$`), order: 'ymd' },
  'DD/MM/YYYY': { re: new RegExp(`^${DATE_PART.dmy}$`), order: 'dmy' },
  'MM/DD/YYYY': { re: new RegExp(`^${DATE_PART.mdy}$`), order: 'mdy' },
  'DD.MM.YYYY': { re: new RegExp(`^${DOT_DATE}$`), order: 'dmy' },
};

const TIME_PATTERNS: Record<TimeFormat, { re: RegExp; twelveHour: boolean }> = {
  'HH:mm:ss': { re: /^(\d{1,2}):(\d{2}):(\d{2})(?:[.,](\d{1,3}))?$/, twelveHour: false },
  'HH:mm': { re: /^(\d{1,2}):(\d{2})()$/, twelveHour: false },
  'hh:mm:ss AM/PM': { re: /^(\d{1,2}):(\d{2}):(\d{2})()\s*([AaPp])\.?\s*[Mm]\.?$/, twelveHour: true },
  'hh:mm AM/PM': { re: /^(\d{1,2}):(\d{2})()()\s*([AaPp])\.?\s*[Mm]\.?$/, twelveHour: true },
};

// Date and time, then Z or an offset of ±HH:MM, ±HHMM or ±HH (ISO 8601-1:2019 §4.3.13; RFC 3339 §5.6 allows the space).
const ISO_RE = /^(\d{4})-(\d{2})-(\d{2})[Tt ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?(?:([Zz])|([+-])(\d{2})(?::?(\d{2}))?)$/;

/** Days in a month (1–12) of a proleptic Gregorian year. */
export function daysInMonth(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

const pad2 = (n: number) => String(n).padStart(2, '0');

function checkDate(f: DateFields, what: CellWhat): Refusal | null {
  const w = what.problem;
  if (f.year < MIN_TIMESTAMP_YEAR) return refusal(`${what.text} is before ${MIN_TIMESTAMP_YEAR}: check the logger's clock`, 'cell.beforeYear', { what: w, year: String(MIN_TIMESTAMP_YEAR) });
  if (f.month < 1 || f.month > 12) return refusal(`${what.text}: month ${f.month} does not exist`, 'cell.noMonth', { what: w, month: String(f.month) });
  const dim = daysInMonth(f.year, f.month);
  if (f.day < 1 || f.day > dim) {
    const yearMonth = `${f.year}-${pad2(f.month)}`;
    return refusal(`${what.text}: day ${f.day} does not exist in ${yearMonth} (it has ${dim} days)`, 'cell.noDay', { what: w, day: String(f.day), yearMonth, days: String(dim) });
  }
  return null;
}

function checkTime(f: TimeFields, what: CellWhat): Refusal | null {
  const w = what.problem;
  if (f.hour > 23) return refusal(`${what.text}: hour ${f.hour} is not 0–23`, 'cell.hour', { what: w, hour: String(f.hour) });
  if (f.minute > 59) return refusal(`${what.text}: minute ${f.minute} is not 0–59`, 'cell.minute', { what: w, minute: String(f.minute) });
  if (f.second > 59) return refusal(`${what.text}: second ${f.second} is not 0–59`, 'cell.second', { what: w, second: String(f.second) });
  return null;
}

/** Milliseconds since the epoch of a wall-clock time read as if it were UTC (valid years ≥ 1970 only). */
function wallMs(f: Fields): number {
  return Date.UTC(f.year, f.month - 1, f.day, f.hour, f.minute, f.second, f.ms);
}

const dateTimeStyle = new Map<string, Intl.DateTimeFormat>();

/**
 * An instant (epoch ms) as the app shows dates and times, e.g. "29 Mar 2026, 02:00", in `timeZone`
 * (24-hour clock, day month year). For messages that name a moment: never raw ISO text.
 */
export function formatInstant(ms: number, timeZone = 'UTC'): string {
  let f = dateTimeStyle.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-GB', { timeZone, dateStyle: 'medium', timeStyle: 'short' });
    dateTimeStyle.set(timeZone, f);
  }
  return f.format(ms);
}

/** A wall-clock time (read as if UTC, ms) as "29 Mar 2026, 02:00". */
const formatWall = (wall: number) => formatInstant(wall, 'UTC');
/** A wall-clock time's hour and minute, "02:00". */
const hourOfWall = (wall: number) => `${pad2(new Date(wall).getUTCHours())}:${pad2(new Date(wall).getUTCMinutes())}`;

/** "UTC+01:00", "UTC−03:30", "UTC+00:00" for an offset in minutes east of UTC. */
export function formatOffset(offsetMin: number): string {
  const sign = offsetMin < 0 ? '−' : '+';
  const abs = Math.abs(offsetMin);
  return `UTC${sign}${pad2(Math.floor(abs / 60))}:${pad2(abs % 60)}`;
}

/** Where a wall-clock time falls in a zone: one instant, none (a spring-forward gap), or two (the repeated hour). */
export type WallClockInstant = { kind: 'single'; ms: number } | ({ kind: 'gap' } & Refusal) | ({ kind: 'repeated' } & RepeatedTime);

/**
 * A converter of wall-clock times (local time read as if it were UTC, ms) in `timeZone` to UTC instants.
 * The offsets come from @date-fns/tz; a wall-clock time fits an offset when the zone has that offset at
 * the instant it gives. Throws RangeError for an unknown zone.
 */
export function zoneConverter(timeZone: string): (wallClockMs: number) => WallClockInstant {
  if (Number.isNaN(tzOffset(timeZone, new Date(0)))) throw new RangeError(`Unknown time zone "${timeZone}"`);
  const offsetAt = (utcMs: number) => tzOffset(timeZone, new Date(utcMs));
  // One look-up per wall-clock minute serves every second of it (no offset change since 1970 falls inside a minute).
  const cache = new Map<number, { before: number; after: number; fits: number[] }>();
  const gapReason = (wall: number, before: number, after: number) => {
    // The change itself, for the message: tzScan finds the hour (from a whole UTC day), then the minute is looked for in it.
    const startDay = Math.floor((wall - before * MINUTE_MS) / DAY_MS) * DAY_MS - DAY_MS;
    const change = tzScan(timeZone, { start: new Date(startDay), end: new Date(startDay + 3 * DAY_MS) }).find((c) => c.offset === after);
    let at = change ? change.date.getTime() : wall - before * MINUTE_MS;
    if (change) for (let m = at - 59 * MINUTE_MS; m < at; m += MINUTE_MS) if (offsetAt(m) === after) at = m;
    const from = at + before * MINUTE_MS;
    const to = at + after * MINUTE_MS;
    return refusal(
      `does not exist in ${timeZone}: the clocks went forward from ${hourOfWall(from)} to ${hourOfWall(to)} on ${formatWall(from).split(',')[0]}, so no reading was taken at that local time (check the logger's clock and its time zone)`,
      'cell.gap',
      { zone: timeZone, from: hourOfWall(from), to: hourOfWall(to), day: moment(from, 'UTC', true) },
    );
  };
  return (wall) => {
    const minute = Math.floor(wall / MINUTE_MS);
    let known = cache.get(minute);
    if (!known) {
      const before = offsetAt(wall - DAY_MS);
      const after = offsetAt(wall + DAY_MS);
      const fits = [...new Set([before, after])].filter((o) => offsetAt(minute * MINUTE_MS - o * MINUTE_MS) === o);
      known = { before, after, fits };
      if (cache.size > 200_000) cache.clear();
      cache.set(minute, known);
    }
    const { before, after, fits } = known;
    if (fits.length === 0) return { kind: 'gap', ...gapReason(wall, before, after) };
    if (fits.length === 1) return { kind: 'single', ms: wall - fits[0] * MINUTE_MS };
    const [hi, lo] = fits[0] > fits[1] ? [fits[0], fits[1]] : [fits[1], fits[0]];
    return { kind: 'repeated', earlierMs: wall - hi * MINUTE_MS, laterMs: wall - lo * MINUTE_MS, earlierOffsetMin: hi, laterOffsetMin: lo };
  };
}

function parseIso(text: string): TimestampResult {
  const m = ISO_RE.exec(text);
  if (!m) {
    const noOffset = /^\d{4}-\d{2}-\d{2}[Tt ]\d{2}:\d{2}(:\d{2}([.,]\d+)?)?$/.test(text);
    const why = noOffset ? ' (it has no UTC offset: add Z or ±hh:mm, or pick a local layout and a time zone)' : '';
    return { ok: false, ...refusal(`Timestamp "${text}" is not ISO 8601 with an offset, e.g. 2026-03-01T06:00:00+01:00${why}`, noOffset ? 'cell.notIsoNoOffset' : 'cell.notIso', { what: cellWhat('timestamp', text).problem }) };
  }
  const f: Fields = {
    year: +m[1],
    month: +m[2],
    day: +m[3],
    hour: +m[4],
    minute: +m[5],
    second: m[6] ? +m[6] : 0,
    // Sub-millisecond digits are dropped: readings are stored to the millisecond.
    ms: m[7] ? +m[7].slice(0, 3).padEnd(3, '0') : 0,
  };
  const what = cellWhat('timestamp', text);
  const bad = checkDate(f, what) ?? checkTime(f, what);
  if (bad) return { ok: false, ...bad };
  let offsetMin = 0;
  if (!m[8]) {
    const oh = +m[10];
    const om = m[11] ? +m[11] : 0;
    const offset = `${m[9]}${m[10]}:${m[11] ?? '00'}`;
    if (oh > 18 || om > 59) return { ok: false, ...refusal(`Timestamp "${text}": offset ${offset} is not a UTC offset`, 'cell.badOffset', { what: what.problem, offset }) };
    offsetMin = (m[9] === '-' ? -1 : 1) * (oh * 60 + om);
  }
  return { ok: true, ms: wallMs(f) - offsetMin * MINUTE_MS };
}

function dateOf(a: number, b: number, c: number, order: Order): DateFields {
  const [year, month, day] = order === 'ymd' ? [a, b, c] : order === 'dmy' ? [c, b, a] : [c, a, b];
  return { year, month, day };
}

function toInstant(toUtc: (wall: number) => WallClockInstant, f: Fields, what: CellWhat): TimestampResult {
  const at = toUtc(wallMs(f));
  if (at.kind === 'gap') return { ok: false, reason: `${what.text} ${at.reason}`, problem: checkProblem('imports.cell.whatGap', { what: what.problem, gap: at.problem }) };
  if (at.kind === 'single') return { ok: true, ms: at.ms };
  const { earlierMs, laterMs, earlierOffsetMin, laterOffsetMin } = at;
  return { ok: true, ms: earlierMs, repeated: { earlierMs, laterMs, earlierOffsetMin, laterOffsetMin } };
}

/**
 * A parser for one timestamp layout: text → UTC epoch milliseconds, or the reason it is not a timestamp.
 * Local layouts need `timeZone` (an IANA name); throws RangeError when it is missing or unknown.
 */
export function timestampParser(format: TimestampFormat, timeZone?: string): (text: string) => TimestampResult {
  if (format === 'iso8601') return (text) => (text.trim() ? parseIso(text.trim()) : { ok: false, ...refusal('Timestamp is empty', 'cell.empty.timestamp') });
  const pattern = LOCAL_PATTERNS[format];
  if (!pattern) throw new RangeError(`Unknown timestamp format "${String(format)}"`);
  if (!timeZone) throw new RangeError(`${format} needs a time zone`);
  const toUtc = zoneConverter(timeZone);
  return (raw) => {
    const text = raw.trim();
    if (!text) return { ok: false, ...refusal('Timestamp is empty', 'cell.empty.timestamp') };
    const what = cellWhat('timestamp', text);
    const m = pattern.re.exec(text);
    if (!m) return { ok: false, ...refusal(`${what.text} does not match ${format}`, 'cell.noMatch', { what: what.problem, format }) };
    const f: Fields = { ...dateOf(+m[1], +m[2], +m[3], pattern.order), hour: +m[4], minute: +m[5], second: pattern.seconds ? +m[6] : 0, ms: 0 };
    const bad = checkDate(f, what) ?? checkTime(f, what);
    if (bad) return { ok: false, ...bad };
    return toInstant(toUtc, f, what);
  };
}

/** A parser for a date-only cell: its fields, or why not (for guessing columns and for dateTimeParser). */
export function dateCellParser(format: DateFormat): (text: string) => { ok: true; date: DateFields } | ({ ok: false } & Refusal) {
  const pattern = DATE_PATTERNS[format];
  if (!pattern) throw new RangeError(`Unknown date format "${String(format)}"`);
  return (raw) => {
    const text = raw.trim();
    if (!text) return { ok: false, ...refusal('Date is empty', 'cell.empty.date') };
    const what = cellWhat('date', text);
    const m = pattern.re.exec(text);
    if (!m) return { ok: false, ...refusal(`${what.text} does not match ${format}`, 'cell.noMatch', { what: what.problem, format }) };
    const date = dateOf(+m[1], +m[2], +m[3], pattern.order);
    const bad = checkDate(date, what);
    return bad ? { ok: false, ...bad } : { ok: true, date };
  };
}

/** A parser for a time-only cell: its fields, or why not. */
export function timeCellParser(format: TimeFormat): (text: string) => { ok: true; time: TimeFields } | ({ ok: false } & Refusal) {
  const pattern = TIME_PATTERNS[format];
  if (!pattern) throw new RangeError(`Unknown time format "${String(format)}"`);
  return (raw) => {
    const text = raw.trim();
    if (!text) return { ok: false, ...refusal('Time is empty', 'cell.empty.time') };
    const what = cellWhat('time', text);
    const m = pattern.re.exec(text);
    if (!m) return { ok: false, ...refusal(`${what.text} does not match ${format}`, 'cell.noMatch', { what: what.problem, format }) };
    let hour = +m[1];
    if (pattern.twelveHour) {
      if (hour < 1 || hour > 12) return { ok: false, ...refusal(`${what.text}: hour ${hour} is not 1–12 on a 12-hour clock`, 'cell.hour12', { what: what.problem, hour: String(hour) }) };
      const pm = m[5].toLowerCase() === 'p';
      hour = (hour % 12) + (pm ? 12 : 0);
    }
    const time: TimeFields = { hour, minute: +m[2], second: m[3] ? +m[3] : 0, ms: m[4] ? +m[4].padEnd(3, '0') : 0 };
    const bad = checkTime(time, what);
    return bad ? { ok: false, ...bad } : { ok: true, time };
  };
}

/**
 * A parser for a date in one cell and the time of day in another, both local to `timeZone` (IANA):
 * → UTC epoch milliseconds, or the reason and the cell it is about. Throws RangeError for an unknown zone or layout.
 */
export function dateTimeParser(dateFormat: DateFormat, timeFormat: TimeFormat, timeZone: string): (dateText: string, timeText: string) => DateTimeResult {
  const readDate = dateCellParser(dateFormat);
  const readTime = timeCellParser(timeFormat);
  const toUtc = zoneConverter(timeZone);
  return (dateText, timeText) => {
    const d = readDate(dateText);
    if (!d.ok) return { ok: false, part: 'date', reason: d.reason, problem: d.problem };
    const t = readTime(timeText);
    if (!t.ok) return { ok: false, part: 'time', reason: t.reason, problem: t.problem };
    const r = toInstant(toUtc, { ...d.date, ...t.time }, cellWhat('dateTime', `${dateText.trim()} ${timeText.trim()}`));
    return r.ok ? r : { ok: false, part: 'time', reason: r.reason, problem: r.problem };
  };
}
