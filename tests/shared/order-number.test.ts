import { describe, expect, it } from 'vitest';
import { formatOrderNumber, organisationCodeCandidates, ORGANISATION_CODE_PATTERN, yearIn } from '@shared/inventory';
import { currencySchema, isCurrencyCode, organisationCodeSchema, organisationSettingsSchema } from '@shared/schemas';

describe('formatOrderNumber', () => {
  it.each([
    ['TB', 2026, 1, 'TB-26-001'],
    ['TB', 2026, 42, 'TB-26-042'],
    ['HRMF', 2030, 999, 'HRMF-30-999'],
    ['TB', 2026, 1000, 'TB-26-1000'],
    ['XY', 2009, 7, 'XY-09-007'],
  ])('numbers %s in %s, count %s, as %s', (code, year, count, expected) => {
    expect(formatOrderNumber(code, year, count)).toBe(expected);
  });

  it.each([
    ['T', 2026, 1, /code/],
    ['tb', 2026, 1, /code/],
    ['TBXYZ', 2026, 1, /code/],
    ['TB', 1999, 1, /year/],
    ['TB', 2026, 0, /count/],
    ['TB', 2026, 1.5, /count/],
  ])('refuses code %s, year %s, count %s with a RangeError naming the value', (code, year, count, message) => {
    expect(() => formatOrderNumber(code, year, count)).toThrow(message);
  });
});

describe('yearIn', () => {
  // 31 Dec 2025 23:30 in Auckland (UTC+13 in summer) is 10:30 UTC; 1 Jan 2026 00:30 in Auckland is 31 Dec 11:30 UTC.
  it('counts a farm-local New Year by the farm clock (IANA tz database, Pacific/Auckland NZDT = UTC+13)', () => {
    expect(yearIn(new Date('2025-12-31T11:30:00Z'), 'Pacific/Auckland')).toBe(2026);
    expect(yearIn(new Date('2025-12-31T11:30:00Z'), 'Europe/Dublin')).toBe(2025);
  });
});

describe('organisationCodeCandidates', () => {
  it('offers the initials first, then the first word, then the stem with one and two more letters', () => {
    expect(organisationCodeCandidates("Tallowbrook Growers' Co-operative").slice(0, 4)).toEqual(['TG', 'TGC', 'TGCO', 'TGA']);
    expect(organisationCodeCandidates('Saltmeadow').slice(0, 3)).toEqual(['SA', 'SAL', 'SALT']);
    expect(organisationCodeCandidates('Ōrewa Növel')[0]).toBe('ON');
  });

  it('gives only valid, distinct codes, and hundreds of them, for any name', () => {
    for (const name of ['', '42', 'A', 'Test co-op 9f3a', 'Über Farms & Sons']) {
      const codes = organisationCodeCandidates(name);
      expect(new Set(codes).size).toBe(codes.length);
      expect(codes.length).toBeGreaterThan(600);
      for (const c of codes) expect(c).toMatch(ORGANISATION_CODE_PATTERN);
    }
  });
});

describe('currency and code schemas', () => {
  // ISO 4217:2015 "Codes for the representation of currencies", Table A.1 (current currency codes).
  it.each(['EUR', 'NZD', 'GBP', 'USD', 'AUD', 'JPY', 'CHF'])('accepts the ISO 4217 code %s', (code) => {
    expect(isCurrencyCode(code)).toBe(true);
  });

  it.each(['XYZ', 'EU', 'EURO', 'eur', '€', ''])('refuses %s as a currency code', (code) => {
    expect(isCurrencyCode(code)).toBe(false);
  });

  it('reads lower-case input as the code and names the problem', () => {
    expect(currencySchema.parse(' nzd ')).toBe('NZD');
    expect(currencySchema.safeParse('ABC').error?.issues[0]?.message).toMatch(/ISO 4217/);
    expect(organisationCodeSchema.parse('tb')).toBe('TB');
    expect(organisationCodeSchema.safeParse('T1').success).toBe(false);
    expect(organisationSettingsSchema.safeParse({}).success).toBe(false);
  });

  it('formats an amount in each accepted currency with Intl.NumberFormat', () => {
    expect(new Intl.NumberFormat('en-GB', { style: 'currency', currency: currencySchema.parse('eur') }).format(18)).toBe('€18.00');
  });
});
