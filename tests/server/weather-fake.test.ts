// The fake forecast service's scenarios against the frost check's window (an hour back to 48 hours
// ahead) at any time of day and on any date: the fake moves a scenario by whole days to start at its
// clock's midnight (UTC), so samples/weather/frost-tomorrow.json must still put its coldest hour inside
// the window, and the window must hold 48 forecast hours, whatever the clock says. The scenario's
// values are invented; the 48 hours and the 2 °C threshold: see FROST_AHEAD_HOURS and FROST_AHEAD_C in shared/flags.
import { afterAll, describe, expect, it } from 'vitest';
import { FROST_AHEAD_C, FROST_AHEAD_HOURS, frostAheadOf } from '@shared/flags';
import { fetchHourlyAirForecast } from '../../server/weather/client';
import { startFakeWeather } from '../../server/weather/fake';

const HOUR_MS = 3_600_000;
const DAY_MS = 24 * HOUR_MS;

let clockMs = 0;
const weather = await startFakeWeather({ port: 0, clock: () => clockMs });
afterAll(() => weather.close());

/** The fake's forecast for a farm as the frost check reads it, with the fake's clock at `nowMs`. */
async function forecastAt(nowMs: number, scenario: string) {
  clockMs = nowMs;
  expect((await fetch(`${weather.url}/fake/scenario`, { method: 'PUT', body: JSON.stringify({ name: scenario }) })).status).toBe(200);
  const hours = await fetchHourlyAirForecast({ baseUrl: weather.url, timeoutMs: 2_000 }, { latitude: 52.6, longitude: -7.9 });
  return hours.map((h) => ({ atMs: Date.parse(h.at), airC: h.airC }));
}
const inWindow = (hours: { atMs: number }[], nowMs: number) => hours.filter((h) => h.atMs >= nowMs - HOUR_MS && h.atMs <= nowMs + FROST_AHEAD_HOURS * HOUR_MS).length;

// Each hour of a winter day (the frost was cut off before 04:00 UTC when the scenario had it two nights
// ahead), the last second of a day, a year's end, Dublin's two clock changes and a leap day.
const clocks = [
  ...Array.from({ length: 24 }, (_, h) => `2026-12-04T${String(h).padStart(2, '0')}:08:00Z`),
  '2026-12-04T23:59:59Z',
  '2026-12-31T23:30:00Z',
  '2027-03-28T00:30:00Z',
  '2027-10-31T01:30:00Z',
  '2028-02-28T02:00:00Z',
  '2028-02-29T03:59:00Z',
];

describe('the fake forecast service', () => {
  it.each(clocks)('puts the frost-tomorrow low of -1.8 °C at 04:00 UTC tomorrow, inside 48 forecast hours, when its clock says %s', async (iso) => {
    const nowMs = Date.parse(iso);
    const hours = await forecastAt(nowMs, 'frost-tomorrow');
    const tomorrowAt4 = (Math.floor(nowMs / DAY_MS) + 1) * DAY_MS + 4 * HOUR_MS;
    expect(frostAheadOf(hours, FROST_AHEAD_C, nowMs)).toEqual({ atMs: tomorrowAt4, lowC: -1.8 });
    expect(inWindow(hours, nowMs)).toBeGreaterThanOrEqual(48);
  });

  it.each(clocks)('answers the mild scenario with no frost under 2 °C but an hour under 8 °C in the next 48 hours when its clock says %s', async (iso) => {
    const nowMs = Date.parse(iso);
    const hours = await forecastAt(nowMs, 'mild');
    expect(frostAheadOf(hours, FROST_AHEAD_C, nowMs)).toBeNull();
    expect(frostAheadOf(hours, 8, nowMs)?.lowC).toBeGreaterThanOrEqual(6);
    expect(inWindow(hours, nowMs)).toBeGreaterThanOrEqual(48);
  });

  it('logs each request at its clock', async () => {
    await forecastAt(Date.parse('2027-03-28T00:30:00Z'), 'mild');
    const { requests } = (await (await fetch(`${weather.url}/fake/requests`)).json()) as { requests: { at: string }[] };
    expect(requests.at(-1)!.at).toBe('2027-03-28T00:30:00.000Z');
  });
});
