// Decimal numbers as people type them and as loggers write them: the one parser behind the round's
// inputs and the logger-file rows. A person's decimal mark comes from their language (a parameter,
// so a language setting can pass it); grouping of thousands is read only where people type.

/** A decimal mark: a point (1.5) or a comma (1,5). */
export type DecimalMark = '.' | ',';

/** What can be wrong with a number's text. */
export type DecimalProblem = 'empty' | 'not-a-number' | 'other-mark' | 'too-large';

/** A parsed number, or why the text is not one (with a reason that names the field). */
export type DecimalResult =
  | {
      ok: true;
      value: number;
      /** The other decimal mark would read the text differently ("1,250": 1250 or 1.25). */
      ambiguous: boolean;
    }
  | { ok: false; problem: DecimalProblem; reason: string };

/** How to read the text. */
export interface DecimalOptions {
  /** The decimal mark of the person or file. */
  decimalMark: DecimalMark;
  /** Read thousands grouping (1,250 · 1.250,5 · 1 250 · 1'250), as people type; logger files never group. Default true. */
  grouping?: boolean;
  /** Read a power of ten (1e3), as loggers write. Default false. */
  exponent?: boolean;
  /** The field's name, at the start of every reason. Default "Value". */
  field?: string;
  /** A number as the field expects it, offered when the text is not one. */
  example?: string;
}

/** The decimal mark of a locale's numbers, as Intl formats 1.5 there; a point when the locale is unknown or uses neither. */
export function decimalMarkOf(locales?: string | readonly string[]): DecimalMark {
  try {
    const list = typeof locales === 'string' ? [locales] : locales ? [...locales] : undefined;
    const mark = new Intl.NumberFormat(list).formatToParts(1.5).find((p) => p.type === 'decimal')?.value;
    return mark === ',' ? ',' : '.';
  } catch {
    return '.';
  }
}

const OTHER: Record<DecimalMark, DecimalMark> = { '.': ',', ',': '.' };
// Spaces of every width and apostrophes group thousands in some languages; they never mark decimals.
const SPACE_GROUPS = /[\s\u00a0\u2009\u202f]/g;
const APOSTROPHES = /[\u2019']/g;
const EXPONENT = /[eE][+-]?\d+$/;
const GROUPED = (mark: string) => new RegExp(`^[1-9]\\d{0,2}(?:${mark === '.' ? '\\.' : mark}\\d{3})+$`);

type Split = { int: string; frac: string; ambiguous: boolean } | { problem: DecimalProblem };

/** The integer and fraction digits of `body` (digits and marks only), reading grouping as people type. */
function splitGrouped(body: string, mark: DecimalMark): Split {
  const marks = [...new Set(body.replace(/\d/g, ''))];
  if (marks.length === 0) return { int: body, frac: '', ambiguous: false };
  if (marks.length > 2) return { problem: 'not-a-number' };
  if (marks.length === 2) {
    // Both kinds: the last one is the decimal mark, whatever the person's own is ("1.250,5" can only be 1250.5).
    const at = Math.max(body.lastIndexOf('.'), body.lastIndexOf(','));
    if (at < 0) return { problem: 'not-a-number' };
    const decimal = body[at]!;
    const group = marks.find((m) => m !== decimal)!;
    const int = body.slice(0, at);
    const frac = body.slice(at + 1);
    if (!GROUPED(group).test(int) || !/^\d+$/.test(frac)) return { problem: 'not-a-number' };
    return { int: int.split(group).join(''), frac, ambiguous: false };
  }
  const only = marks[0]!;
  const parts = body.split(only);
  if (only === ' ' || only === "'" || parts.length > 2) {
    // Spaces, apostrophes or a mark used twice can only group thousands.
    return GROUPED(only).test(body) ? { int: parts.join(''), frac: '', ambiguous: false } : { problem: 'not-a-number' };
  }
  const [int, frac] = parts as [string, string];
  if (!int && !frac) return { problem: 'not-a-number' };
  const groupShaped = GROUPED(only).test(body);
  if (only === mark) return { int, frac, ambiguous: groupShaped };
  // The other mark once: thousands when it is shaped like them ("1,250" to a person writing 1.5), else the only
  // reading left is a decimal ("12,5", "0,250").
  return groupShaped ? { int: int + frac, frac: '', ambiguous: true } : { int, frac, ambiguous: false };
}

/** The digits of `body` with the decimal mark alone and no grouping (as logger files write numbers). */
function splitPlain(body: string, mark: DecimalMark): Split {
  const parts = body.split(mark);
  const [int, frac = ''] = parts as [string, string?];
  if (parts.length <= 2 && /^\d*$/.test(int) && /^\d*$/.test(frac) && (int || frac)) return { int, frac, ambiguous: false };
  const other = body.split(OTHER[mark]);
  return other.length === 2 && other.every((p) => /^\d*$/.test(p)) && other.some(Boolean) ? { problem: 'other-mark' } : { problem: 'not-a-number' };
}

/** The number in `text` (surrounding spaces ignored) read with the person's or file's decimal mark. */
export function parseDecimal(text: string, options: DecimalOptions): DecimalResult {
  const { decimalMark, grouping = true, exponent = false, field = 'Value', example } = options;
  const shown = text.trim();
  const fail = (problem: DecimalProblem): DecimalResult => ({ ok: false, problem, reason: reasonFor(problem, shown, field, decimalMark, example) });
  if (!shown) return fail('empty');
  let body = shown;
  let sign = '';
  if (body[0] === '+' || body[0] === '-') {
    sign = body[0] === '-' ? '-' : '';
    body = body.slice(1);
  }
  let power = '';
  const exp = exponent ? EXPONENT.exec(body) : null;
  if (exp) {
    power = exp[0];
    body = body.slice(0, exp.index);
  }
  if (grouping) body = body.replace(SPACE_GROUPS, ' ').replace(APOSTROPHES, "'");
  if (!/^[\d.,' ]+$/.test(body) || !/\d/.test(body)) return fail('not-a-number');
  const split = grouping ? splitGrouped(body, decimalMark) : splitPlain(body, decimalMark);
  if ('problem' in split) return fail(split.problem);
  const value = Number(`${sign}${split.int || '0'}.${split.frac || '0'}${power}`);
  if (!Number.isFinite(value)) return fail('too-large');
  return { ok: true, value: value === 0 ? 0 : value, ambiguous: split.ambiguous };
}

function reasonFor(problem: DecimalProblem, shown: string, field: string, mark: DecimalMark, example: string | undefined): string {
  const text = shown.length > 40 ? `${shown.slice(0, 40)}…` : shown;
  switch (problem) {
    case 'empty':
      return `${field} is empty`;
    case 'too-large':
      return `${field} "${text}" is too large to be a reading`;
    case 'other-mark':
      return `${field} "${text}" has a decimal ${mark === '.' ? 'comma' : 'point'}; numbers here use a decimal ${mark === '.' ? 'point' : 'comma'}`;
    default:
      return example ? `${field} "${text}" is not a number: type it like ${example}` : `${field} "${text}" is not a number`;
  }
}
