import 'fake-indexeddb/auto';
// A round entry the server could not store because another reading of the tank holds the same
// moment: the round page names the tank, says what to do, and sends it again on the next press.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { freshDeviceDb, settleDevice } from './support/device';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import * as authApi from '@/api/auth';
import * as boardApi from '@/api/board';
import * as farmsApi from '@/api/farms';
import * as readingsApi from '@/api/readings';
import * as tanksApi from '@/api/tanks';
import RoundView from '@/views/RoundView.vue';
import { makeFarm, makeUser, sessionOf } from './support/fixtures';
import { mountWithApp, setViewportWidth } from './support/mountApp';
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
let pinia: Pinia;

beforeEach(async () => {
  await freshDeviceDb();
  vi.clearAllMocks();
  localStorage.clear();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  setViewportWidth(360);
  vi.mocked(authApi).fetchSession.mockResolvedValue(sessionOf(makeUser('worker')));
  vi.mocked(farmsApi).fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site')]);
  vi.mocked(tanksApi).fetchTanks.mockResolvedValue([water, culture]);
  vi.mocked(boardApi).fetchBoard.mockResolvedValue(makeBoard([makeFarmBoard(11, 'Creek site', [makeTile({ tankId: water.id, code: water.code })])]));
});

afterEach(() => setViewportWidth(1024));

describe('RoundView with a reading that met another at the same moment', () => {
  it('names the tank, keeps its reading open and sends it again on the next press', async () => {
    const reason = `${culture.name} (${culture.code}): not stored, because another reading of this tank is stored for the very same moment; check the tube and send it again to store it at a new time`;
    readings.submitRound
      .mockResolvedValueOnce({ results: [{ tankId: water.id, status: 'stored' }, { tankId: culture.id, status: 'conflict', reason }] })
      .mockResolvedValueOnce({ results: [{ tankId: culture.id, status: 'stored' }] });
    const { wrapper } = await mountWithApp(RoundView, { pinia, path: '/round' });
    await settleDevice();
    await wrapper.get('[data-testid="round-input-CS-W1"]').setValue('1140');
    await wrapper.get('[data-testid="round-input-CS-C1"]').setValue('600');

    await wrapper.get('[data-testid="round-submit"]').trigger('click');
    await settleDevice();

    expect(wrapper.get('[data-testid="round-result-CS-C1"]').text()).toBe('Not stored');
    expect(wrapper.get('[data-testid="round-error-CS-C1"]').text()).toBe(reason);
    expect(wrapper.get('[data-testid="round-conflicts"]').text()).toContain(`Not stored: ${culture.name}.`);
    expect(wrapper.get('[data-testid="round-summary"]').text()).toContain('1 stored, 1 not stored');
    expect((wrapper.get('[data-testid="round-input-CS-C1"]').element as HTMLInputElement).disabled).toBe(false);

    await wrapper.get('[data-testid="round-submit"]').trigger('click');
    await settleDevice();

    expect(readings.submitRound).toHaveBeenCalledTimes(2);
    expect(readings.submitRound.mock.calls[1]![0].entries.map((e) => e.tankId)).toEqual([culture.id]);
    expect(wrapper.find('[data-testid="round-conflicts"]').exists()).toBe(false);
    expect(wrapper.get('[data-testid="round-result-CS-C1"]').text()).toBe('Stored');
  });
});
