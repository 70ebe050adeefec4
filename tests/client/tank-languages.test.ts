import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { DOMWrapper, flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import type { Language } from '@shared/i18n/languages';
import type { TankCreateInput } from '@shared/schemas';
import * as authApi from '@/api/auth';
import * as boardApi from '@/api/board';
import * as farmsApi from '@/api/farms';
import * as readingsApi from '@/api/readings';
import * as tanksApi from '@/api/tanks';
import type { TankForecast } from '@/api/tanks';
import { i18n, setLanguage } from '@/i18n';
import TankEditorDialog from '@/components/tank/TankEditorDialog.vue';
import { formatInZone } from '@/components/tank/tankContents';
import { shapeName } from '@/components/tank/tankShapes';
import { zeroMarkText } from '@/components/tank/tankFacts';
import TankView from '@/views/TankView.vue';
import { makeFarm, makeUser, sessionOf } from './support/fixtures';
import { inDocument, mountWithApp } from './support/mountApp';
import { makeBoard, makeFarmBoard, makeTile, makeWaterTank } from './support/tanks';
import { makeTank } from './support/tankFixtures';

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
const tanks = vi.mocked(tanksApi);
let pinia: Pinia;

const ZONE = 'Pacific/Auckland';
const TANK = makeWaterTank();
const FORECAST: TankForecast = {
  tankId: TANK.id,
  usableL: 8_445,
  windowDays: 14,
  meanLPerDay: 938.3,
  sdLPerDay: 212.6,
  days: 13,
  daysOfCover: 9,
  projectedEmptyAt: '2026-03-11T14:00:00.000Z',
  noiseL: 24.1,
  leaks: [{ from: '2026-03-01T12:00:00.000Z', to: '2026-03-01T17:00:00.000Z', lossL: 85, rateLPerHour: 17 }],
};

/** Runs of two or more English words from the tank area's messages that `text` still shows. */
function englishLeft(text: string): string[] {
  const runs = new Set<string>();
  const walk = (value: unknown): void => {
    if (typeof value === 'string') {
      for (const part of value.split(/\{[^}]*\}|\|/)) {
        const run = part.trim().replace(/^[\s.,:;·()–-]+|[\s.,:;·()–-]+$/g, '');
        if (run.split(/\s+/).filter((w) => /\p{L}{2,}/u.test(w)).length >= 2) runs.add(run);
      }
    } else if (value && typeof value === 'object') Object.values(value).forEach(walk);
  };
  walk((i18n.global.getLocaleMessage('en') as Record<string, unknown>).tank);
  const flat = text.replace(/\s+/g, ' ');
  return [...runs].filter((run) => flat.includes(run));
}

/** The text a person sees and hears: the page's words plus its aria labels and titles. */
function seen(root: Element): string {
  const labels = [...root.querySelectorAll('[aria-label], [title], [placeholder]')].flatMap((e) => ['aria-label', 'title', 'placeholder'].map((a) => e.getAttribute(a) ?? ''));
  return [root.textContent ?? '', ...labels].join(' ');
}

async function openTank(language: Language, tab?: string) {
  auth.fetchSession.mockResolvedValue(sessionOf(makeUser('manager', { language })));
  const { wrapper } = await mountWithApp(TankView, { pinia, path: `/tanks/${TANK.id}${tab ? `?tab=${tab}` : ''}` });
  await flushPromises();
  return wrapper;
}

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  vi.mocked(farmsApi).fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site', { timeZone: ZONE })]);
  tanks.fetchTank.mockResolvedValue(TANK);
  tanks.fetchForecast.mockResolvedValue(FORECAST);
  tanks.fetchCalibrations.mockResolvedValue([{ number: 2, key: TANK.calibrationVersion, createdAt: '2026-02-27T21:00:00.000Z', current: true, geometry: TANK.geometry, datumOffsetMm: TANK.datumOffsetMm }]);
  vi.mocked(readingsApi).fetchSeries.mockResolvedValue([]);
  vi.mocked(boardApi).fetchBoard.mockResolvedValue(
    makeBoard([makeFarmBoard(11, 'Creek site', [makeTile({ tankId: TANK.id, code: TANK.code, grossL: 9_651, usableL: 8_445, levelMm: 1_200, takenAt: new Date().toISOString() })])]),
  );
});

afterEach(() => setLanguage('en'));

describe('the tank page in Spanish and French', () => {
  it('shows the page, its facts, the forecast with its leak and the history in Spanish with no English of the tank area left', async () => {
    const wrapper = await openTank('es');

    const text = seen(wrapper.element);
    expect(englishLeft(text)).toEqual([]);
    expect(text).not.toMatch(/\btank\.[a-z]/);
    expect(wrapper.get('#tank-now-title').text()).toBe('Última lectura');
    expect(text).toContain('Días de autonomía');
    expect(text).toContain('Posible fuga:');
    expect(wrapper.get('[data-testid="forecast-days"]').text()).toBe('13 de 14 días');
    // Spanish groups thousands only from five digits on (CLDR es, minimumGroupingDigits 2): 9651, not 9.651.
    expect(wrapper.get('[data-testid="tank-stock-total"]').text()).toBe('9651 L en el tanque');
    expect(wrapper.get('[data-testid="tank-tab-gauge"]').text()).toBe('Regla graduada');
  });

  it('switches its words, shape name and dates to French when the language changes, without reloading', async () => {
    const wrapper = await openTank('es');
    expect(wrapper.text()).toContain('Cilindro vertical');

    setLanguage('fr');
    await flushPromises();

    expect(wrapper.get('#tank-now-title').text()).toBe('Dernier relevé');
    expect(wrapper.text()).toContain('Cylindre vertical');
    expect(wrapper.text()).toContain(formatInZone(FORECAST.leaks[0]!.from, ZONE));
    expect(englishLeft(seen(wrapper.element))).toEqual([]);
  });

  it.each([
    ['es', 'readings', 'Aún no hay lecturas'],
    ['fr', 'readings', "Aucun relevé pour l'instant"],
    ['es', 'gauge', 'Descargar regla graduada (PDF)'],
    ['fr', 'contents', 'Aucun contenu enregistré'],
  ] as const)('shows the %s %s tab in that language', async (language, tab, words) => {
    vi.mocked(readingsApi).fetchReadings.mockResolvedValue([]);
    tanks.fetchContentsHistory.mockResolvedValue([]);
    const wrapper = await openTank(language, tab);

    expect(seen(wrapper.element)).toContain(words);
    expect(englishLeft(seen(wrapper.element))).toEqual([]);
  });
});

describe('tank words outside components', () => {
  it('words shapes, the zero mark and dates in the language chosen', () => {
    setLanguage('es');
    expect(shapeName('horizontal-cylinder', 'ellipsoidal-2to1')).toBe('Cilindro horizontal, fondos elipsoidales 2:1');
    expect(zeroMarkText(-30, 'metric')).toBe('30 mm por debajo del fondo');
    // Spanish writes the day before the month, with the month in lower case ("3 mar 2026").
    expect(formatInZone('2026-03-03T01:00:00.000Z', 'UTC')).toMatch(/^3 mar 2026/);
    setLanguage('fr');
    expect(shapeName('horizontal-cylinder', 'flat')).toBe('Cylindre horizontal, fonds plats');
    expect(zeroMarkText(0, 'metric')).toBe('Au niveau du fond');
  });
});

describe('the tank editor in French', () => {
  function input(id: string): DOMWrapper<HTMLInputElement> {
    const element = document.getElementById(id) as HTMLInputElement | null;
    if (!element) throw new Error(`No input #${id}`);
    return new DOMWrapper(element);
  }

  it('labels every part in French and reads a specific gravity typed with a decimal comma', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('manager', { language: 'fr' })));
    tanks.createTank.mockImplementation(async (body: TankCreateInput) => makeTank(21, { ...body }));
    await mountWithApp(TankEditorDialog, { pinia, path: '/profile', props: { visible: true, tank: null, farmId: 11 } });

    const dialog = document.querySelector('[role="dialog"]')!;
    const text = seen(dialog);
    expect(englishLeft(text)).toEqual([]);
    expect(text).toContain('Forme et dimensions');
    expect(text).toContain('Remplir et marquer');
    expect(inDocument('tank-capacity').text()).toContain('Saisissez toutes les dimensions');

    await input('tank-name').setValue('Cuve de pluie');
    await input('tank-code').setValue('CK-21');
    await input('tank-size-diameterMm').setValue('1200');
    await input('tank-size-diameterMm').trigger('blur');
    await input('tank-size-heightMm').setValue('1500');
    await input('tank-size-heightMm').trigger('blur');
    await input('tank-sg').setValue('1,05');
    await input('tank-sg').trigger('blur');
    await flushPromises();
    await inDocument('tank-submit').trigger('submit');
    await flushPromises();

    expect(tanks.createTank).toHaveBeenCalledTimes(1);
    expect(tanks.createTank.mock.calls[0]![0].specificGravity).toBe(1.05);
  });
});
