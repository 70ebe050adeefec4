// Logger timestamps → UTC instants. ISO 8601 carries its own offset; the local patterns are
// wall-clock times in an IANA time zone, turned into UTC with the runtime's time-zone data (Intl).
//
// Daylight-saving rule (RFC 5545 "iCalendar", §3.3.5, the rule TC39 Temporal calls "compatible"):
// - a local time that occurs twice (clocks go back) is the FIRST occurrence, the one before the change;
// - a local time that never occurs (clocks go forward) is read with the offset in force BEFORE the
//   gap, so it lands as far past the gap's start as it names (01:30 in a 01:00→02:00 gap is 02:30).
// A logger that keeps local time cannot tell the two passes of a repeated hour apart, so rows of the
// second pass land on the first pass's instants and are reported as duplicates, not stored twice.
import type { TimestampFormat } from './mapping';

/** A parsed timestamp: epoch milliseconds (UTC), or why the text is not one. */
export type TimestampResult = { ok: true; ms: number } | { ok: false; reason: string };

/** Earliest year accepted: time-zone data before 1970 is patchy, and no logger file reaches that far back. */
export const MIN_TIMESTAMP_YEAR = 1970;

const MINUTE_MS = 60_000;
const DAY_MS = 86_400_000;
const QUARTER_HOUR_MS = 15 * MINUTE_MS;

interface Fields {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
  ms: number;
}

const LOCAL_PATTERNS: Record<Exclude<TimestampFormat, 'iso8601'>, { re: RegExp; order: 'ymd' | 'dmy' | 'mdy'; seconds: boolean }> = {
  'YYYY-MM-DD HH:mm:ss': { re: /^(\d{4})-(\d{1,2})-(\d{1,2})[T ]+(\d{1,2}):(\d{2}):(\d{2})$/, order: 'ymd', seconds: true },
  'YYYY-MM-DD HH:mm': { re: /^(\d{4})-(\d{1,2})-(\d{1,2})[T ]+(\d{1,2}):(\d{2})$/, order: 'ymd', seconds: false },
  'DD/MM/YYYY HH:mm:ss': { re: /^(\d{1,2})\/(\d{1,2})\/(\d{4}) +(\d{1,2}):(\d{2}):(\d{2})$/, order: 'dmy', seconds: true },
  'DD/MM/YYYY HH:mm': { re: /^(\d{1,2})\/(\d{1,2})\/(\d{4}) +(\d{1,2}):(\d{2})$/, order: 'dmy', seconds: false },
  'MM/DD/YYYY HH:mm:ss': { re: /^(\d{1,2})\/(\d{1,2})\/(\d{4}) +(\d{1,2}):(\d{2}):(\d{2})$/, order: 'mdy', seconds: true },
  'MM/DD/YYYY HH:mm': { re: /^(\d{1,2})\/(\d{1,2})\/(\d{4}) +(\d{1,2}):(\d{2})$/, order: 'mdy', seconds: false },
  'DD.MM.YYYY HH:mm:ss': { re: /^(\d{1,2})\.(\d{1,2})\.(\d{4}) +(\d{1,2}):(\d{2}):(\d{2})$/, order: 'dmy', seconds: true },
  'DD.MM.YYYY HH:mm': { re: /^(\d{1,2})\.(\d{1,2})\.(\d{4}) +(\d{1,2}):(\d{2})$/, order: 'dmy', seconds: false },
};

// Date and time, then Z or an offset of ±HH:MM, ±HHMM or ±HH (ISO 8601-1:2019 §4.3.13; RFC 3339 §5.6 allows the space).
const ISO_RE = /^(\d{4})-(\d{2})-(\d{2})[Tt ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?(?:([Zz])|([+-])(\d{2})(?::?(\d{2}))?)$/;

/** Days in a month (1–12) of a proleptic Gregorian year. */
export function daysInMonth(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

function checkFields(f: Fields, text: string): string | null {
  if (f.year < MIN_TIMESTAMP_YEAR) return `Timestamp "${text}" is before ${MIN_TIMESTAMP_YEAR}: check the logger's clock`;
  if (f.month < 1 || f.month > 12) return `Timestamp "${text}": month ${f.month} does not exist`;
  const dim = daysInMonth(f.year, f.month);
  if (f.day < 1 || f.day > dim) return `Timestamp "${text}": day ${f.day} does not exist in ${f.year}-${String(f.month).padStart(2, '0')} (it has ${dim} days)`;
  if (f.hour > 23) return `Timestamp "${text}": hour ${f.hour} is not 0–23`;
  if (f.minute > 59) return `Timestamp "${text}": minute ${f.minute} is not 0–59`;
  if (f.second > 59) return `Timestamp "${text}": second ${f.second} is not 0–59`;
  return null;
}

/** Milliseconds since the epoch of a wall-clock time read as if it were UTC (valid years ≥ 1970 only). */
function wallMs(f: Fields): number {
  return Date.UTC(f.year, f.month - 1, f.day, f.hour, f.minute, f.second, f.ms);
}

/**
 * A converter from wall-clock milliseconds (the local time read as if it were UTC) in `timeZone` to UTC
 * epoch milliseconds, following the daylight-saving rule at the top of this file. Throws RangeError for
 * an unknown zone.
 */
export function zoneConverter(timeZone: string): (wallClockMs: number) => number {
  const fmt = new Intl.DateTimeFormat('en-US', {
    timeZone,
    hourCycle: 'h23',
    year: 'numeric',
    month: 'numeric',
    day: 'numeric',
    hour: 'numeric',
    minute: 'numeric',
    second: 'numeric',
  });
  // Offset (local − UTC) in ms at a UTC instant; the runtime's own time-zone database answers.
  const offsetAt = (utcMs: number): number => {
    const p: Record<string, number> = {};
    for (const part of fmt.formatToParts(utcMs)) if (part.type !== 'literal') p[part.type] = Number(part.value);
    return Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute, p.second) - Math.floor(utcMs / 1000) * 1000;
  };
  // Every offset change since 1970 happens on a quarter hour of local time between quarter-hour
  // offsets, so one answer serves a whole local quarter hour; other offsets are never cached.
  const cache = new Map<number, number>();
  return (local: number) => {
    const bucket = Math.floor(local / QUARTER_HOUR_MS);
    const known = cache.get(bucket);
    if (known !== undefined) return local - known;
    const before = offsetAt(local - DAY_MS);
    const after = offsetAt(local + DAY_MS);
    const fits = [...new Set([before, after])].filter((o) => offsetAt(local - o) === o);
    // Two fits: the repeated hour, take the earlier instant (larger offset). None: the gap, keep the offset before it.
    const offset = fits.length === 0 ? before : Math.max(...fits);
    if (before % QUARTER_HOUR_MS === 0 && after % QUARTER_HOUR_MS === 0) {
      if (cache.size > 100_000) cache.clear();
      cache.set(bucket, offset);
    }
    return local - offset;
  };
}

function parseIso(text: string): TimestampResult {
  const m = ISO_RE.exec(text);
  if (!m) {
    const why = /^\d{4}-\d{2}-\d{2}[Tt ]\d{2}:\d{2}(:\d{2}([.,]\d+)?)?$/.test(text) ? ' (it has no UTC offset: add Z or ±hh:mm, or pick a local pattern and a time zone)' : '';
    return { ok: false, reason: `Timestamp "${text}" is not ISO 8601 with an offset, e.g. 2026-03-01T06:00:00+01:00${why}` };
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
  const bad = checkFields(f, text);
  if (bad) return { ok: false, reason: bad };
  let offsetMin = 0;
  if (!m[8]) {
    const oh = +m[10];
    const om = m[11] ? +m[11] : 0;
    if (oh > 18 || om > 59) return { ok: false, reason: `Timestamp "${text}": offset ${m[9]}${m[10]}:${m[11] ?? '00'} is not a UTC offset` };
    offsetMin = (m[9] === '-' ? -1 : 1) * (oh * 60 + om);
  }
  return { ok: true, ms: wallMs(f) - offsetMin * MINUTE_MS };
}

/**
 * A parser for one timestamp layout: text → UTC epoch milliseconds, or the reason it is not a timestamp.
 * Local patterns need `timeZone` (an IANA name); throws RangeError when it is missing or unknown.
 */
export function timestampParser(format: TimestampFormat, timeZone?: string): (text: string) => TimestampResult {
  if (format === 'iso8601') return (text) => (text.trim() ? parseIso(text.trim()) : { ok: false, reason: 'Timestamp is empty' });
  const pattern = LOCAL_PATTERNS[format];
  if (!pattern) throw new RangeError(`Unknown timestamp format "${String(format)}"`);
  if (!timeZone) throw new RangeError(`${format} needs a time zone`);
  const toUtc = zoneConverter(timeZone);
  return (raw) => {
    const text = raw.trim();
    if (!text) return { ok: false, reason: 'Timestamp is empty' };
    const m = pattern.re.exec(text);
    if (!m) return { ok: false, reason: `Timestamp "${text}" does not match ${format}` };
    const [a, b, c] = [+m[1], +m[2], +m[3]];
    const [year, month, day] = pattern.order === 'ymd' ? [a, b, c] : pattern.order === 'dmy' ? [c, b, a] : [c, a, b];
    const f: Fields = { year, month, day, hour: +m[4], minute: +m[5], second: pattern.seconds ? +m[6] : 0, ms: 0 };
    const bad = checkFields(f, text);
    if (bad) return { ok: false, reason: bad };
    return { ok: true, ms: toUtc(wallMs(f)) };
  };
}
