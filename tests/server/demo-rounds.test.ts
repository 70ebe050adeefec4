// The demo's rounds are walked each farm-local morning, whatever the time the demo is loaded: the tank page's
// month view (the last 30 × 24 h, one point per farm day) finds a round on each of its 30 days. Before this the
// rounds were stepped back 24 h from the load time, so a demo loaded just after farm midnight put two rounds on
// some farm days and none on others. Dates of the clock changes: EU summer time ends on the last Sunday of
// October and starts on the last Sunday of March (Directive 2000/84/EC, Art. 2–3); the other zones' dates are
// from the IANA time zone database the runtime carries.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { calibrationVersion } from '@shared/calibration';
import { farmDayOf, wallClockOf } from '@shared/time';
import type { Tank } from '../../server/models';
import { demoReadings, earlierDemoRounds, readScenario } from '../../server/services/demo';

const DAY_MS = 86_400_000;
const scenario = readScenario();

function demoTank(i: number): Tank {
  const t = scenario.tanks[i];
  return { ...t, id: i + 1, organisationId: 1, farmId: 1, sensorHeightMm: null, calibrationVersion: calibrationVersion(t.geometry, t.datumOffsetMm), archivedAt: null } as unknown as Tank;
}

/** Every demo tank's rounds and logger readings as loadDemoScenario makes them, with the clock at `now`. */
function demoAt(now: string, timeZone: string) {
  vi.useFakeTimers({ toFake: ['Date'] });
  vi.setSystemTime(new Date(now));
  let rounds = 0;
  return scenario.tanks.map((t, i) => {
    const made = demoReadings(demoTank(i), rounds, null, timeZone);
    rounds += made.filter((r) => r.source === 'round').length;
    return { code: t.code, readings: [...earlierDemoRounds(demoTank(i), made, rounds, timeZone), ...made] };
  });
}

afterEach(() => {
  vi.useRealTimers();
});

describe('demo rounds', () => {
  it.each([
    ['just after farm midnight (the time the month view came up short)', '2026-12-04T01:13:00Z', 'Europe/Dublin'],
    ['a minute before 05:30, when yesterday’s round is still the newest', '2026-12-04T05:29:00Z', 'Europe/Dublin'],
    ['a minute after 05:30, before the round’s usual time', '2026-12-04T05:31:00Z', 'Europe/Dublin'],
    ['in the middle of the round', '2026-12-04T07:20:00Z', 'Europe/Dublin'],
    ['late in the evening', '2026-12-04T23:50:00Z', 'Europe/Dublin'],
    ['in winter, 30 days after summer time ended (25 October 2026)', '2026-11-20T06:10:00Z', 'Europe/Dublin'],
    ['in summer, 12 days after summer time began (29 March 2026)', '2026-04-10T04:40:00Z', 'Europe/Dublin'],
    ['at a farm twelve hours ahead of UTC', '2026-12-04T11:20:00Z', 'Pacific/Auckland'],
    ['at a farm eight hours behind UTC', '2026-12-04T08:30:00Z', 'America/Los_Angeles'],
  ])('puts one round on each farm morning and 30 in the last 30 days when loaded %s', (_when, now, timeZone) => {
    const nowMs = Date.parse(now);
    for (const { code, readings } of demoAt(now, timeZone)) {
      const rounds = readings.filter((r) => r.source === 'round').map((r) => r.takenAt.getTime());
      const days = rounds.map((at) => farmDayOf(at, timeZone));
      expect(new Set(days).size, `${code}: one round per farm day`).toBe(days.length);
      expect(Math.max(...rounds), `${code}: nothing after now`).toBeLessThanOrEqual(nowMs);
      for (const at of rounds) {
        const minuteOfDay = Math.floor(wallClockOf(at, timeZone) / 60_000) % 1440;
        expect(minuteOfDay, `${code}: a morning round`).toBeGreaterThanOrEqual(5 * 60 + 29);
        expect(minuteOfDay, `${code}: a morning round`).toBeLessThanOrEqual(7 * 60 + 40);
      }
      // The month view asks for the last 30 × 24 h; the gate tank (SO-W2) has not been read for four days.
      const inMonth = new Set(rounds.filter((at) => at > nowMs - 30 * DAY_MS).map((at) => farmDayOf(at, timeZone)));
      expect(inMonth.size, code).toBeGreaterThanOrEqual(code === 'SO-W2' ? 26 : 30);
      // The newest round is at most a day and a few hours old, so the flags of "this morning" hold.
      if (code !== 'SO-W2') expect(nowMs - Math.max(...rounds), code).toBeLessThan(26 * 3_600_000);
    }
  });

  it('gives the header tank its night of logger readings whenever the demo is loaded', () => {
    for (const now of ['2026-12-04T01:13:00Z', '2026-12-04T05:31:00Z', '2026-12-04T12:00:00Z', '2026-12-04T23:50:00Z']) {
      const header = demoAt(now, 'Europe/Dublin').find((t) => t.code === 'MF-W1')!;
      expect(header.readings.filter((r) => r.source === 'logger').length, now).toBeGreaterThanOrEqual(4);
    }
  });
});
