import 'fake-indexeddb/auto';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { freshDeviceDb } from './support/device';
import { createPinia, setActivePinia } from 'pinia';
import { readingToVolumes } from '@shared/readings';
import type { RoundEntryResult, RoundSubmitInput } from '@shared/schemas';
import * as authApi from '@/api/auth';
import * as boardApi from '@/api/board';
import * as farmsApi from '@/api/farms';
import { ApiError } from '@/api/http';
import * as readingsApi from '@/api/readings';
import * as tanksApi from '@/api/tanks';
import { setupOf, useRoundStore } from '@/stores/round';
import { LEGACY_STORAGE_PREFIX } from '@/stores/round-saved';
import { useSessionStore } from '@/stores/session';
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

const auth = vi.mocked(authApi);
const farms = vi.mocked(farmsApi);
const tanks = vi.mocked(tanksApi);
const board = vi.mocked(boardApi);
const readings = vi.mocked(readingsApi);

const water = makeWaterTank();
const culture = makeCultureTank();
const KEY = /^[0-9a-f]{32}$/;
const offline = () => new ApiError(0, 'network', 'Cannot reach the server. Check your connection and try again.');
const stored = (tankId: number, grossL = 1000): RoundEntryResult => ({
  tankId,
  status: 'stored',
  reading: {
    id: tankId * 10,
    tankId,
    takenAt: '2026-03-02T09:30:00.000Z',
    levelMm: 1200,
    grossL,
    usableL: grossL - 100,
    temperatureC: null,
    source: 'round',
    enteredBy: 'Tomas Lind',
    importId: null,
    note: '',
    calibrationVersion: 'v',
    correctedById: null,
    correctsId: null,
  },
});
const sent = (call: number): RoundSubmitInput => readings.submitRound.mock.calls[call]![0];

/** A fresh Pinia on the same device (IndexedDB survives), as after a reload. */
async function freshStore(unitSystem: 'metric' | 'us' = 'metric') {
  setActivePinia(createPinia());
  auth.fetchSession.mockResolvedValue(sessionOf(makeUser('worker', { unitSystem })));
  await useSessionStore().load();
  const round = useRoundStore();
  await round.start();
  return round;
}

beforeEach(async () => {
  vi.clearAllMocks();
  localStorage.clear();
  await freshDeviceDb();
  farms.fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site'), makeFarm(12, 'Ridge block')]);
  // Every farm's tanks come in one list (both fixtures are on farm 11).
  tanks.fetchTanks.mockImplementation(async ({ farmId } = {}) => [water, culture].filter((t) => farmId === undefined || t.farmId === farmId));
  board.fetchBoard.mockResolvedValue(
    makeBoard([makeFarmBoard(11, 'Creek site', [makeTile({ tankId: water.id, code: water.code, grossL: 12_000, usableL: 10_800, takenAt: '2026-03-01T07:00:00.000Z' })])]),
  );
});

describe('useRoundStore', () => {
  it('lists the first farm’s tanks in walking order with the board’s last reading', async () => {
    const round = await freshStore();

    expect(round.farmId).toBe(11);
    expect(tanks.fetchTanks).toHaveBeenCalledWith();
    expect(round.rows.map((r) => r.tank.code)).toEqual(['CS-W1', 'CS-C1']);
    expect(round.rows[0]!.last).toEqual({ takenAt: '2026-03-01T07:00:00.000Z', grossL: 12_000, usableL: 10_800 });
    expect(round.rows[1]!.last).toBeNull();
  });

  it('computes litres and percent full while typing, with the shared reading function', async () => {
    const round = await freshStore();

    round.setReading(water.id, '1140');

    // 1140 mm on the tube + 60 mm datum = 1200 mm of liquid in an upright cylinder 3.2 m across:
    // V = π r² h = π × 1.6² × 1.2 m³ = 9.650973 m³ (right circular cylinder, CRC Standard Mathematical
    // Tables and Formulae, solids; formula recalled from memory, not re-checked). Usable starts at the
    // outlet (150 mm): π × 1.6² × 1.05 m³ = 8.444602 m³. Half the height of a cylinder is half its volume.
    const preview = round.rows[0]!.reading;
    expect(preview.state).toBe('ok');
    if (preview.state !== 'ok') return;
    expect(preview.readingMm).toBe(1140);
    expect(preview.levelMm).toBe(1200);
    expect(preview.grossL).toBeCloseTo(9650.973, 2);
    expect(preview.usableL).toBeCloseTo(8444.602, 2);
    expect(preview.percentFull).toBeCloseTo(50, 9);
  });

  it('converts a reading typed in inches for a US user before computing', async () => {
    const round = await freshStore('us');

    round.setReading(water.id, '45');

    // 45 in × 25.4 mm/in (exact, NIST Handbook 44 Appendix C) = 1143 mm; level 1203 mm;
    // π × 1.6² × 1.203 m³ = 9.675101 m³ (cylinder formula as above).
    const preview = round.rows[0]!.reading;
    expect(round.rows[0]!.entry.readingUnit).toBe('in');
    expect(preview.state === 'ok' && preview.readingMm).toBeCloseTo(1143, 9);
    expect(preview.state === 'ok' && preview.grossL).toBeCloseTo(9675.101, 2);
  });

  it('refuses an out-of-range reading on the spot with the reason the shared function gives', async () => {
    const round = await freshStore();

    round.setReading(water.id, '2400');

    const expected = readingToVolumes(setupOf(water), { kind: 'sight-tube', readingMm: 2400 });
    expect(expected.ok).toBe(false);
    const preview = round.rows[0]!.reading;
    expect(preview).toEqual({ state: 'invalid', reason: expected.ok ? '' : expected.reason });
    expect(round.rows[0]!.problem).toMatch(/above the top of the tank/);

    await round.submit();
    expect(readings.submitRound).not.toHaveBeenCalled();
    expect(round.submitProblem).toEqual({ kind: 'invalid', message: 'Fix or clear CS-W1 before sending.' });
  });

  it('makes one key per entry when it is first typed and keeps it while the reading is edited', async () => {
    const round = await freshStore();

    round.setReading(water.id, '1');
    const key = round.rows[0]!.entry.idempotencyKey;
    round.setReading(water.id, '1140');
    round.setReading(culture.id, '600');

    expect(key).toMatch(KEY);
    expect(round.rows[0]!.entry.idempotencyKey).toBe(key);
    expect(round.rows[1]!.entry.idempotencyKey).toMatch(KEY);
    expect(round.rows[1]!.entry.idempotencyKey).not.toBe(key);
  });

  it('keeps the entries, their keys and the round time across a retry after a network error', async () => {
    readings.submitRound.mockRejectedValueOnce(offline()).mockResolvedValueOnce({ results: [stored(water.id), stored(culture.id)] });
    const round = await freshStore();
    round.setReading(water.id, '1140');
    round.setReading(culture.id, '600');

    await round.submit();
    expect(round.submitProblem?.kind).toBe('network');
    expect(round.rows.map((r) => r.entry.reading)).toEqual(['1140', '600']);
    expect(round.rows.every((r) => r.entry.result === null)).toBe(true);

    await round.submit();
    expect(readings.submitRound).toHaveBeenCalledTimes(2);
    expect(sent(1).entries.map((e) => e.idempotencyKey)).toEqual(sent(0).entries.map((e) => e.idempotencyKey));
    expect(sent(1).takenAt).toBe(sent(0).takenAt);
    expect(sent(0).entries.map((e) => e.readingMm)).toEqual([1140, 600]);
    expect(round.submitProblem).toBeNull();
    expect(round.summary).toMatchObject({ stored: 2, complete: true, text: '2 stored' });
  });

  it('keeps a round typed offline on the device, so a reload sends it with the same keys', async () => {
    readings.submitRound.mockRejectedValueOnce(offline());
    const first = await freshStore();
    first.setReading(water.id, '1140');
    first.setNote(water.id, 'float valve sticks');
    await first.submit();
    const key = first.rows[0]!.entry.idempotencyKey;
    const takenAt = sent(0).takenAt;

    readings.submitRound.mockResolvedValueOnce({ results: [stored(water.id)] });
    const again = await freshStore();
    expect(again.rows[0]!.entry).toMatchObject({ reading: '1140', note: 'float valve sticks', idempotencyKey: key });
    await again.submit();

    expect(sent(1).entries).toEqual([{ tankId: water.id, readingMm: 1140, note: 'float valve sticks', idempotencyKey: key }]);
    expect(sent(1).takenAt).toBe(takenAt);
  });

  it('shows the server’s refusal reason and sends only that entry again once it is corrected', async () => {
    readings.submitRound
      .mockResolvedValueOnce({ results: [stored(water.id), { tankId: culture.id, status: 'refused', reason: 'This tank is archived' }] })
      .mockResolvedValueOnce({ results: [stored(culture.id, 300)] });
    const round = await freshStore();
    round.setReading(water.id, '1140');
    round.setReading(culture.id, '600');

    await round.submit();
    expect(round.rows[1]!.entry.result).toEqual({ status: 'refused', reason: 'This tank is archived' });
    expect(round.summary).toMatchObject({ stored: 1, refused: 1, complete: false, text: '1 stored, 1 refused' });
    expect(round.toSend).toHaveLength(0);
    const cultureKey = sent(0).entries[1]!.idempotencyKey;

    round.setReading(water.id, '999');
    expect(round.rows[0]!.entry.reading).toBe('1140');
    round.setReading(culture.id, '610');
    expect(round.rows[1]!.entry.result).toBeNull();
    await round.submit();

    expect(sent(1).entries).toEqual([expect.objectContaining({ tankId: culture.id, readingMm: 610, idempotencyKey: cultureKey })]);
    expect(sent(1).takenAt).toBe(sent(0).takenAt);
    expect(round.summary).toMatchObject({ stored: 2, refused: 0, complete: true, text: '2 stored' });
  });

  it('names a tank whose reading met another reading at the same moment and sends it again at a new time with its key', async () => {
    vi.useFakeTimers({ toFake: ['Date'] });
    try {
      readings.submitRound
        .mockResolvedValueOnce({ results: [stored(water.id), { tankId: culture.id, status: 'conflict', reason: `${culture.name} (${culture.code}): not stored, because another reading of this tank is stored for the very same moment` }] })
        .mockResolvedValueOnce({ results: [stored(culture.id, 300)] });
      vi.setSystemTime(new Date('2026-03-02T09:30:00.000Z'));
      const round = await freshStore();
      round.setReading(water.id, '1140');
      round.setReading(culture.id, '600');
      vi.setSystemTime(new Date('2026-03-02T09:30:05.000Z'));

      await round.submit();
      expect(round.rows[1]!.locked).toBe(false);
      expect(round.rows[1]!.entry.result).toMatchObject({ status: 'conflict', reason: expect.stringContaining(culture.name) });
      expect(round.summary).toMatchObject({ stored: 1, conflict: 1, complete: false, conflictNames: [culture.name], text: '1 stored, 1 not stored' });
      expect(round.toSend.map((r) => r.tank.id)).toEqual([culture.id]);

      await round.submit();
      expect(sent(1).entries).toEqual([expect.objectContaining({ tankId: culture.id, readingMm: 600, idempotencyKey: sent(0).entries[1]!.idempotencyKey })]);
      expect(sent(1).takenAt).not.toBe(sent(0).takenAt);
      expect(round.summary).toMatchObject({ stored: 2, conflict: 0, complete: true, text: '2 stored' });
    } finally {
      vi.useRealTimers();
    }
  });

  it('reports entries the server already had as already stored', async () => {
    const earlier = stored(water.id, 9651);
    readings.submitRound.mockResolvedValueOnce({ results: [{ ...earlier, status: 'duplicate' }] });
    const round = await freshStore();
    round.setReading(water.id, '1140');

    await round.submit();

    expect(round.rows[0]!.locked).toBe(true);
    expect(round.rows[0]!.last).toEqual({ takenAt: '2026-03-02T09:30:00.000Z', grossL: 9651, usableL: 9551 });
    expect(round.summary.text).toBe('1 already stored');
  });

  it('marks each entry refused with the server’s reason when the whole round is refused, keeping what was typed', async () => {
    readings.submitRound.mockRejectedValueOnce(new ApiError(409, 'farm_archived', 'This farm is archived; restore it before entering readings'));
    const round = await freshStore();
    round.setReading(water.id, '1140');

    await round.submit();

    expect(round.rows[0]!.entry.result).toEqual({ status: 'refused', reason: 'This farm is archived; restore it before entering readings' });
    expect(round.rows[0]!.entry.reading).toBe('1140');
    expect(round.rows[0]!.waiting).toBe(false);
    expect(round.summary.text).toBe('1 refused');
  });

  it('keeps a sent round waiting while the server is away (503) and sends it with the same keys when it answers', async () => {
    readings.submitRound.mockRejectedValueOnce(new ApiError(503, 'database_down', 'The database is not reachable right now; try again shortly')).mockResolvedValueOnce({ results: [stored(water.id)] });
    const round = await freshStore();
    round.setReading(water.id, '1140');

    await round.submit();
    expect(round.rows[0]!.waiting).toBe(true);
    expect(round.submitProblem?.kind).toBe('server');
    round.setReading(water.id, '999');
    expect(round.rows[0]!.entry.reading).toBe('1140');

    await round.submit();
    expect(sent(1)).toEqual(sent(0));
    expect(round.rows[0]!.locked).toBe(true);
    expect(round.submitProblem).toBeNull();
  });

  it('moves a round an earlier version kept in localStorage into the device database once', async () => {
    const user = makeUser('worker');
    const draft = { farmId: 11, takenAt: null, entries: { [water.id]: { tankId: water.id, reading: '1140', readingUnit: 'mm', temperature: '', temperatureUnit: 'C', temperatureOpen: false, note: '', idempotencyKey: 'a'.repeat(32), confirmed: false, editedAt: '2026-03-02T09:00:00.000Z', result: null } } };
    localStorage.setItem(`${LEGACY_STORAGE_PREFIX}${user.id}`, JSON.stringify({ v: 1, lastFarmId: 11, drafts: { 11: draft }, copies: {} }));

    const round = await freshStore();
    expect(round.rows[0]!.entry).toMatchObject({ reading: '1140', idempotencyKey: 'a'.repeat(32) });
    expect(localStorage.getItem(`${LEGACY_STORAGE_PREFIX}${user.id}`)).toBeNull();

    const again = await freshStore();
    expect(again.rows[0]!.entry.reading).toBe('1140');
  });

  it('shows the temperature of culture tanks by default and sends it in °C', async () => {
    readings.submitRound.mockResolvedValueOnce({ results: [stored(culture.id)] });
    const round = await freshStore('us');
    expect(round.rows.map((r) => r.showTemperature)).toEqual([false, true]);

    round.setReading(culture.id, '20');
    round.setTemperature(culture.id, '68');
    await round.submit();

    // 68 °F = (68 − 32) / 1.8 °C = 20 °C (NIST SP 811, 2008, B.9 temperature conversion).
    expect(sent(0).entries[0]!.temperatureC).toBeCloseTo(20, 9);
  });

  it('refuses a temperature outside the schema’s range with its message', async () => {
    const round = await freshStore();
    round.setReading(culture.id, '600');
    round.setTemperature(culture.id, '95');

    expect(round.rows[1]!.temperature).toEqual({ state: 'invalid', reason: 'Temperature must be 90 °C or less' });
    expect(round.rows[1]!.payload).toBeNull();
  });

  it.each([
    ['17.5', true],
    ['18', false],
    ['24', false],
  ])('warns of a cold culture at %s °C: %s', async (text, warned) => {
    const round = await freshStore();
    round.setReading(culture.id, '600');
    round.setTemperature(culture.id, text);

    // 18 °C: common practice for when cultures go inactive (PRODUCT.md; no published source).
    expect(round.rows[1]!.warning !== null).toBe(warned);
    expect(round.rows[1]!.payload).not.toBeNull();
  });

  it('remembers the last farm chosen on this device', async () => {
    const round = await freshStore();
    await round.selectFarm(12);

    const again = await freshStore();

    expect(again.farmId).toBe(12);
    expect(again.rows).toEqual([]);
  });

  it('walks on from the device’s copy of the tanks when there is no signal', async () => {
    await freshStore();
    tanks.fetchTanks.mockRejectedValue(offline());
    board.fetchBoard.mockRejectedValue(offline());

    const round = await freshStore();
    round.setReading(water.id, '1140');

    expect(round.status).toBe('ready');
    expect(round.copySavedAt).not.toBeNull();
    expect(round.rows.map((r) => r.tank.code)).toEqual(['CS-W1', 'CS-C1']);
    expect(round.rows[0]!.reading.state).toBe('ok');
  });

  it('starts a new round with new keys once the last one is stored', async () => {
    readings.submitRound.mockResolvedValueOnce({ results: [stored(water.id)] });
    const round = await freshStore();
    round.setReading(water.id, '1140');
    await round.submit();
    const oldKey = round.rows[0]!.entry.idempotencyKey;

    round.newRound();
    round.setReading(water.id, '1100');

    expect(round.rows[0]!.entry.result).toBeNull();
    expect(round.rows[0]!.entry.idempotencyKey).toMatch(KEY);
    expect(round.rows[0]!.entry.idempotencyKey).not.toBe(oldKey);
  });

  it('does not show one person’s saved round to the next person on the device', async () => {
    readings.submitRound.mockRejectedValueOnce(offline());
    const first = await freshStore();
    first.setReading(water.id, '1140');
    await first.submit();

    setActivePinia(createPinia());
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('manager')));
    await useSessionStore().load();
    const other = useRoundStore();
    await other.start();

    expect(other.rows[0]!.entry.reading).toBe('');
  });
});
