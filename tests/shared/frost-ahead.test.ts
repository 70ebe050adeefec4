// Frost ahead from an hourly air forecast. The 2 °C default is about 36 °F, the top of the range for
// which the US National Weather Service issues frost advisories (33–36 °F; recalled from memory, no page
// checked); which tanks start exposed is common practice, no published source. The hours below are
// invented; every expected value is read off them by hand.
import { describe, expect, it } from 'vitest';
import { FROST_AHEAD_C, defaultExposedToFrost, frostAheadMessage, frostAheadOf, watchedForFrost } from '@shared/flags';
import { hourlyForecastAnswerSchema } from '@shared/schemas';

const H = 3_600_000;
const now = Date.UTC(2026, 0, 12, 12);
// Noon today: 9 °C, falling 0.5 °C an hour to 0.5 °C at 05:00 tomorrow (17 h on), then rising.
const hours = Array.from({ length: 72 }, (_, i) => ({ atMs: now + (i - 12) * H, airC: i - 12 <= 17 ? 9 - 0.5 * (i - 12) : 0.5 + 0.5 * (i - 12 - 17) }));

describe('frostAheadOf', () => {
  it('finds the coldest hour under the threshold within 48 h', () => {
    // 9 − 0.5 × 17 = 0.5 °C at now + 17 h.
    expect(frostAheadOf(hours, FROST_AHEAD_C, now)).toEqual({ atMs: now + 17 * H, lowC: 0.5 });
  });
  it('is null when no hour falls strictly under the threshold', () => {
    expect(frostAheadOf(hours, 0.5, now)).toBeNull();
  });
  it('ignores hours past the horizon and hours already gone', () => {
    expect(frostAheadOf(hours, FROST_AHEAD_C, now, 10)).toBeNull();
    // 30 h later the cold hour is 13 h behind.
    expect(frostAheadOf(hours, FROST_AHEAD_C, now + 30 * H)).toBeNull();
  });
  it('takes the earliest of equally cold hours', () => {
    expect(frostAheadOf([{ atMs: now + 5 * H, airC: -1 }, { atMs: now + 2 * H, airC: -1 }, { atMs: now + 3 * H, airC: 3 }], 2, now)).toEqual({ atMs: now + 2 * H, lowC: -1 });
  });
});

describe('which tanks frost ahead concerns', () => {
  it.each([
    ['water', true],
    ['fertilizer', true],
    ['pest-solution', false],
    ['culture', false],
  ] as const)('a new %s tank starts exposed: %s', (contents, exposed) => {
    expect(defaultExposedToFrost(contents)).toBe(exposed);
  });
  it('watches exposed tanks and cultures kept warm', () => {
    expect(watchedForFrost({ contents: 'culture', exposedToFrost: false })).toBe(true);
    expect(watchedForFrost({ contents: 'pest-solution', exposedToFrost: false })).toBe(false);
    expect(watchedForFrost({ contents: 'pest-solution', exposedToFrost: true })).toBe(true);
  });
});

describe('frostAheadMessage', () => {
  it('gives the low, the local time and the threshold', () => {
    // 05:00 UTC on 13 January 2026 is 05:00 in Dublin (UTC+0 in winter) and 06:00 in Oslo (UTC+1).
    const at = { atMs: Date.UTC(2026, 0, 13, 5), lowC: -1.8 };
    expect(frostAheadMessage({ name: 'Ridge tank', contents: 'water' }, at, 2, 'Europe/Dublin')).toBe('Ridge tank: air forecast to fall to -1.8 °C around Tue 13 Jan, 05:00 (under 2 °C): drain, cover or heat its lines');
    expect(frostAheadMessage({ name: 'Cone', contents: 'culture' }, at, 2, 'Europe/Oslo')).toContain('around Tue 13 Jan, 06:00');
  });
});

describe('hourlyForecastAnswerSchema', () => {
  it('accepts hours with temperatures, nulls included', () => {
    expect(hourlyForecastAnswerSchema.safeParse({ hourly_units: { temperature_2m: '°C' }, hourly: { time: ['2026-01-12T00:00', '2026-01-12T01:00'], temperature_2m: [1.5, null] } }).success).toBe(true);
  });
  it.each([
    ['an HTML page', '<html>'],
    ['no hourly block', { daily: {} }],
    ['words for temperatures', { hourly: { time: ['2026-01-12T00:00'], temperature_2m: ['cold'] } }],
    ['fewer temperatures than hours', { hourly: { time: ['2026-01-12T00:00', '2026-01-12T01:00'], temperature_2m: [1] } }],
    ['hours that are not times', { hourly: { time: ['yesterday'], temperature_2m: [1] } }],
    ['Fahrenheit', { hourly_units: { temperature_2m: '°F' }, hourly: { time: ['2026-01-12T00:00'], temperature_2m: [30] } }],
    ['a temperature off the scale', { hourly: { time: ['2026-01-12T00:00'], temperature_2m: [400] } }],
  ])('refuses %s', (_what, body) => {
    expect(hourlyForecastAnswerSchema.safeParse(body).success).toBe(false);
  });
});
