import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import type { Role } from '@shared/schemas';
import { formatVolume } from '@shared/units';
import * as authApi from '@/api/auth';
import * as boardApi from '@/api/board';
import * as farmsApi from '@/api/farms';
import * as tanksApi from '@/api/tanks';
import { ApiError } from '@/api/http';
import FarmView from '@/views/FarmView.vue';
import { setLanguage } from '@/i18n';
import { englishLeft } from './support/englishLeft';
import { makeFarm, makeUser, sessionOf } from './support/fixtures';
import { mountWithApp } from './support/mountApp';
import { boardOf, makeTank, makeTile } from './support/tankFixtures';

vi.mock('@/api/auth', () => ({ fetchSession: vi.fn(), signIn: vi.fn(), signOut: vi.fn(), updateProfile: vi.fn(), setPassword: vi.fn(), requestPasswordReset: vi.fn(), fetchTokenInfo: vi.fn() }));
vi.mock('@/api/tanks', () => ({
  fetchTanks: vi.fn(),
  fetchTank: vi.fn(),
  createTank: vi.fn(),
  updateTank: vi.fn(),
  fetchContentsHistory: vi.fn(),
  fetchCalibration: vi.fn(),
  calibrationCsvUrl: vi.fn(),
  gaugeStripUrl: vi.fn(),
  tankLabelUrl: vi.fn(),
}));
vi.mock('@/api/board', () => ({ fetchBoard: vi.fn(), fetchBoardHistory: vi.fn() }));
vi.mock('@/api/farms', () => ({ fetchFarms: vi.fn(), fetchFarm: vi.fn(), createFarm: vi.fn(), updateFarm: vi.fn(), farmLabelsUrl: vi.fn(), fetchFarmFrost: vi.fn() }));

const auth = vi.mocked(authApi);
const board = vi.mocked(boardApi);
const farms = vi.mocked(farmsApi);
const tanks = vi.mocked(tanksApi);
let pinia: Pinia;

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  farms.fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site')]);
  farms.fetchFarmFrost.mockResolvedValue({ farmId: 11, located: false, thresholdC: 2, fetchedAt: null, stale: false, problem: null, triedAt: null, hours: [], frost: null });
  board.fetchBoard.mockResolvedValue(boardOf([]));
});

function as(role: Role, unitSystem: 'metric' | 'us' = 'metric', language: 'en' | 'es' | 'fr' | null = null) {
  auth.fetchSession.mockResolvedValue(sessionOf(makeUser(role, { unitSystem, language })));
}

describe('FarmView', () => {
  it('shows the farm’s tanks in walking order with capacity in the user’s units and the latest level', async () => {
    as('manager', 'us');
    const first = makeTank(1, { walkOrder: 1, name: 'Bore tank' });
    const second = makeTank(2, { walkOrder: 2, name: 'Fish tote', contents: 'fertilizer' });
    tanks.fetchTanks.mockResolvedValue([second, first]);
    board.fetchBoard.mockResolvedValue(boardOf([makeTile(first, 640), makeTile(second, null)]));
    const { wrapper } = await mountWithApp(FarmView, { pinia, path: '/farms/11' });

    expect(tanks.fetchTanks).toHaveBeenCalledWith({ farmId: 11, includeArchived: true });
    const cards = wrapper.findAll('[data-testid^="tank-card-"]');
    expect(cards.map((c) => c.get('.tank-card__name').text())).toEqual(['Bore tank', 'Fish tote']);
    expect(cards[0]!.text()).toContain(formatVolume(first.capacityL, 'us'));
    expect(wrapper.get('[data-testid="tank-level-1"]').text()).toContain(formatVolume(640, 'us'));
    expect(wrapper.get('[data-testid="tank-level-2"]').text()).toContain('No reading yet');
    expect(cards[1]!.find('[data-testid="contents-fertilizer"]').exists()).toBe(true);
    expect(wrapper.find('[data-testid="farm-add-tank"]').exists()).toBe(true);
  });

  it('shows each read tank’s days of cover, amber when under three days are left', async () => {
    as('manager');
    const water = makeTank(1, { walkOrder: 1 });
    const tote = makeTank(2, { walkOrder: 2, contents: 'fertilizer' });
    const idle = makeTank(3, { walkOrder: 3 });
    tanks.fetchTanks.mockResolvedValue([water, tote, idle]);
    board.fetchBoard.mockResolvedValue(
      boardOf([
        { ...makeTile(water, 1_200), useLPerDay: 95, daysOfCover: 12.6 },
        { ...makeTile(tote, 90), useLPerDay: 40, daysOfCover: 2.25 },
        { ...makeTile(idle, 800), useLPerDay: 0, daysOfCover: null },
      ]),
    );
    const { wrapper } = await mountWithApp(FarmView, { pinia, path: '/farms/11' });

    expect(wrapper.get('[data-testid="tank-cover-1"]').text()).toMatch(/≈ 13 days left\s*at 95 L\/day/);
    expect(wrapper.get('[data-testid="tank-cover-1"]').classes()).not.toContain('cover--short');
    // Two days and more are shown in whole days: 2.25 → 2.
    expect(wrapper.get('[data-testid="tank-cover-2"]').text()).toContain('≈ 2 days left');
    expect(wrapper.get('[data-testid="tank-cover-2"]').classes()).toContain('cover--short');
    expect(wrapper.get('[data-testid="tank-cover-3"]').text()).toBe('No use seen');
  });

  it('offers no adding or reordering to a worker', async () => {
    as('worker');
    tanks.fetchTanks.mockResolvedValue([makeTank(1), makeTank(2)]);
    const { wrapper } = await mountWithApp(FarmView, { pinia, path: '/farms/11' });

    expect(wrapper.findAll('[data-testid^="tank-card-"]')).toHaveLength(2);
    expect(wrapper.find('[data-testid="farm-add-tank"]').exists()).toBe(false);
    expect(wrapper.find('[data-testid="tank-up-2"]').exists()).toBe(false);
  });

  it('moves a tank up by saving the new walking order', async () => {
    as('owner');
    tanks.fetchTanks.mockResolvedValue([makeTank(1, { walkOrder: 1 }), makeTank(2, { walkOrder: 2 })]);
    tanks.updateTank.mockImplementation(async (id, input) => makeTank(id, { walkOrder: input.walkOrder }));
    const { wrapper } = await mountWithApp(FarmView, { pinia, path: '/farms/11' });

    expect(wrapper.get('[data-testid="tank-up-1"]').attributes('disabled')).toBeDefined();
    await wrapper.get('[data-testid="tank-up-2"]').trigger('click');
    await flushPromises();

    expect(tanks.updateTank).toHaveBeenCalledWith(2, { walkOrder: 1 });
    expect(tanks.updateTank).toHaveBeenCalledWith(1, { walkOrder: 2 });
    expect(wrapper.findAll('[data-testid^="tank-card-"]').map((c) => c.attributes('data-testid'))).toEqual(['tank-card-2', 'tank-card-1']);
  });

  it('says so when the farm has no tanks yet', async () => {
    as('manager');
    tanks.fetchTanks.mockResolvedValue([]);
    const { wrapper } = await mountWithApp(FarmView, { pinia, path: '/farms/11' });

    expect(wrapper.get('[data-testid="empty-state"]').text()).toContain('No tanks on this farm yet');
  });

  it('shows a failed load with a retry that loads again', async () => {
    as('manager');
    tanks.fetchTanks.mockRejectedValueOnce(new ApiError(0, 'network', 'Cannot reach the server.')).mockResolvedValueOnce([makeTank(1)]);
    const { wrapper } = await mountWithApp(FarmView, { pinia, path: '/farms/11' });

    expect(wrapper.get('[data-testid="load-error"]').text()).toContain('Cannot reach the server.');
    await wrapper.get('[data-testid="load-retry"]').trigger('click');
    await flushPromises();
    expect(wrapper.find('[data-testid="tank-card-1"]').exists()).toBe(true);
  });
});

describe('FarmView in French', () => {
  afterEach(() => setLanguage('en'));

  it('shows the tanks, their cover and the frost forecast in French, with no English sentence of the farm page left', async () => {
    as('manager', 'metric', 'fr');
    const water = makeTank(1, { walkOrder: 1, name: 'Cuve du forage' });
    const idle = makeTank(2, { walkOrder: 2, name: 'Cuve haute' });
    tanks.fetchTanks.mockResolvedValue([water, idle]);
    board.fetchBoard.mockResolvedValue(boardOf([{ ...makeTile(water, 1_200), useLPerDay: 95, daysOfCover: 1.44 }]));
    farms.fetchFarmFrost.mockResolvedValue({
      farmId: 11,
      located: true,
      thresholdC: 2,
      fetchedAt: '2026-03-01T06:00:00.000Z',
      stale: true,
      problem: 'timeout',
      triedAt: null,
      hours: [],
      frost: { lowC: -1.8, at: '2026-03-03T04:00:00.000Z' },
    });
    const { wrapper } = await mountWithApp(FarmView, { pinia, path: '/farms/11' });

    // Under two days, one decimal and the French singular (0 ≤ n < 2): "1,4 jour".
    expect(wrapper.get('[data-testid="tank-cover-1"]').text()).toMatch(/^Reste ≈ 1,4 jour\s*à 95 L\/jour$/);
    expect(wrapper.get('[data-testid="tank-level-2"]').text()).toBe('Pas encore de relevé.');
    expect(wrapper.get('.farm__count').text()).toBe('2 cuves');
    expect(wrapper.get('[data-testid="tank-up-2"]').attributes('aria-label')).toBe('Avancer Cuve haute dans la tournée');
    expect(wrapper.get('[data-testid="farm-frost-verdict"]').text()).toMatch(/^Gel prévu : l'air descend à -1,8 °C vers \S+ \d\d:00, sous les 2 °C fixés pour cette exploitation\.$/);
    expect(wrapper.get('[data-testid="farm-frost-stale"]').text()).toMatch(/^La prévision est ancienne : récupérée le .+\. La dernière tentative a échoué : timeout\./);
    expect(englishLeft(wrapper.text(), ['farms', 'board'])).toEqual([]);
  });
});
