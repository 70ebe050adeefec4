import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import * as authApi from '@/api/auth';
import * as boardApi from '@/api/board';
import * as farmsApi from '@/api/farms';
import { ApiError } from '@/api/http';
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

const auth = vi.mocked(authApi);
const readings = vi.mocked(readingsApi);
const water = makeWaterTank();
const culture = makeCultureTank();
let pinia: Pinia;

async function mountAs(unitSystem: 'metric' | 'us' = 'metric') {
  auth.fetchSession.mockResolvedValue(sessionOf(makeUser('worker', { unitSystem })));
  return mountWithApp(RoundView, { pinia, path: '/round' });
}

beforeEach(() => {
  vi.clearAllMocks();
  localStorage.clear();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  setViewportWidth(360);
  vi.mocked(farmsApi).fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site')]);
  vi.mocked(tanksApi).fetchTanks.mockResolvedValue([water, culture]);
  vi.mocked(boardApi).fetchBoard.mockResolvedValue(makeBoard([makeFarmBoard(11, 'Creek site', [makeTile({ tankId: water.id, code: water.code })])]));
});

afterEach(() => setViewportWidth(1024));

describe('RoundView', () => {
  it('shows a card per tank in walking order with a decimal keypad input', async () => {
    const { wrapper } = await mountAs();

    const cards = wrapper.findAll('[data-testid^="round-tank-"]');
    expect(cards.map((c) => c.attributes('data-testid'))).toEqual(['round-tank-CS-W1', 'round-tank-CS-C1']);
    const input = wrapper.get('[data-testid="round-input-CS-W1"]');
    expect(input.attributes('inputmode')).toBe('decimal');
    expect(wrapper.get('[data-testid="round-tank-CS-W1"]').text()).toContain('mm');
    expect(wrapper.get('[data-testid="round-tank-CS-W1"]').text()).toContain('No reading yet');
  });

  it('shows usable litres, their share of the usable capacity and the litres in the tank while the reading is typed', async () => {
    const { wrapper } = await mountAs();

    await wrapper.get('[data-testid="round-input-CS-W1"]').setValue('1140');

    // 1140 mm + 60 mm datum = 1.2 m of water in a cylinder 3.2 m across: π × 1.6² × 1.2 m³ = 9,651 L in the tank,
    // of which 1.05 m lies above the 150 mm outlet: 8,445 L usable, 1.05 of the 2.15 m up to the 2,300 mm
    // fill line = 49 % of the 17,291 L usable capacity (right circular cylinder V = π r² h; recalled from memory).
    expect(wrapper.get('[data-testid="round-stock-CS-W1-usable"]').text()).toBe('8,445 L');
    expect(wrapper.get('[data-testid="round-stock-CS-W1-percent"]').text()).toBe('49 % of 17,291 L usable capacity');
    expect(wrapper.get('[data-testid="round-stock-CS-W1-total"]').text()).toBe('9,651 L in the tank');
    expect(wrapper.get('[data-testid="round-tank-CS-W1"]').text()).not.toMatch(/% full/);
    expect(wrapper.find('[data-testid="round-error-CS-W1"]').exists()).toBe(false);

    await wrapper.get('[data-testid="round-input-CS-W1"]').setValue('1200');
    // 1260 mm: π × 1.6² × 1.11 m³ = 8.9271 m³ above the outlet.
    expect(wrapper.get('[data-testid="round-stock-CS-W1-usable"]').text()).toBe('8,927 L');
  });

  it('shows gallons beside the litres for a US user typing inches', async () => {
    const { wrapper } = await mountAs('us');

    await wrapper.get('[data-testid="round-input-CS-W1"]').setValue('45');

    // 45 in = 1143 mm; level 1203 mm; π × 1.6² × (1.203 − 0.15) m³ = 8,468.73 L usable = 2,237.2 US gal
    // (1 US gal = 231 in³ = 3.785411784 L, NIST Handbook 44 Appendix C).
    const card = wrapper.get('[data-testid="round-tank-CS-W1"]');
    expect(card.text()).toContain('in');
    expect(wrapper.get('[data-testid="round-stock-CS-W1-usable"]').text()).toBe('8,469 L');
    expect(wrapper.get('[data-testid="round-gallons-CS-W1"]').text()).toBe('(2,237 gal usable)');
  });

  it('refuses an out-of-range reading at once with the reason', async () => {
    const { wrapper } = await mountAs();

    await wrapper.get('[data-testid="round-input-CS-W1"]').setValue('2400');

    expect(wrapper.get('[data-testid="round-error-CS-W1"]').text()).toMatch(/above the top of the tank \(2,400 mm\)/);
    expect(wrapper.find('[data-testid="round-stock-CS-W1"]').exists()).toBe(false);
    expect(wrapper.get('[data-testid="round-input-CS-W1"]').attributes('aria-invalid')).toBe('true');
  });

  it('shows the temperature field for culture tanks only until asked', async () => {
    const { wrapper } = await mountAs();

    expect(wrapper.find('[data-testid="round-temperature-CS-C1"]').exists()).toBe(true);
    expect(wrapper.find('[data-testid="round-temperature-CS-W1"]').exists()).toBe(false);
  });

  it('says so when the round cannot be sent for lack of signal, and stores it on Try again', async () => {
    readings.submitRound.mockRejectedValueOnce(new ApiError(0, 'network', 'Cannot reach the server.')).mockResolvedValueOnce({
      results: [
        { tankId: water.id, status: 'stored' },
        { tankId: culture.id, status: 'refused', reason: 'This tank is archived' },
      ],
    });
    const { wrapper } = await mountAs();
    await wrapper.get('[data-testid="round-input-CS-W1"]').setValue('1140');
    await wrapper.get('[data-testid="round-input-CS-C1"]').setValue('600');

    await wrapper.get('[data-testid="round-submit"]').trigger('click');
    await flushPromises();
    expect(wrapper.get('[data-testid="round-submit-problem"]').text()).toMatch(/No connection/);
    expect((wrapper.get('[data-testid="round-input-CS-W1"]').element as HTMLInputElement).value).toBe('1140');

    await wrapper.get('[data-testid="round-retry"]').trigger('click');
    await flushPromises();

    expect(readings.submitRound).toHaveBeenCalledTimes(2);
    expect(wrapper.get('[data-testid="round-result-CS-W1"]').text()).toBe('Stored');
    expect(wrapper.get('[data-testid="round-result-CS-C1"]').text()).toBe('Refused');
    expect(wrapper.get('[data-testid="round-error-CS-C1"]').text()).toBe('This tank is archived');
    expect(wrapper.get('[data-testid="round-summary"]').text()).toContain('1 stored, 1 refused');
  });
});
