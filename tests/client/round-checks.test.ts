// The round store's input traps: numbers read in the person's decimal mark, the questions a big
// change of stock or a culture outside its safe range raise before the round sends, and the counter.
// Limits: 50 % of the last stock and cultures safe from 18 °C to 40 °C (common practice, no published
// source; shared/readings/checks.ts).
import 'fake-indexeddb/auto';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import type { RoundSubmitInput } from '@shared/schemas';
import * as authApi from '@/api/auth';
import * as boardApi from '@/api/board';
import * as farmsApi from '@/api/farms';
import * as readingsApi from '@/api/readings';
import * as tanksApi from '@/api/tanks';
import { useRoundStore } from '@/stores/round';
import { useSessionStore } from '@/stores/session';
import { freshDeviceDb, settleDevice } from './support/device';
import { makeFarm, makeUser, sessionOf } from './support/fixtures';
import { makeBoard, makeCultureTank, makeFarmBoard, makeTile, makeWaterTank } from './support/tanks';

vi.mock('@/api/auth', () => ({
  fetchSession: vi.fn(),
  signIn: vi.fn(),
  signOut: vi.fn(),
  updateProfile: vi.fn(),
  setPassword: vi.fn(),
  requestPasswordReset: vi.fn(),
  fetchTokenInfo: vi.fn(),
}));
vi.mock('@/api/farms', () => ({ fetchFarms: vi.fn(), fetchFarm: vi.fn(), createFarm: vi.fn(), updateFarm: vi.fn() }));
vi.mock('@/api/tanks', () => ({ fetchTanks: vi.fn() }));
vi.mock('@/api/board', () => ({ fetchBoard: vi.fn(), fetchBoardHistory: vi.fn() }));
vi.mock('@/api/readings', () => ({ submitRound: vi.fn() }));

const readings = vi.mocked(readingsApi);
const water = makeWaterTank();
const culture = makeCultureTank();
const sent = (call: number): RoundSubmitInput => readings.submitRound.mock.calls[call]![0];

async function freshStore(unitSystem: 'metric' | 'us' = 'metric') {
  setActivePinia(createPinia());
  vi.mocked(authApi).fetchSession.mockResolvedValue(sessionOf(makeUser('worker', { unitSystem })));
  await useSessionStore().load();
  const round = useRoundStore();
  await round.start();
  return round;
}

beforeEach(async () => {
  await freshDeviceDb();
  vi.clearAllMocks();
  localStorage.clear();
  vi.mocked(farmsApi).fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site')]);
  vi.mocked(tanksApi).fetchTanks.mockResolvedValue([water, culture]);
  // The water tank last held 6,273 L.
  vi.mocked(boardApi).fetchBoard.mockResolvedValue(
    makeBoard([makeFarmBoard(11, 'Creek site', [makeTile({ tankId: water.id, code: water.code, grossL: 6273, usableL: 5067, takenAt: '2026-03-01T07:00:00.000Z' })])]),
  );
  readings.submitRound.mockResolvedValue({ results: [] });
});

describe('round readings in the person’s decimal mark', () => {
  it.each<[string, '.' | ',', number, string | null]>([
    ['1,250', '.', 1250, 'Read as 1250 mm'],
    ['1,250', ',', 1.25, 'Read as 1,25 mm'],
    ['1.250', ',', 1250, 'Read as 1250 mm'],
    ['1.250,5', ',', 1250.5, null],
    ['1,250.5', '.', 1250.5, null],
    ['1 250', '.', 1250, null],
    ['12,5', '.', 12.5, null],
    ['12.', '.', 12, null],
    [' 980 ', ',', 980, null],
  ])('reads %j with a decimal %j as %d mm and offers only that reading', async (text, mark, readingMm, readAs) => {
    const round = await freshStore();
    round.decimalMark = mark;

    round.setReading(water.id, text);

    expect(round.rows[0]!.reading).toMatchObject({ state: 'ok', readingMm, readAs });
  });

  it('takes the decimal mark from the browser’s language by default', async () => {
    const round = await freshStore();
    // jsdom's navigator speaks en-US, whose decimal mark is a point (Unicode CLDR).
    expect(navigator.language).toBe('en-US');
    expect(round.decimalMark).toBe('.');
  });

  it.each<['.' | ',', string]>([
    ['.', 'Sight-tube reading "12a" is not a number: type it like 1250'],
    [',', 'Sight-tube reading "12a" is not a number: type it like 1250'],
  ])('refuses text that is no number naming the field (decimal %j)', async (mark, reason) => {
    const round = await freshStore();
    round.decimalMark = mark;
    round.setReading(water.id, '12a');
    expect(round.rows[0]!.reading).toEqual({ state: 'invalid', reason });
  });

  it('offers a temperature example in the person’s decimal mark and reads a comma temperature', async () => {
    const round = await freshStore();
    round.decimalMark = ',';
    round.setReading(culture.id, '600');

    round.setTemperature(culture.id, 'warm');
    expect(round.rows[1]!.temperature).toEqual({ state: 'invalid', reason: 'Temperature "warm" is not a number: type it like 21,5' });
    round.setTemperature(culture.id, '21,5');
    expect(round.rows[1]!.temperature).toEqual({ state: 'ok', temperatureC: 21.5 });
  });
});

describe('round questions before sending', () => {
  it('asks before a reading that moves the stock by more than half since the last one, and sends it only once answered', async () => {
    const round = await freshStore();

    // 0 mm on the tube + 60 mm datum in the 3.2 m cylinder: π × 1.6² × 0.06 m³ = 482.5 L (V = π r² h, recalled
    // from memory); from 6,273 L that is a fall of 5,790 L, 92 % of the last stock.
    round.setReading(water.id, '0');
    expect(round.rows[0]!.questions).toEqual(['483 L in the tank, down from 6,273 L at the last reading (92 % less). Is the reading right?']);
    expect(round.rows[0]!.awaitingAnswer).toBe(true);

    await round.submit();
    expect(readings.submitRound).not.toHaveBeenCalled();
    expect(round.submitProblem).toEqual({ kind: 'invalid', message: 'Answer the question on CS-W1 (or correct the reading) before sending.' });

    round.confirmEntry(water.id, true);
    expect(round.rows[0]!.awaitingAnswer).toBe(false);
    await round.submit();
    expect(readings.submitRound).toHaveBeenCalledTimes(1);
    expect(sent(0).entries).toEqual([expect.objectContaining({ tankId: water.id, readingMm: 0 })]);
  });

  it('asks afresh when an answered reading is changed, and not at all once it is corrected to a likely one', async () => {
    const round = await freshStore();
    round.setReading(water.id, '0');
    round.confirmEntry(water.id, true);

    round.setReading(water.id, '5');
    expect(round.rows[0]!.awaitingAnswer).toBe(true);

    // 700 + 60 mm: π × 1.6² × 0.76 m³ = 6,112 L, 2.6 % under the last 6,273 L.
    round.setReading(water.id, '700');
    expect(round.rows[0]!.questions).toEqual([]);
    expect(round.rows[0]!.awaitingAnswer).toBe(false);
  });

  it('keeps an answer on the device with the round', async () => {
    const first = await freshStore();
    first.setReading(water.id, '0');
    first.confirmEntry(water.id, true);
    await settleDevice();

    const again = await freshStore();
    expect(again.rows[0]!.entry.confirmed).toBe(true);
    expect(again.rows[0]!.awaitingAnswer).toBe(false);
  });

  it('asks about a 45 °C culture, warns of its heater and does not send it unanswered', async () => {
    const round = await freshStore();
    round.setReading(culture.id, '600');
    round.setTemperature(culture.id, '45');

    expect(round.rows[1]!.questions).toEqual(['45.0 °C is above 40 °C, the warmest a culture stays safe at. Is the thermometer reading right?']);
    expect(round.rows[1]!.warning).toMatch(/^Above about 40 °C a culture is harmed/);
    await round.submit();
    expect(readings.submitRound).not.toHaveBeenCalled();
    expect(round.submitProblem?.message).toMatch(/CS-C1/);
  });

  it('asks about a culture in °F against the range in °F', async () => {
    const round = await freshStore('us');
    round.setReading(culture.id, '20');
    // 113 °F = (113 − 32) / 1.8 = 45 °C; 40 °C = 104 °F (NIST SP 811, 2008, B.9).
    round.setTemperature(culture.id, '113');
    expect(round.rows[1]!.questions).toEqual(['113.0 °F is above 104 °F, the warmest a culture stays safe at. Is the thermometer reading right?']);
  });

  it('asks about a cold culture against the farm’s own limit', async () => {
    vi.mocked(farmsApi).fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site', { coldCultureC: 22 })]);
    const round = await freshStore();
    round.setReading(culture.id, '600');
    round.setTemperature(culture.id, '20');

    expect(round.coldCultureC).toBe(22);
    expect(round.rows[1]!.questions).toEqual(['20.0 °C is below 22 °C, where a culture goes inactive. Is the thermometer reading right?']);
    expect(round.rows[1]!.warning).toBe('Below about 22 °C a culture goes inactive: check its heater.');
  });

  it('asks nothing of a reading within half of the last stock or of a tank never read', async () => {
    const round = await freshStore();
    round.setReading(water.id, '700');
    round.setReading(culture.id, '600');
    round.setTemperature(culture.id, '24');
    expect(round.rows.map((r) => r.questions)).toEqual([[], []]);
  });
});

describe('round progress', () => {
  it('counts only valid entries as ready and names the tanks still to fix or to answer', async () => {
    const round = await freshStore();
    expect(round.progress).toEqual({ total: 2, ready: 0, toFix: [], toAnswer: [] });

    round.setReading(water.id, '2400');
    round.setReading(culture.id, '600');
    expect(round.progress).toEqual({ total: 2, ready: 1, toFix: ['CS-W1'], toAnswer: [] });

    round.setReading(water.id, '0');
    round.setTemperature(culture.id, '95');
    expect(round.progress).toEqual({ total: 2, ready: 0, toFix: ['CS-C1'], toAnswer: ['CS-W1'] });

    round.confirmEntry(water.id, true);
    round.setTemperature(culture.id, '24');
    expect(round.progress).toEqual({ total: 2, ready: 2, toFix: [], toAnswer: [] });
  });
});
