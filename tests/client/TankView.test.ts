import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import * as authApi from '@/api/auth';
import * as boardApi from '@/api/board';
import * as farmsApi from '@/api/farms';
import * as readingsApi from '@/api/readings';
import * as tanksApi from '@/api/tanks';
import type { TankForecast } from '@/api/tanks';
import { cautionText } from '@shared/cautions';
import type { TankCalibrationVersion } from '@shared/schemas';
import { ApiError } from '@/api/http';
import { formatInZone } from '@/components/tank/tankContents';
import { formatDateInZone } from '@/components/tank/tankFacts';
import TankView from '@/views/TankView.vue';
import { makeFarm, makeUser, sessionOf } from './support/fixtures';
import { mountWithApp } from './support/mountApp';
import { makeBoard, makeFarmBoard, makeTile, makeWaterTank } from './support/tanks';

vi.mock('@/api/auth', () => ({ fetchSession: vi.fn(), signIn: vi.fn(), signOut: vi.fn(), updateProfile: vi.fn(), setPassword: vi.fn(), requestPasswordReset: vi.fn(), fetchTokenInfo: vi.fn() }));
vi.mock('@/api/tanks', () => ({
  fetchTanks: vi.fn(),
  fetchTank: vi.fn(),
  createTank: vi.fn(),
  updateTank: vi.fn(),
  fetchContentsHistory: vi.fn(),
  fetchCalibration: vi.fn(),
  fetchForecast: vi.fn(),
  fetchCalibrations: vi.fn(),
  calibrationCsvUrl: vi.fn(),
  gaugeStripUrl: vi.fn(),
  tankLabelUrl: vi.fn(),
}));
vi.mock('@/api/readings', () => ({ submitRound: vi.fn(), fetchReadings: vi.fn(), fetchSeries: vi.fn(), correctReading: vi.fn() }));
vi.mock('@/api/farms', () => ({ fetchFarms: vi.fn(), fetchFarm: vi.fn(), createFarm: vi.fn(), updateFarm: vi.fn(), farmLabelsUrl: vi.fn() }));
vi.mock('@/api/board', () => ({ fetchBoard: vi.fn(), fetchBoardHistory: vi.fn() }));

const auth = vi.mocked(authApi);
const farms = vi.mocked(farmsApi);
const readings = vi.mocked(readingsApi);
const tanks = vi.mocked(tanksApi);
let pinia: Pinia;

// The invented Creek site keeps New Zealand time: 13 h ahead of UTC in March (daylight time).
const ZONE = 'Pacific/Auckland';
const TANK = makeWaterTank();
const VERSIONS: TankCalibrationVersion[] = [
  { number: 1, key: 'a1b2c3d4', createdAt: '2025-11-20T02:00:00.000Z', current: false, geometry: TANK.geometry, datumOffsetMm: 0 },
  { number: 2, key: TANK.calibrationVersion, createdAt: '2026-02-27T21:00:00.000Z', current: true, geometry: TANK.geometry, datumOffsetMm: TANK.datumOffsetMm },
];

function forecastOf(overrides: Partial<TankForecast> = {}): TankForecast {
  return {
    tankId: TANK.id,
    usableL: 8_445,
    windowDays: 14,
    meanLPerDay: 938.3,
    sdLPerDay: 212.6,
    days: 13,
    daysOfCover: 9.0003,
    projectedEmptyAt: '2026-03-11T14:00:00.000Z',
    noiseL: 24.1,
    leaks: [],
    ...overrides,
  };
}

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  auth.fetchSession.mockResolvedValue(sessionOf(makeUser('manager')));
  farms.fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site', { timeZone: ZONE })]);
  tanks.fetchTank.mockResolvedValue(TANK);
  readings.fetchSeries.mockResolvedValue([]);
  tanks.fetchCalibrations.mockResolvedValue(VERSIONS);
  vi.mocked(boardApi).fetchBoard.mockResolvedValue(makeBoard([]));
});

describe('TankView latest reading', () => {
  it('shows usable litres first, their share of the usable capacity and the litres in the tank, with the sight tube', async () => {
    tanks.fetchForecast.mockResolvedValue(forecastOf());
    // The tank's latest reading: level 1,200 mm of the 3.2 m wide cylinder, 9,651 L in it, 8,445 L above the
    // 150 mm outlet (π × 1.6² × 1.05 m³), 1.05 of the 2.15 m between outlet and the 2,300 mm fill line: 49 %.
    vi.mocked(boardApi).fetchBoard.mockResolvedValue(
      makeBoard([makeFarmBoard(11, 'Creek site', [makeTile({ tankId: TANK.id, code: TANK.code, grossL: 9_651, usableL: 8_445, levelMm: 1_200, takenAt: new Date().toISOString() })])]),
    );
    const { wrapper } = await mountWithApp(TankView, { pinia, path: `/tanks/${TANK.id}` });

    const now = wrapper.get('[data-testid="tank-now"]');
    expect(now.get('[data-testid="tank-stock-usable"]').text()).toBe('8,445 L');
    expect(now.get('[data-testid="tank-stock-percent"]').text()).toBe('49 % of 17,291 L usable capacity');
    expect(now.get('[data-testid="tank-stock-total"]').text()).toBe('9,651 L in the tank');
    expect(now.get('svg[role="img"]').attributes('aria-label')).toMatch(/^Sight tube: level 1,200 mm above the floor, 1,140 mm on the tube; outlet line at 150 mm; safe fill line at 2,300 mm\. 8,445 L usable/);
  });

  it('says so when the tank has no reading yet', async () => {
    tanks.fetchForecast.mockResolvedValue(forecastOf({ usableL: null }));
    const { wrapper } = await mountWithApp(TankView, { pinia, path: `/tanks/${TANK.id}` });
    expect(wrapper.get('[data-testid="tank-stock-none"]').text()).toBe('No reading yet.');
  });
});

describe('TankView forecast panel', () => {
  it('shows the use per day with its spread, days of cover, the empty date on the farm’s clock and the days behind it', async () => {
    tanks.fetchForecast.mockResolvedValue(forecastOf());
    const { wrapper } = await mountWithApp(TankView, { pinia, path: `/tanks/${TANK.id}` });

    expect(tanks.fetchForecast).toHaveBeenCalledWith(TANK.id);
    const panel = wrapper.get('[data-testid="tank-forecast"]');
    expect(panel.get('[data-testid="forecast-cover"]').text()).toBe('≈ 9 days left');
    expect(panel.get('[data-testid="forecast-use"]').text()).toMatch(/^938 L\/day\s*± 213 L$/);
    expect(panel.get('[data-testid="forecast-days"]').text()).toBe('13 of 14 days');
    expect(panel.text()).toContain('8,445 L usable at the latest reading');
    // 14:00 UTC on 11 March is 03:00 on 12 March in Auckland (UTC+13).
    expect(panel.get('[data-testid="forecast-empty"]').text()).toMatch(/\b12\b/);
    expect(panel.get('[data-testid="forecast-empty"]').text()).not.toMatch(/\b11\b/);
    expect(panel.text()).toContain(`Farm’s clock (${ZONE})`);
    expect(panel.get('[data-testid="forecast-basis"]').text()).toBe('From the last 14 days of readings; refills and brews are not counted as use.');
    expect(panel.find('[data-testid="forecast-leaks"]').exists()).toBe(false);
    expect(panel.text()).toContain('No suspected leak');
  });

  it('lists suspected leak windows with their times on the farm’s clock, the loss and a confined-space caution', async () => {
    const leak = { from: '2026-03-01T10:30:00.000Z', to: '2026-03-01T15:45:00.000Z', lossL: 85, rateLPerHour: 16.19 };
    tanks.fetchForecast.mockResolvedValue(forecastOf({ leaks: [leak] }));
    const { wrapper } = await mountWithApp(TankView, { pinia, path: `/tanks/${TANK.id}` });

    const leaks = wrapper.get('[data-testid="forecast-leaks"]');
    const item = leaks.get('[data-testid="forecast-leak"]');
    expect(item.text()).toContain(`${formatInZone(leak.from, ZONE)} – ${formatInZone(leak.to, ZONE)}`);
    // Auckland's 23:30 is 10:30 UTC: the window must not be shown on the UTC clock.
    expect(formatInZone(leak.from, ZONE)).not.toBe(formatInZone(leak.from, 'UTC'));
    expect(item.text()).toContain('85 L lost');
    expect(item.text()).toContain('(16 L/h)');
    expect(leaks.text()).toContain('Suspected leak:');
    expect(wrapper.get('[data-testid="forecast-leak-caution"]').text()).toBe(cautionText('confined-space'));
  });

  it('turns days of cover amber with one decimal when under three days are left', async () => {
    tanks.fetchForecast.mockResolvedValue(forecastOf({ usableL: 1_200, daysOfCover: 1.28, projectedEmptyAt: '2026-03-03T18:00:00.000Z' }));
    const { wrapper } = await mountWithApp(TankView, { pinia, path: `/tanks/${TANK.id}` });

    const cover = wrapper.get('[data-testid="forecast-cover"]');
    expect(cover.text()).toBe('≈ 1.3 days left');
    expect(cover.find('.forecast__cover--short').exists()).toBe(true);
    // With under two days left the hour is shown too.
    expect(wrapper.get('[data-testid="forecast-empty"]').text()).toBe(formatInZone('2026-03-03T18:00:00.000Z', ZONE));
  });

  it('says no use was seen and gives no empty date when the tank did not fall', async () => {
    tanks.fetchForecast.mockResolvedValue(forecastOf({ meanLPerDay: 0, sdLPerDay: 0, daysOfCover: null, projectedEmptyAt: null }));
    const { wrapper } = await mountWithApp(TankView, { pinia, path: `/tanks/${TANK.id}` });

    expect(wrapper.get('[data-testid="forecast-cover"]').text()).toBe('No use seen');
    expect(wrapper.get('[data-testid="forecast-empty"]').text()).toBe('Not at the present use');
  });

  it('says so when the tank has no reading yet', async () => {
    tanks.fetchForecast.mockResolvedValue(forecastOf({ usableL: null, meanLPerDay: 0, sdLPerDay: 0, days: 0, daysOfCover: null, projectedEmptyAt: null }));
    const { wrapper } = await mountWithApp(TankView, { pinia, path: `/tanks/${TANK.id}` });

    expect(wrapper.get('[data-testid="forecast-unread"]').text()).toContain('No reading yet');
    expect(wrapper.find('[data-testid="forecast-cover"]').exists()).toBe(false);
  });

  it('shows a loading state until the forecast arrives', async () => {
    let answer!: (f: TankForecast) => void;
    tanks.fetchForecast.mockReturnValue(new Promise((resolve) => (answer = resolve)));
    const { wrapper } = await mountWithApp(TankView, { pinia, path: `/tanks/${TANK.id}` });

    expect(wrapper.find('[data-testid="tank-forecast"] [aria-busy="true"]').exists()).toBe(true);
    answer(forecastOf());
    await flushPromises();
    expect(wrapper.find('[data-testid="tank-forecast"] [aria-busy="true"]').exists()).toBe(false);
    expect(wrapper.get('[data-testid="forecast-cover"]').text()).toBe('≈ 9 days left');
  });

  it('shows a failed forecast with a retry that loads it again', async () => {
    tanks.fetchForecast.mockRejectedValueOnce(new ApiError(503, 'http_error', 'The server is not ready. Try again in a moment.')).mockResolvedValueOnce(forecastOf());
    const { wrapper } = await mountWithApp(TankView, { pinia, path: `/tanks/${TANK.id}` });

    const panel = wrapper.get('[data-testid="tank-forecast"]');
    expect(panel.get('[data-testid="load-error"]').text()).toContain('The server is not ready.');
    await panel.get('[data-testid="load-retry"]').trigger('click');
    await flushPromises();
    expect(tanks.fetchForecast).toHaveBeenCalledTimes(2);
    expect(wrapper.get('[data-testid="forecast-cover"]').text()).toBe('≈ 9 days left');
  });
});

describe('TankView facts', () => {
  it('names the calibration by its number and date, never by its key, and words the zero mark above or below the floor', async () => {
    tanks.fetchForecast.mockResolvedValue(forecastOf());
    const { wrapper } = await mountWithApp(TankView, { pinia, path: `/tanks/${TANK.id}` });

    expect(tanks.fetchCalibrations).toHaveBeenCalledWith(TANK.id);
    // 21:00 UTC on 27 February is 10:00 on 28 February in Auckland (UTC+13).
    expect(wrapper.get('[data-testid="tank-calibration-version"]').text()).toBe(`Version 2 · ${formatDateInZone(VERSIONS[1].createdAt, ZONE)}`);
    expect(wrapper.text()).not.toContain(TANK.calibrationVersion);
    expect(wrapper.get('[data-testid="tank-zero-mark"]').text()).toBe('60 mm above the floor');
  });

  it('says the zero mark is below the floor when the offset is negative', async () => {
    tanks.fetchTank.mockResolvedValue({ ...TANK, datumOffsetMm: -30 });
    tanks.fetchForecast.mockResolvedValue(forecastOf());
    const { wrapper } = await mountWithApp(TankView, { pinia, path: `/tanks/${TANK.id}` });

    expect(wrapper.get('[data-testid="tank-zero-mark"]').text()).toBe('30 mm below the floor');
    expect(wrapper.text()).not.toMatch(/-30 mm/);
  });

  it('shows a dash for the calibration when its versions could not be loaded', async () => {
    tanks.fetchCalibrations.mockRejectedValue(new ApiError(503, 'http_error', 'The server is not ready.'));
    tanks.fetchForecast.mockResolvedValue(forecastOf());
    const { wrapper } = await mountWithApp(TankView, { pinia, path: `/tanks/${TANK.id}` });

    expect(wrapper.get('[data-testid="tank-calibration-version"]').text()).toBe('—');
  });
});
