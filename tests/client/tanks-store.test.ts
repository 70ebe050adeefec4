import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import * as boardApi from '@/api/board';
import * as tanksApi from '@/api/tanks';
import { ApiError } from '@/api/http';
import { useTanksStore } from '@/stores/tanks';
import { boardOf, makeTank, makeTile } from './support/tankFixtures';

vi.mock('@/api/tanks', () => ({
  fetchTanks: vi.fn(),
  fetchTank: vi.fn(),
  createTank: vi.fn(),
  updateTank: vi.fn(),
  fetchContentsHistory: vi.fn(),
  fetchCalibration: vi.fn(),
  calibrationCsvUrl: vi.fn(),
  gaugeStripUrl: vi.fn(),
}));
vi.mock('@/api/board', () => ({ fetchBoard: vi.fn(), fetchBoardHistory: vi.fn() }));
vi.mock('@/api/auth', () => ({ fetchSession: vi.fn(), signIn: vi.fn(), signOut: vi.fn(), updateProfile: vi.fn(), setPassword: vi.fn(), requestPasswordReset: vi.fn(), fetchTokenInfo: vi.fn() }));

const api = vi.mocked(tanksApi);
const board = vi.mocked(boardApi);

beforeEach(() => {
  vi.clearAllMocks();
  setActivePinia(createPinia());
});

describe('useTanksStore', () => {
  it('lists a farm’s active tanks in walking order when the farm is loaded', async () => {
    api.fetchTanks.mockResolvedValue([
      makeTank(3, { walkOrder: 2, name: 'Header tank' }),
      makeTank(1, { walkOrder: 1, name: 'Bore tank' }),
      makeTank(2, { walkOrder: 1, name: 'Acid tote' }),
      makeTank(4, { walkOrder: 0, archivedAt: '2026-01-01T00:00:00.000Z' }),
    ]);
    const store = useTanksStore();

    await store.loadFarm(11);

    expect(api.fetchTanks).toHaveBeenCalledWith({ farmId: 11, includeArchived: true });
    expect(store.statusOf(11)).toBe('ready');
    expect(store.tanksOf(11).map((t) => t.name)).toEqual(['Acid tote', 'Bore tank', 'Header tank']);
    expect(store.tanksOf(12)).toEqual([]);
  });

  it('keeps the message and marks the farm failed when loading fails', async () => {
    api.fetchTanks.mockRejectedValue(new ApiError(0, 'network', 'Cannot reach the server.'));
    const store = useTanksStore();

    await store.loadFarm(11);

    expect(store.statusOf(11)).toBe('error');
    expect(store.farmError[11]).toBe('Cannot reach the server.');
  });

  it('adds a created tank to its farm and numbers the next one after the last', async () => {
    api.fetchTanks.mockResolvedValue([makeTank(1, { walkOrder: 4 })]);
    const created = makeTank(9, { walkOrder: 5 });
    api.createTank.mockResolvedValue(created);
    const store = useTanksStore();
    await store.loadFarm(11);

    expect(store.nextWalkOrder(11)).toBe(5);
    const input = { farmId: 11, name: 'Tank 9', code: 'CK-9', contents: 'water' as const, contentsNote: '', geometry: created.geometry, datumOffsetMm: 0, outletHeightMm: 50, lowStockL: 100, specificGravity: 1, sensorHeightMm: null, walkOrder: 5 };
    await store.create(input);

    expect(api.createTank).toHaveBeenCalledWith(input);
    expect(store.tanksOf(11).map((t) => t.id)).toEqual([1, 9]);
    expect(store.nextWalkOrder(11)).toBe(6);
  });

  it('swaps two tanks and saves only the walkOrders that changed when a tank moves up', async () => {
    api.fetchTanks.mockResolvedValue([makeTank(1, { walkOrder: 1 }), makeTank(2, { walkOrder: 2 }), makeTank(3, { walkOrder: 3 })]);
    api.updateTank.mockImplementation(async (id, input) => makeTank(id, { walkOrder: input.walkOrder }));
    const store = useTanksStore();
    await store.loadFarm(11);

    await store.move(3, -1);

    expect(api.updateTank.mock.calls).toEqual([
      [3, { walkOrder: 2 }],
      [2, { walkOrder: 3 }],
    ]);
    expect(store.tanksOf(11).map((t) => t.id)).toEqual([1, 3, 2]);
  });

  it('numbers tanks that all share walkOrder 0 when one of them moves down', async () => {
    api.fetchTanks.mockResolvedValue([makeTank(1, { walkOrder: 0, name: 'A' }), makeTank(2, { walkOrder: 0, name: 'B' })]);
    api.updateTank.mockImplementation(async (id, input) => makeTank(id, { walkOrder: input.walkOrder, name: id === 1 ? 'A' : 'B' }));
    const store = useTanksStore();
    await store.loadFarm(11);

    await store.move(1, 1);

    expect(api.updateTank.mock.calls).toEqual([
      [2, { walkOrder: 1 }],
      [1, { walkOrder: 2 }],
    ]);
    expect(store.tanksOf(11).map((t) => t.name)).toEqual(['B', 'A']);
  });

  it('does nothing when the first tank is moved up', async () => {
    api.fetchTanks.mockResolvedValue([makeTank(1, { walkOrder: 1 }), makeTank(2, { walkOrder: 2 })]);
    const store = useTanksStore();
    await store.loadFarm(11);

    await store.move(1, -1);

    expect(api.updateTank).not.toHaveBeenCalled();
  });

  it('reloads the farm and rethrows when saving the walking order fails', async () => {
    api.fetchTanks.mockResolvedValue([makeTank(1, { walkOrder: 1 }), makeTank(2, { walkOrder: 2 })]);
    api.updateTank.mockRejectedValue(new ApiError(403, 'forbidden', 'Only owners and managers change tanks'));
    const store = useTanksStore();
    await store.loadFarm(11);

    await expect(store.move(2, -1)).rejects.toThrow('Only owners and managers');

    expect(api.fetchTanks).toHaveBeenCalledTimes(2);
    expect(store.tanksOf(11).map((t) => t.id)).toEqual([1, 2]);
  });

  it('keeps contents history per tank and forgets it when the contents change', async () => {
    const period = { contents: 'water' as const, contentsNote: 'Bore', specificGravity: 1, from: '2026-01-01T00:00:00.000Z', to: null, changedBy: 'Dana Okafor' };
    api.fetchContentsHistory.mockResolvedValue([period]);
    api.updateTank.mockResolvedValue(makeTank(5, { contents: 'fertilizer' }));
    const store = useTanksStore();

    await store.loadContents(5);
    expect(store.contents[5]).toEqual([period]);

    await store.update(5, { name: 'Renamed' });
    expect(store.contents[5]).toEqual([period]);

    await store.update(5, { contents: 'fertilizer' });
    expect(store.contents[5]).toBeUndefined();
  });

  it('keeps each tank’s latest reading from the stock board', async () => {
    const a = makeTank(1);
    const b = makeTank(2, { farmId: 12 });
    board.fetchBoard.mockResolvedValue(boardOf([makeTile(a, 640), makeTile(b, null)]));
    const store = useTanksStore();

    await store.loadLatest();

    expect(store.latestStatus).toBe('ready');
    expect(store.latest[1]?.grossL).toBe(640);
    expect(store.latest[2]?.grossL).toBeNull();
  });

  it('loads one tank by id into the same list', async () => {
    api.fetchTank.mockResolvedValue(makeTank(7, { farmId: 12 }));
    const store = useTanksStore();

    const tank = await store.loadTank(7);

    expect(tank.id).toBe(7);
    expect(store.byId.get(7)?.farmId).toBe(12);
  });
});
