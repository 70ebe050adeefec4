// The one decimal parser (shared/units/decimal.ts), as people type numbers on the round and as
// loggers write them. Sources: the Unicode CLDR number symbols (decimal and group separators per
// locale: en and en-GB "1,234.5", de "1.234,5", fr "1 234,5" with a narrow no-break space U+202F,
// de-CH "1’234.5"), as ICU gives them through Node's Intl.NumberFormat (ECMA-402 §15); the round trip
// below formats numbers with Intl itself, so it checks the parser against that outside reference.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { decimalMarkOf, parseDecimal, type DecimalMark } from '@shared/units/index';

const person = (text: string, decimalMark: DecimalMark) => parseDecimal(text, { decimalMark, field: 'Sight-tube reading', example: '1250' });

describe('decimalMarkOf', () => {
  it.each<[string, DecimalMark, string]>([
    ['en-US', '.', 'CLDR en: decimal "."'],
    ['en-GB', '.', 'CLDR en-GB: decimal "."'],
    ['de-DE', ',', 'CLDR de: decimal ","'],
    ['fr-FR', ',', 'CLDR fr: decimal ","'],
    ['pt-BR', ',', 'CLDR pt: decimal ","'],
    ['de-CH', '.', 'CLDR de-CH: decimal "."'],
  ])('gives the decimal mark of %s as %j (%s)', (locale, mark) => {
    expect(decimalMarkOf(locale)).toBe(mark);
  });

  it('takes the first of a list of languages, as navigator.languages gives them', () => {
    expect(decimalMarkOf(['de-DE', 'en-US'])).toBe(',');
  });

  it('falls back to a point when the locale tag is not one', () => {
    expect(decimalMarkOf('not a locale!')).toBe('.');
  });
});

describe('parseDecimal as people type', () => {
  it.each<[string, DecimalMark, number, boolean]>([
    // The two readings of one text: the person's own decimal mark decides, and the text is flagged as ambiguous.
    ['1,250', ',', 1.25, true],
    ['1,250', '.', 1250, true],
    ['1.250', '.', 1.25, true],
    ['1.250', ',', 1250, true],
    // Both marks: the last one is the decimal, whichever the person writes.
    ['1.250,5', ',', 1250.5, false],
    ['1.250,5', '.', 1250.5, false],
    ['1,250.5', '.', 1250.5, false],
    ['-1.250,5', ',', -1250.5, false],
    // Spaces and apostrophes group thousands (CLDR fr, de-CH).
    ['1 250', '.', 1250, false],
    ['1 250', ',', 1250, false],
    ['1\u202f250,5', ',', 1250.5, false],
    ['1\u00a0250', ',', 1250, false],
    ["1'250.5", '.', 1250.5, false],
    ['1’250.5', '.', 1250.5, false],
    // A mark used twice can only group; the other mark not shaped like thousands can only be a decimal.
    ['1.250.000', '.', 1_250_000, false],
    ['12,5', '.', 12.5, false],
    ['0,250', '.', 0.25, false],
    ['1234,5', '.', 1234.5, false],
    ['12.5', ',', 12.5, false],
    // Plain numbers.
    ['1250', '.', 1250, false],
    [' 980 ', ',', 980, false],
    ['12.', '.', 12, false],
    ['.5', '.', 0.5, false],
    [',5', ',', 0.5, false],
    ['+3', '.', 3, false],
    ['-0', '.', 0, false],
  ])('reads %j with a decimal %j as %d (ambiguous: %s)', (text, mark, value, ambiguous) => {
    expect(person(text, mark)).toEqual({ ok: true, value, ambiguous });
  });

  it.each<[string, DecimalMark]>([
    ['12a', '.'],
    ['1.2.3', '.'],
    ['1,25,0', ','],
    ['1.25,0.5', ','],
    ['1 25', '.'],
    ['12 345 6', '.'],
    ['1,250 5', '.'],
    ['0.250.000', ','],
    ['.', '.'],
    [',', ','],
    ['--5', '.'],
    ['1e3', '.'],
    ['NaN', '.'],
    ['Infinity', '.'],
  ])('refuses %j (decimal %j) naming the field and offering an example', (text, mark) => {
    expect(person(text, mark)).toEqual({ ok: false, problem: 'not-a-number', reason: `Sight-tube reading "${text.trim()}" is not a number: type it like 1250` });
  });

  it('says the field is empty for empty or blank text', () => {
    expect(person('   ', '.')).toMatchObject({ ok: false, problem: 'empty', reason: 'Sight-tube reading is empty' });
  });

  it('reads back what Intl formats in each language, grouping and decimals alike (CLDR through ICU)', () => {
    const locales = ['en-US', 'en-GB', 'de-DE', 'fr-FR', 'de-CH', 'es-ES', 'it-IT', 'pt-BR', 'nl-NL', 'sv-SE'];
    fc.assert(
      fc.property(fc.constantFrom(...locales), fc.integer({ min: -99_999_999, max: 99_999_999 }), fc.integer({ min: 0, max: 2 }), (locale, n, digits) => {
        const value = n / 10 ** digits;
        const text = new Intl.NumberFormat(locale, { minimumFractionDigits: digits, maximumFractionDigits: digits }).format(value);
        // Intl writes a minus sign U+2212 in some languages (sv); people type a hyphen.
        const typed = text.replace('\u2212', '-');
        const parsed = person(typed, decimalMarkOf(locale));
        expect(parsed.ok && parsed.value).toBe(value);
      }),
    );
  });
});

describe('parseDecimal as loggers write (no grouping, powers of ten)', () => {
  const logger = (text: string, decimalMark: DecimalMark) => parseDecimal(text, { decimalMark, grouping: false, exponent: true });

  it.each<[string, DecimalMark, number]>([
    ['1e3', '.', 1000],
    ['2,5E-1', ',', 0.25],
    ['12.5', '.', 12.5],
    ['12,5', ',', 12.5],
  ])('reads %j with a decimal %j as %d', (text, mark, value) => {
    expect(logger(text, mark)).toEqual({ ok: true, value, ambiguous: false });
  });

  it.each<[string, DecimalMark, string]>([
    ['1,250', '.', 'other-mark'],
    ['12.5', ',', 'other-mark'],
    ['1 250', '.', 'not-a-number'],
    ['1.234,5', ',', 'not-a-number'],
    ['1e999', '.', 'too-large'],
  ])('refuses %j (decimal %j) as %s', (text, mark, problem) => {
    expect(logger(text, mark)).toMatchObject({ ok: false, problem });
  });
});
