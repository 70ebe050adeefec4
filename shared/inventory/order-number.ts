// Purchase-order numbers: the organisation's short code, the two-digit year and a running count
// of that organisation's orders in that year ("TB-26-001"), and the codes offered for a new organisation.

/** Letters an organisation code may hold: 2 to 4 capital letters A–Z. */
export const ORGANISATION_CODE_PATTERN = /^[A-Z]{2,4}$/;

/**
 * The order number "CODE-YY-NNN" (a string): the count is written with at least three digits and
 * grows past 999 without wrapping. Throws RangeError for a code outside ORGANISATION_CODE_PATTERN,
 * a year outside 2000–2099 or a count that is not a whole number ≥ 1.
 */
export function formatOrderNumber(code: string, year: number, count: number): string {
  if (!ORGANISATION_CODE_PATTERN.test(code)) throw new RangeError(`code must be 2 to 4 capital letters (got ${JSON.stringify(code)})`);
  if (!Number.isInteger(year) || year < 2000 || year > 2099) throw new RangeError(`year must be a whole year from 2000 to 2099 (got ${String(year)})`);
  if (!Number.isInteger(count) || count < 1) throw new RangeError(`count must be a whole number of at least 1 (got ${String(count)})`);
  return `${code}-${String(year % 100).padStart(2, '0')}-${String(count).padStart(3, '0')}`;
}

/** The calendar year (a number) of `at` in the IANA time zone `timeZone`, so a farm's New Year's Eve counts in the old year. */
export function yearIn(at: Date, timeZone: string): number {
  const year = new Intl.DateTimeFormat('en-GB', { timeZone, year: 'numeric' }).formatToParts(at).find((p) => p.type === 'year')?.value;
  return Number(year);
}

const LETTERS = 'ABCDEFGHIJKLMNOPQRSTUVWXYZ';

/**
 * Codes to offer for an organisation named `name`, best first (each 2–4 capital letters): the
 * initials of its words, padded from the first word when there is one word, then the first two
 * letters followed by every third letter and every pair of letters. The caller takes the first
 * one not in use.
 */
export function organisationCodeCandidates(name: string): string[] {
  const words = name
    .normalize('NFD')
    .replace(/[\u0300-\u036f]/g, '')
    .toUpperCase()
    .split(/[^A-Z]+/)
    .filter(Boolean);
  const letters = words.join('');
  const initials = words.map((w) => w[0]).join('');
  const first = (initials.length >= 2 ? initials : (initials + letters.slice(1)).slice(0, 2)).padEnd(2, 'X');
  const out = new Set<string>();
  for (let n = 2; n <= 4; n++) if (initials.length >= n) out.add(initials.slice(0, n));
  if (initials.length < 2) for (let n = 2; n <= 4; n++) if (letters.length >= n) out.add(letters.slice(0, n));
  out.add(first.slice(0, 2));
  const stem = first.slice(0, 2);
  for (const a of LETTERS) out.add(stem + a);
  for (const a of LETTERS) for (const b of LETTERS) out.add(stem + a + b);
  return [...out];
}
