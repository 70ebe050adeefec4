import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { volumeAtLevel } from '@shared/calibration';
import type { Brew } from '@shared/schemas';
import * as authApi from '@/api/auth';
import * as boardApi from '@/api/board';
import * as brewsApi from '@/api/brews';
import * as inventoryApi from '@/api/inventory';
import * as tanksApi from '@/api/tanks';
import { ApiError } from '@/api/http';
import { useBrewsStore } from '@/stores/brews';
import { useSessionStore } from '@/stores/session';
import { makeUser, sessionOf } from './support/fixtures';
import { makeInput } from './support/inventoryFixtures';
import { boardOf, makeTank, makeTile } from './support/tankFixtures';

vi.mock('@/api/auth', () => ({ fetchSession: vi.fn(), signIn: vi.fn(), signOut: vi.fn(), updateProfile: vi.fn(), setPassword: vi.fn(), requestPasswordReset: vi.fn(), fetchTokenInfo: vi.fn() }));
vi.mock('@/api/brews', () => ({ fetchBrews: vi.fn(), createBrew: vi.fn(), updateBrew: vi.fn(), logBrewTemperature: vi.fn() }));
vi.mock('@/api/inventory', () => ({ fetchInputs: vi.fn() }));
vi.mock('@/api/tanks', () => ({ fetchTanks: vi.fn() }));
vi.mock('@/api/board', () => ({ fetchBoard: vi.fn(), fetchBoardHistory: vi.fn() }));

const auth = vi.mocked(authApi);
const api = vi.mocked(brewsApi);

// Exact definition: 1 US gallon = 231 in³ = 3.785411784 L (NIST Handbook 44, Appendix C).
const L_PER_USGAL = 3.785411784;

// An invented compost-tea batch of the Hollowbrook scenario.
function makeBrew(id: number, overrides: Partial<Brew> = {}): Brew {
  return {
    id, farmId: 11, farmName: 'Creek site', tankId: 5, tankName: 'Tank 5', tankCode: 'CK-5', kind: 'culture', name: 'Compost tea', status: 'brewing',
    startedAt: '2026-03-02T08:00:00.000Z', readyAt: null, waterL: 200, dilution: null, notes: '', createdBy: 'Tomas Lind', inputs: [], temperatures: [], ...overrides,
  };
}

async function signedIn(unitSystem: 'metric' | 'us') {
  auth.fetchSession.mockResolvedValue(sessionOf(makeUser('worker', { unitSystem })));
  await useSessionStore().load();
}

beforeEach(() => {
  vi.clearAllMocks();
  setActivePinia(createPinia());
});

describe('useBrewsStore', () => {
  it.each([
    ['metric', 120, 120],
    ['us', 10, 10 * L_PER_USGAL],
  ] as const)('sends the water in litres when a %s user types %s', async (system, typed, litres) => {
    await signedIn(system);
    api.createBrew.mockResolvedValue(makeBrew(1));
    const store = useBrewsStore();
    await store.create({ tankId: 5, kind: 'culture', name: 'Compost tea', waterVolume: typed, dilution: { n: 50, convention: 'parts-water' }, notes: '', inputs: [{ inputId: 9, quantity: 2 }] });
    const body = api.createBrew.mock.calls[0]![0];
    expect(body.waterL).toBeCloseTo(litres, 9);
    expect(body).not.toHaveProperty('waterVolume');
    expect(body.inputs).toEqual([{ inputId: 9, quantity: 2 }]);
    expect(store.brews.map((b) => b.id)).toEqual([1]);
  });

  it('keeps the list and rethrows when the server refuses a brew for want of stock', async () => {
    await signedIn('metric');
    api.createBrew.mockRejectedValue(new ApiError(409, 'insufficient_stock', 'inputs.0.quantity: only 1 L on hand', 'inputs.0.quantity'));
    const store = useBrewsStore();
    await expect(store.create({ tankId: 5, kind: 'culture', name: 'Tea', waterVolume: 10, dilution: null, notes: '', inputs: [{ inputId: 9, quantity: 2 }] })).rejects.toMatchObject({ field: 'inputs.0.quantity' });
    expect(store.brews).toEqual([]);
  });

  it('gives the ullage to the safe fill line from the latest board volume when the options load', async () => {
    await signedIn('metric');
    const tank = makeTank(5, { safeFillLevelMm: 1400 });
    vi.mocked(tanksApi.fetchTanks).mockResolvedValue([tank]);
    vi.mocked(inventoryApi.fetchInputs).mockResolvedValue([makeInput(9)]);
    vi.mocked(boardApi.fetchBoard).mockResolvedValue(boardOf([makeTile(tank, 600)]));
    const store = useBrewsStore();
    await store.loadFarmOptions(11);
    const fill = store.tankFill(tank)!;
    expect(fill.grossL).toBeCloseTo(600, 6);
    expect(fill.ullageL).toBeCloseTo(volumeAtLevel(tank.geometry, 1400) - 600, 6);
    expect(store.inputsOf(11).map((i) => i.id)).toEqual([9]);
  });

  it('logs a temperature typed in °F as °C', async () => {
    await signedIn('us');
    api.logBrewTemperature.mockResolvedValue(makeBrew(1));
    await useBrewsStore().logTemperature(1, 68);
    // 68 °F = 20 °C exactly (°C = (°F − 32) × 5/9, NIST SP 811, §B.9).
    expect(api.logBrewTemperature.mock.calls[0]![1].temperatureC).toBeCloseTo(20, 9);
  });
});
