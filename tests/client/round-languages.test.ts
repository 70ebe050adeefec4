// The round store in a Spanish-speaking worker's language: the decimal comma of es-ES, and the reasons,
// questions and summary the round words itself (the shared parser and reading function answer in English)
// with the same figures as the English ones. The water tank: 3.2 m across, 2.4 m tall, tube zero 60 mm up.
import 'fake-indexeddb/auto';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import * as authApi from '@/api/auth';
import * as boardApi from '@/api/board';
import * as farmsApi from '@/api/farms';
import * as readingsApi from '@/api/readings';
import * as tanksApi from '@/api/tanks';
import { setLanguage } from '@/i18n';
import { useRoundStore } from '@/stores/round';
import { useSessionStore } from '@/stores/session';
import { freshDeviceDb } from './support/device';
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

const water = makeWaterTank();
const culture = makeCultureTank();

async function spanishRound() {
  setActivePinia(createPinia());
  vi.mocked(authApi).fetchSession.mockResolvedValue(sessionOf(makeUser('worker', { language: 'es' })));
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
  vi.mocked(boardApi).fetchBoard.mockResolvedValue(
    makeBoard([makeFarmBoard(11, 'Creek site', [makeTile({ tankId: water.id, code: water.code, grossL: 6273, usableL: 5067, takenAt: '2026-03-01T07:00:00.000Z' })])]),
  );
});

afterEach(() => setLanguage('en'));

describe('the round in Spanish', () => {
  it('reads the decimal comma of the worker’s language', async () => {
    const round = await spanishRound();

    // es-ES writes 1,5 (Unicode CLDR); "1140,5" is 1140.5 mm, no question of grouping.
    expect(round.decimalMark).toBe(',');
    round.setReading(water.id, '1140,5');
    expect(round.rows[0]!.reading).toMatchObject({ state: 'ok', readingMm: 1140.5, readAs: null });
  });

  it.each([
    ['12a', 'La lectura del tubo de nivel «12a» no es un número: escríbala como 1250'],
    ['-5', 'La lectura de -5 mm está por debajo del cero del tubo'],
    // 2400 mm on the tube + 60 mm zero = a level of 2460 mm in a 2400 mm tank: 60 mm over the top.
    ['2400', 'La lectura de 2400 mm deja el nivel en 2460 mm, 60 mm por encima de lo alto del tanque (2400 mm)'],
    ['1.5.5', 'La lectura del tubo de nivel «1.5.5» no es un número: escríbala como 1250'],
  ])('refuses %j with a reason in Spanish naming the field and the figures', async (text, reason) => {
    const round = await spanishRound();

    round.setReading(water.id, text);

    expect(round.rows[0]!.reading).toEqual({ state: 'invalid', reason });
    expect(round.rows[0]!.problem).toBe(reason);
  });

  it('refuses a temperature outside the schema’s range with its limit, in Spanish', async () => {
    const round = await spanishRound();
    round.setReading(culture.id, '600');

    round.setTemperature(culture.id, '95,5');

    expect(round.rows[1]!.temperature).toEqual({ state: 'invalid', reason: 'La temperatura debe ser de 90 °C o menos' });
  });

  it('asks about a big fall of stock and says what was stored in Spanish', async () => {
    const round = await spanishRound();
    vi.mocked(readingsApi).submitRound.mockImplementation(async (input) => ({
      results: input.entries.map((e) => ({ tankId: e.tankId, status: 'stored' as const })),
    }));

    // 0 mm + 60 mm zero in the 3.2 m cylinder: π × 1.6² × 0.06 m³ = 483 L (V = π r² h, recalled from memory), from 6,273 L.
    round.setReading(water.id, '0');
    expect(round.rows[0]!.questions).toEqual(['483 L en el tanque, menos que los 6273 L de la última lectura (92 % menos). ¿Es correcta la lectura?']);
    await round.submit();
    expect(round.submitProblem).toEqual({ kind: 'invalid', message: 'Responda a la pregunta de CS-W1 (o corrija la lectura) antes de enviar.' });

    round.confirmEntry(water.id, true);
    await round.submit();

    await vi.waitFor(() => expect(round.summary.text).toBe('1 registrada'));
    expect(round.progress).toMatchObject({ total: 2, ready: 1 });
  });
});
