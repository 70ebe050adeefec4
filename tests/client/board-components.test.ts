import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import type { ContentsTotal } from '@shared/schemas';
import * as authApi from '@/api/auth';
import BoardSightTube from '@/components/board/BoardSightTube.vue';
import BoardTankTile from '@/components/board/BoardTankTile.vue';
import BoardTotalCard from '@/components/board/BoardTotalCard.vue';
import BoardLiveStatus from '@/components/board/BoardLiveStatus.vue';
import { setLanguage } from '@/i18n';
import { englishLeft } from './support/englishLeft';
import { makeUser, sessionOf } from './support/fixtures';
import { mountWithApp } from './support/mountApp';
import { makeTile } from './support/tanks';

vi.mock('@/api/auth', () => ({
  fetchSession: vi.fn(),
  signIn: vi.fn(),
  signOut: vi.fn(),
  updateProfile: vi.fn(),
  setPassword: vi.fn(),
  requestPasswordReset: vi.fn(),
  fetchTokenInfo: vi.fn(),
}));

const NOW = new Date('2026-03-02T12:00:00.000Z');
let pinia: Pinia;

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  vi.mocked(authApi).fetchSession.mockResolvedValue(sessionOf(makeUser('manager')));
});

const total = (overrides: Partial<ContentsTotal> = {}): ContentsTotal => ({
  contents: 'water',
  grossL: 12_500,
  usableL: 11_000,
  capacityL: 25_000,
  usableCapacityL: 22_000,
  percentOfUsableCapacity: 50,
  tanks: 3,
  tanksWithoutReading: 1,
  oldestReadingAt: '2026-03-02T09:00:00.000Z',
  ...overrides,
});

describe('BoardTankTile', () => {
  it('links to the tank page and shows usable stock with the age of the reading', async () => {
    const tile = makeTile({ tankId: 7, code: 'CS-W1', grossL: 6_000, usableL: 5_500, usableCapacityL: 9_000, percentOfUsableCapacity: 61.1, takenAt: '2026-03-02T09:00:00.000Z' });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'metric', now: NOW } });

    const link = wrapper.get('[data-testid="board-tile-CS-W1"]');
    expect(link.attributes('href')).toBe('/tanks/7');
    expect(link.get('[data-testid="board-stock-CS-W1-usable"]').text()).toBe('5,500 L');
    expect(link.text()).toContain('5,500 L usable');
    // The percentage is of the usable capacity, and says so: 5,500 of 9,000 L is 61 %.
    expect(link.get('[data-testid="board-stock-CS-W1-percent"]').text()).toBe('61 % of 9,000 L usable capacity');
    expect(link.get('[data-testid="board-stock-CS-W1-total"]').text()).toBe('6,000 L in the tank');
    expect(link.text()).not.toMatch(/% full/);
    expect(link.text()).toContain('Read 3 h ago');
    expect(link.classes()).not.toContain('tile--low');
    expect(link.classes()).not.toContain('tile--stale');
  });

  it('highlights a low tank and flags a reading older than two days', async () => {
    const tile = makeTile({ tankId: 8, code: 'CS-F1', contents: 'fertilizer', lowStockL: 150, grossL: 160, usableL: 130, percentOfUsableCapacity: 13, takenAt: '2026-02-27T09:00:00.000Z', low: true });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'us', now: NOW } });

    const link = wrapper.get('[data-testid="board-tile-CS-F1"]');
    expect(link.classes()).toContain('tile--low');
    expect(link.classes()).toContain('tile--stale');
    expect(link.text()).toContain('Stale: read 3 days ago');
    // 150 L ÷ 3.785411784 L/gal (NIST Handbook 44 Appendix C) = 39.6 gal.
    expect(link.text()).toContain('Low: under 40 gal');
    expect(link.get('svg[role="img"]').attributes('aria-label')).toMatch(/^Sight tube: /);
  });

  it('shows days of cover and the use per day when use was seen', async () => {
    const tile = makeTile({ tankId: 10, code: 'CS-W2', grossL: 6_000, usableL: 5_400, takenAt: '2026-03-02T09:00:00.000Z', useLPerDay: 600, daysOfCover: 9 });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'metric', now: NOW } });

    const cover = wrapper.get('[data-testid="board-cover-CS-W2"]');
    expect(cover.text()).toContain('≈ 9 days left');
    expect(cover.text()).toContain('at 600 L/day');
    expect(cover.classes()).not.toContain('cover--short');
  });

  it('shows the use per day in US gallons for a US-units user', async () => {
    // 600 L ÷ 3.785411784 L/gal (NIST Handbook 44, Appendix C) = 158.5 gal.
    const tile = makeTile({ tankId: 10, code: 'CS-W2', grossL: 6_000, usableL: 5_400, takenAt: '2026-03-02T09:00:00.000Z', useLPerDay: 600, daysOfCover: 9 });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'us', now: NOW } });

    expect(wrapper.get('[data-testid="board-cover-CS-W2"]').text()).toContain('159 gal/day');
  });

  it('turns the days of cover amber with one decimal when under three days are left', async () => {
    const tile = makeTile({ tankId: 11, code: 'CS-F2', contents: 'fertilizer', grossL: 120, usableL: 84, takenAt: '2026-03-02T09:00:00.000Z', useLPerDay: 60, daysOfCover: 1.4 });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'metric', now: NOW } });

    const cover = wrapper.get('[data-testid="board-cover-CS-F2"]');
    expect(cover.classes()).toContain('cover--short');
    expect(cover.text()).toContain('≈ 1.4 days left');
    expect(cover.text()).toContain('60 L/day');
  });

  it('says no use was seen when the board has no days of cover', async () => {
    const tile = makeTile({ tankId: 12, code: 'CS-W3', grossL: 6_000, usableL: 5_400, takenAt: '2026-03-02T09:00:00.000Z', useLPerDay: 0, daysOfCover: null });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'metric', now: NOW } });

    const cover = wrapper.get('[data-testid="board-cover-CS-W3"]');
    expect(cover.text()).toBe('No use seen');
    expect(cover.classes()).not.toContain('cover--short');
  });

  it('says when a tank has no reading yet', async () => {
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile: makeTile({ tankId: 9, code: 'CS-W9' }), unitSystem: 'metric', now: NOW } });

    expect(wrapper.get('[data-testid="board-tile-CS-W9"]').text()).toContain('No reading yet');
    expect(wrapper.find('[data-testid="board-cover-CS-W9"]').exists()).toBe(false);
    expect(wrapper.get('svg[role="img"]').attributes('aria-label')).toMatch(/^Sight tube: no reading yet;/);
  });
});

describe('BoardTankTile, run down and flagged', () => {
  it('shows "about 0 L" as the main figure of a tank likely run down, with the old reading small and dated', async () => {
    const tile = makeTile({ tankId: 13, code: 'CS-W4', grossL: 6_000, usableL: 5_400, takenAt: '2026-02-26T12:00:00.000Z', useLPerDay: 900, daysOfCover: 0 });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'metric', now: NOW } });

    const link = wrapper.get('[data-testid="board-tile-CS-W4"]');
    expect(link.get('[data-testid="board-cover-CS-W4"]').text()).toContain('Likely run down by now');
    expect(link.get('.stock__figure').text()).toBe('about 0 L');
    expect(link.get('[data-testid="board-stock-CS-W4-reading"]').text()).toMatch(/^Read 4 days ago: 5,400 L usable, 6,000 L in the tank$/);
    expect(link.get('[data-testid="board-stock-CS-W4-reading"]').classes()).toContain('stock__more');
  });

  it('marks leak, frost, cold-culture and above-fill-line flags on the tile with an icon and words', async () => {
    const tile = makeTile({ tankId: 14, code: 'CS-C5', contents: 'culture', grossL: 600, usableL: 550, takenAt: '2026-03-02T09:00:00.000Z' });
    const flagKinds = ['suspected-leak', 'frost-risk', 'cold-culture', 'overfill', 'low-stock'] as const;
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'metric', now: NOW, flagKinds } });

    const link = wrapper.get('[data-testid="board-tile-CS-C5"]');
    expect(link.classes()).toContain('tile--flagged');
    const items = link.findAll('[data-testid="board-tile-flags-CS-C5"] li');
    expect(items.map((i) => i.text())).toEqual(['Possible leak', 'Frost risk', 'Culture too cold', 'Above the fill line']);
    for (const i of items) expect(i.find('i.pi').exists()).toBe(true);
  });

  it('shows no flag list for a tank without flags', async () => {
    const tile = makeTile({ tankId: 15, code: 'CS-W5', grossL: 600, usableL: 550, takenAt: '2026-03-02T09:00:00.000Z' });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'metric', now: NOW } });
    expect(wrapper.find('[data-testid="board-tile-flags-CS-W5"]').exists()).toBe(false);
    expect(wrapper.get('[data-testid="board-tile-CS-W5"]').classes()).not.toContain('tile--flagged');
  });
});

describe('BoardSightTube', () => {
  const base = { heightMm: 2000, datumOffsetMm: 50, outletHeightMm: 100, safeFillLevelMm: 1900, contents: 'water' as const, low: false, unitSystem: 'metric' as const };

  it('says the reading, the outlet line and the safe fill line, and the figures, as an image label', async () => {
    const { wrapper } = await mountWithApp(BoardSightTube, { pinia, path: '/', props: { ...base, levelMm: 1000, figuresText: '5,500 L usable' } });
    const svg = wrapper.get('svg');
    expect(svg.attributes('role')).toBe('img');
    expect(svg.attributes('aria-label')).toBe('Sight tube: level 1,000 mm above the floor, 950 mm on the tube; outlet line at 100 mm; safe fill line at 1,900 mm. 5,500 L usable.');
  });

  it('draws the level, the outlet and the fill line at their heights on the tube', async () => {
    const { wrapper } = await mountWithApp(BoardSightTube, { pinia, path: '/', props: { ...base, levelMm: 1000 } });
    const y = (sel: string) => Number(wrapper.get(sel).attributes('y1'));
    // 84 units of tube from the floor (y 92) to the top (y 8): 1,000 of 2,000 mm is halfway, y 50.
    expect(y('.tube__reading line')).toBeCloseTo(50, 9);
    expect(y('.tube__outlet line')).toBeCloseTo(92 - (100 / 2000) * 84, 9);
    expect(y('.tube__fill line')).toBeCloseTo(92 - (1900 / 2000) * 84, 9);
  });

  it('says when the level is above the safe fill line, and draws no reading without one', async () => {
    const over = await mountWithApp(BoardSightTube, { pinia, path: '/', props: { ...base, levelMm: 1950 } });
    expect(over.wrapper.get('svg').attributes('aria-label')).toContain('above the safe fill line');
    const none = await mountWithApp(BoardSightTube, { pinia, path: '/', props: { ...base, levelMm: null } });
    expect(none.wrapper.find('.tube__reading').exists()).toBe(false);
  });
});

describe('BoardTotalCard', () => {
  it('shows usable volume, percent of capacity, the oldest reading and unread tanks', async () => {
    const { wrapper } = await mountWithApp(BoardTotalCard, { pinia, path: '/', props: { total: total(), unitSystem: 'metric', now: NOW, testId: 'board-total-water' } });

    const card = wrapper.get('[data-testid="board-total-water"]');
    expect(card.text()).toContain('11,000 L');
    expect(card.get('[data-testid="board-total-water-percent"]').text()).toBe('50 % of 22,000 L usable capacity');
    expect(card.text()).toContain('Oldest reading 3 h ago');
    expect(card.text()).not.toMatch(/stale/i);
    expect(card.text()).toContain('1 tank not read yet');
  });

  it('flags a total whose oldest reading is more than two days old', async () => {
    const { wrapper } = await mountWithApp(BoardTotalCard, {
      pinia,
      path: '/',
      props: { total: total({ oldestReadingAt: '2026-02-28T06:00:00.000Z' }), unitSystem: 'metric', now: NOW, testId: 'board-total-water' },
    });

    const card = wrapper.get('[data-testid="board-total-water"]');
    expect(card.classes()).toContain('total--stale');
    expect(card.text()).toContain('Oldest reading 2 days ago');
    expect(card.text()).toMatch(/stale/);
  });

  it('says so when a contents has no tanks', async () => {
    const { wrapper } = await mountWithApp(BoardTotalCard, {
      pinia,
      path: '/',
      props: { total: total({ tanks: 0, tanksWithoutReading: 0, usableL: 0, grossL: 0, capacityL: 0, oldestReadingAt: null }), unitSystem: 'metric', now: NOW, testId: 'board-total-water' },
    });

    expect(wrapper.get('[data-testid="board-total-water"]').text()).toContain('No tanks');
  });
});

describe('the board in Spanish and French', () => {
  afterEach(() => setLanguage('en'));
  /** The signed-in manager speaks `language`: the session store switches the screens to it on mounting. */
  const speaking = (language: 'es' | 'fr') => {
    vi.mocked(authApi).fetchSession.mockResolvedValue(sessionOf(makeUser('manager', { language })));
    setLanguage(language);
  };

  it('shows a tile, its cover line and its sight tube in Spanish, with no English sentence of the board left', async () => {
    speaking('es');
    const tile = makeTile({ tankId: 7, code: 'CS-W1', grossL: 6_000, usableL: 5_500, levelMm: 1000, low: true, lowStockL: 20_000, takenAt: '2026-02-28T09:00:00.000Z', useLPerDay: 600, daysOfCover: 9.4 });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'metric', now: NOW, flagKinds: ['frost-risk'] } });

    const link = wrapper.get('[data-testid="board-tile-CS-W1"]');
    expect(link.get('[data-testid="board-tile-flags-CS-W1"]').text()).toBe('Riesgo de helada');
    expect(link.get('[data-testid="board-cover-CS-W1"]').text()).toMatch(/^Quedan ≈ 9 días\s*a 600 L\/día$/);
    expect(link.get('.tile__when').text()).toBe('Desactualizado: leído hace 2 días');
    expect(link.text()).toContain('Bajo: menos de 20.000 L');
    expect(link.get('svg').attributes('aria-label')).toMatch(/^Tubo de nivel: nivel a 1\.?000 mm del suelo, 1\.?000 mm en el tubo; línea de salida a 100 mm; nivel máximo de llenado a 1\.?900 mm\./);
    expect(englishLeft(`${link.text()} ${link.get('svg').attributes('aria-label')}`, ['board'])).toEqual([]);
  });

  it('counts the tanks of a total in French, singular for one', async () => {
    speaking('fr');
    const { wrapper } = await mountWithApp(BoardTotalCard, { pinia, path: '/', props: { total: total(), unitSystem: 'metric', now: NOW, testId: 'board-total-water' } });

    const card = wrapper.get('[data-testid="board-total-water"]');
    // French puts a narrow no-break space between thousands; compare with plain spaces.
    const text = card.text().replace(/[\u202f\u00a0]/g, ' ');
    expect(text).toContain('3 cuves');
    expect(text).toContain('Relevé le plus ancien : il y a 3 h');
    expect(text).toContain('1 cuve pas encore relevée (non comptée)');
    expect(card.get('[data-testid="board-total-water-percent"]').text().replace(/[\u202f\u00a0]/g, ' ')).toBe('50 % de 22 000 L de capacité utile');
    expect(englishLeft(card.text(), ['board'])).toEqual([]);
  });

  it('names the live status in the language chosen, and follows a change of language at once', async () => {
    speaking('es');
    const { wrapper } = await mountWithApp(BoardLiveStatus, { pinia, path: '/', props: { status: 'reconnecting' } });
    expect(wrapper.get('[data-testid="board-live"]').text()).toContain('Reconectando…');
    setLanguage('fr');
    await wrapper.vm.$nextTick();
    expect(wrapper.get('[data-testid="board-live"]').text()).toContain('Reconnexion…');
    expect(wrapper.get('[data-testid="board-live"]').attributes('title')).toBe('La connexion en direct a été coupée ; les chiffres peuvent être en retard jusqu\'à son retour.');
  });
});
