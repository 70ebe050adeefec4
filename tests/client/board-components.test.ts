import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import type { ContentsTotal } from '@shared/schemas';
import * as authApi from '@/api/auth';
import BoardTankTile from '@/components/board/BoardTankTile.vue';
import BoardTotalCard from '@/components/board/BoardTotalCard.vue';
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
  percentFull: 50,
  tanks: 3,
  tanksWithoutReading: 1,
  oldestReadingAt: '2026-03-02T09:00:00.000Z',
  ...overrides,
});

describe('BoardTankTile', () => {
  it('links to the tank page and shows usable stock with the age of the reading', async () => {
    const tile = makeTile({ tankId: 7, code: 'CS-W1', grossL: 6_000, usableL: 5_500, percentFull: 60, takenAt: '2026-03-02T09:00:00.000Z' });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'metric', now: NOW } });

    const link = wrapper.get('[data-testid="board-tile-CS-W1"]');
    expect(link.attributes('href')).toBe('/tanks/7');
    expect(link.text()).toContain('5,500 L usable');
    expect(link.text()).toContain('60 % full');
    expect(link.text()).toContain('Read 3 h ago');
    expect(link.classes()).not.toContain('tile--low');
    expect(link.classes()).not.toContain('tile--stale');
  });

  it('highlights a low tank and flags a reading older than two days', async () => {
    const tile = makeTile({ tankId: 8, code: 'CS-F1', contents: 'fertilizer', lowStockL: 150, grossL: 160, usableL: 130, percentFull: 13, takenAt: '2026-02-27T09:00:00.000Z', low: true });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'us', now: NOW } });

    const link = wrapper.get('[data-testid="board-tile-CS-F1"]');
    expect(link.classes()).toContain('tile--low');
    expect(link.classes()).toContain('tile--stale');
    expect(link.text()).toContain('Stale: read 3 days ago');
    // 150 L ÷ 3.785411784 L/gal (NIST Handbook 44 Appendix C) = 39.6 gal.
    expect(link.text()).toContain('Low: under 40 gal');
    expect(link.get('svg').attributes('aria-label')).toMatch(/low$/);
  });

  it('shows days of cover and the use per day when use was seen', async () => {
    const tile = makeTile({ tankId: 10, code: 'CS-W2', grossL: 6_000, usableL: 5_400, percentFull: 60, takenAt: '2026-03-02T09:00:00.000Z', useLPerDay: 600, daysOfCover: 9 });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'metric', now: NOW } });

    const cover = wrapper.get('[data-testid="board-cover-CS-W2"]');
    expect(cover.text()).toContain('≈ 9 days left');
    expect(cover.text()).toContain('at 600 L/day');
    expect(cover.classes()).not.toContain('cover--short');
  });

  it('shows the use per day in US gallons for a US-units user', async () => {
    // 600 L ÷ 3.785411784 L/gal (NIST Handbook 44, Appendix C) = 158.5 gal.
    const tile = makeTile({ tankId: 10, code: 'CS-W2', grossL: 6_000, usableL: 5_400, percentFull: 60, takenAt: '2026-03-02T09:00:00.000Z', useLPerDay: 600, daysOfCover: 9 });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'us', now: NOW } });

    expect(wrapper.get('[data-testid="board-cover-CS-W2"]').text()).toContain('159 gal/day');
  });

  it('turns the days of cover amber with one decimal when under three days are left', async () => {
    const tile = makeTile({ tankId: 11, code: 'CS-F2', contents: 'fertilizer', grossL: 120, usableL: 84, percentFull: 40, takenAt: '2026-03-02T09:00:00.000Z', useLPerDay: 60, daysOfCover: 1.4 });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'metric', now: NOW } });

    const cover = wrapper.get('[data-testid="board-cover-CS-F2"]');
    expect(cover.classes()).toContain('cover--short');
    expect(cover.text()).toContain('≈ 1.4 days left');
    expect(cover.text()).toContain('60 L/day');
  });

  it('says no use was seen when the board has no days of cover', async () => {
    const tile = makeTile({ tankId: 12, code: 'CS-W3', grossL: 6_000, usableL: 5_400, percentFull: 60, takenAt: '2026-03-02T09:00:00.000Z', useLPerDay: 0, daysOfCover: null });
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile, unitSystem: 'metric', now: NOW } });

    const cover = wrapper.get('[data-testid="board-cover-CS-W3"]');
    expect(cover.text()).toBe('No use seen');
    expect(cover.classes()).not.toContain('cover--short');
  });

  it('says when a tank has no reading yet', async () => {
    const { wrapper } = await mountWithApp(BoardTankTile, { pinia, path: '/', props: { tile: makeTile({ tankId: 9, code: 'CS-W9' }), unitSystem: 'metric', now: NOW } });

    expect(wrapper.get('[data-testid="board-tile-CS-W9"]').text()).toContain('No reading yet');
    expect(wrapper.find('[data-testid="board-cover-CS-W9"]').exists()).toBe(false);
    expect(wrapper.get('svg').attributes('aria-label')).toMatch(/^No reading/);
  });
});

describe('BoardTotalCard', () => {
  it('shows usable volume, percent of capacity, the oldest reading and unread tanks', async () => {
    const { wrapper } = await mountWithApp(BoardTotalCard, { pinia, path: '/', props: { total: total(), unitSystem: 'metric', now: NOW, testId: 'board-total-water' } });

    const card = wrapper.get('[data-testid="board-total-water"]');
    expect(card.text()).toContain('11,000 L');
    expect(card.text()).toContain('50 % of 25,000 L capacity');
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
      props: { total: total({ tanks: 0, tanksWithoutReading: 0, usableL: 0, grossL: 0, capacityL: 0, percentFull: 0, oldestReadingAt: null }), unitSystem: 'metric', now: NOW, testId: 'board-total-water' },
    });

    expect(wrapper.get('[data-testid="board-total-water"]').text()).toContain('No tanks');
  });
});
