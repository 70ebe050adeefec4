import 'fake-indexeddb/auto';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { freshDeviceDb, settleDevice } from './support/device';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import * as authApi from '@/api/auth';
import * as boardApi from '@/api/board';
import * as farmsApi from '@/api/farms';
import { cautionText } from '@shared/cautions';
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
  const mounted = await mountWithApp(RoundView, { pinia, path: '/round' });
  await settleDevice();
  return mounted;
}

beforeEach(async () => {
  await freshDeviceDb();
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
    await settleDevice();
    expect(wrapper.get('[data-testid="round-submit-problem"]').text()).toMatch(/No connection/);
    expect((wrapper.get('[data-testid="round-input-CS-W1"]').element as HTMLInputElement).value).toBe('1140');

    await wrapper.get('[data-testid="round-retry"]').trigger('click');
    await settleDevice();

    expect(readings.submitRound).toHaveBeenCalledTimes(2);
    expect(wrapper.get('[data-testid="round-result-CS-W1"]').text()).toBe('Stored');
    expect(wrapper.get('[data-testid="round-result-CS-C1"]').text()).toBe('Refused');
    expect(wrapper.get('[data-testid="round-error-CS-C1"]').text()).toBe('This tank is archived');
    expect(wrapper.get('[data-testid="round-summary"]').text()).toContain('1 stored, 1 refused');
  });

  it('shows the confined-space caution from shared/cautions through CautionNote, and the pest-solution one on its tank', async () => {
    vi.mocked(tanksApi).fetchTanks.mockResolvedValue([water, makeCultureTank({ id: 103, code: 'CS-P1', name: 'Spray mix', contents: 'pest-solution' })]);
    const { wrapper } = await mountAs();

    expect(wrapper.get('[data-caution="confined-space"]').text()).toBe(cautionText('confined-space'));
    expect(wrapper.get('[data-testid="round-tank-CS-P1"] [data-caution="pest-solution"]').text()).toBe(cautionText('pest-solution'));
    expect(wrapper.find('[data-testid="round-tank-CS-W1"] [data-caution]').exists()).toBe(false);
  });

  it('asks on the card about a big fall of stock and a 45 °C culture, and sends only once both are answered', async () => {
    vi.mocked(boardApi).fetchBoard.mockResolvedValue(
      makeBoard([makeFarmBoard(11, 'Creek site', [makeTile({ tankId: water.id, code: water.code, grossL: 6273, usableL: 5067, takenAt: '2026-03-01T07:00:00.000Z' })])]),
    );
    readings.submitRound.mockResolvedValue({ results: [{ tankId: water.id, status: 'stored' }, { tankId: culture.id, status: 'stored' }] });
    const { wrapper } = await mountAs();

    // 0 mm + 60 mm datum: π × 1.6² × 0.06 m³ = 483 L, from 6,273 L (V = π r² h, recalled from memory).
    await wrapper.get('[data-testid="round-input-CS-W1"]').setValue('0');
    await wrapper.get('[data-testid="round-input-CS-C1"]').setValue('600');
    await wrapper.get('[data-testid="round-temperature-CS-C1"]').setValue('45');
    expect(wrapper.get('[data-testid="round-question-CS-W1"]').text()).toContain('483 L in the tank, down from 6,273 L');
    expect(wrapper.get('[data-testid="round-question-CS-C1"]').text()).toContain('45.0 °C is above 40 °C');
    expect(wrapper.find('[data-testid="round-tank-CS-C1"] [data-caution="electrical"]').exists()).toBe(true);
    expect(wrapper.get('[data-testid="round-progress"]').text()).toMatch(/0 of 2 tanks ready\s*To answer: CS-W1, CS-C1/);

    await wrapper.get('[data-testid="round-submit"]').trigger('click');
    await settleDevice();
    expect(readings.submitRound).not.toHaveBeenCalled();
    expect(wrapper.get('[data-testid="round-submit-problem"]').text()).toBe('Answer the question on CS-W1, CS-C1 (or correct the reading) before sending.');

    await wrapper.get('#round-101-confirm').setValue(true);
    await wrapper.get('[data-testid="round-submit"]').trigger('click');
    await settleDevice();
    expect(readings.submitRound).not.toHaveBeenCalled();
    expect(wrapper.get('[data-testid="round-progress"]').text()).toMatch(/1 of 2 tanks ready\s*To answer: CS-C1$/);

    await wrapper.get('#round-102-confirm').setValue(true);
    await wrapper.get('[data-testid="round-submit"]').trigger('click');
    await settleDevice();
    expect(readings.submitRound).toHaveBeenCalledTimes(1);
    expect(readings.submitRound.mock.calls[0]![0].entries.map((e) => [e.tankId, e.readingMm, e.temperatureC])).toEqual([
      [water.id, 0, undefined],
      [culture.id, 600, 45],
    ]);
  });

  it('counts only valid readings and names the tanks still to fix', async () => {
    const { wrapper } = await mountAs();

    await wrapper.get('[data-testid="round-input-CS-W1"]').setValue('2400');
    await wrapper.get('[data-testid="round-input-CS-C1"]').setValue('600');

    expect(wrapper.get('[data-testid="round-progress"]').text()).toMatch(/^1 of 2 tanks ready\s*To fix: CS-W1$/);
    expect(wrapper.get('[data-testid="round-submit"]').text()).toBe('Send 1 reading');
  });

  it('offers only the reading it took for text the other decimal mark reads differently', async () => {
    const { wrapper } = await mountAs();

    await wrapper.get('[data-testid="round-input-CS-W1"]').setValue('1,140');

    expect(wrapper.get('[data-testid="round-read-as-CS-W1"]').text()).toBe('Read as 1140 mm');
    expect(wrapper.get('[data-testid="round-stock-CS-W1-usable"]').text()).toBe('8,445 L');
    expect(wrapper.find('[data-testid="round-error-CS-W1"]').exists()).toBe(false);
  });

  it('scrolls to the result after sending and announces it', async () => {
    const scrolled = vi.fn();
    Element.prototype.scrollIntoView = scrolled;
    readings.submitRound.mockResolvedValueOnce({ results: [{ tankId: water.id, status: 'stored' }] });
    const { wrapper } = await mountAs();
    const live = wrapper.get('[data-testid="round-announcement"]');
    expect(live.attributes('aria-live')).toBe('polite');
    expect(live.text()).toBe('');

    await wrapper.get('[data-testid="round-input-CS-W1"]').setValue('1140');
    await wrapper.get('[data-testid="round-submit"]').trigger('click');
    await settleDevice();

    expect(live.text()).toBe('Round sent: 1 stored. Round stored.');
    expect(scrolled).toHaveBeenCalledTimes(1);
    expect(scrolled.mock.contexts[0]).toBe(wrapper.get('[data-testid="round-summary"]').element);
    expect(document.activeElement).toBe(wrapper.get('[data-testid="round-summary"]').element);
  });
});
