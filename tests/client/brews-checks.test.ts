import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { flushPromises, mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { batchFit, type BatchFit } from '@shared/mixing';
import { volumeAtLevel } from '@shared/calibration';
import * as authApi from '@/api/auth';
import * as boardApi from '@/api/board';
import * as inventoryApi from '@/api/inventory';
import * as tanksApi from '@/api/tanks';
import BrewsBatchChecks from '@/components/brews/BrewsBatchChecks.vue';
import BrewsMixingCalculator from '@/components/brews/BrewsMixingCalculator.vue';
import { useBrewsStore, type NamedShortfall } from '@/stores/brews';
import { useSessionStore } from '@/stores/session';
import { makeUser, sessionOf } from './support/fixtures';
import { makeInput } from './support/inventoryFixtures';
import { boardOf, makeTank, makeTile } from './support/tankFixtures';

vi.mock('@/api/auth', () => ({ fetchSession: vi.fn(), signIn: vi.fn(), signOut: vi.fn(), updateProfile: vi.fn(), setPassword: vi.fn(), requestPasswordReset: vi.fn(), fetchTokenInfo: vi.fn() }));
vi.mock('@/api/brews', () => ({ fetchBrews: vi.fn(), createBrew: vi.fn(), updateBrew: vi.fn(), logBrewTemperature: vi.fn() }));
vi.mock('@/api/inventory', () => ({ fetchInputs: vi.fn() }));
vi.mock('@/api/tanks', () => ({ fetchTanks: vi.fn() }));
vi.mock('@/api/board', () => ({ fetchBoard: vi.fn(), fetchBoardHistory: vi.fn() }));

// Exact definition: 1 US gallon = 231 in³ = 3.785411784 L (NIST Handbook 44, Appendix C).
const L_PER_USGAL = 3.785411784;
// The fixture tile is read at 08:15 UTC; the brew starts after it.
const START = new Date('2026-03-02T09:00:00.000Z');

async function withOptions(unitSystem: 'metric' | 'us' = 'metric') {
  vi.mocked(authApi.fetchSession).mockResolvedValue(sessionOf(makeUser('worker', { unitSystem })));
  await useSessionStore().load();
  const tank = makeTank(5, { safeFillLevelMm: 1400 });
  vi.mocked(tanksApi.fetchTanks).mockResolvedValue([tank]);
  vi.mocked(inventoryApi.fetchInputs).mockResolvedValue([makeInput(9, { name: 'Kelp concentrate', unit: 'ml', onHand: 30 }), makeInput(10, { name: 'Seaweed meal', unit: 'kg', onHand: 4 })]);
  vi.mocked(boardApi.fetchBoard).mockResolvedValue(boardOf([makeTile(tank, 600)]));
  const store = useBrewsStore();
  await store.loadFarmOptions(11);
  return { store, tank };
}

beforeEach(() => {
  vi.clearAllMocks();
  setActivePinia(createPinia());
});

describe('useBrewsStore batch checks', () => {
  it('judges the form batch by the shared batchFit: water in the user unit plus inputs counted by volume', async () => {
    const { store, tank } = await withOptions('us');
    const fit = store.batchFitOf(tank, 100, [{ inputId: 9, quantity: 500 }, { inputId: 10, quantity: 3 }, { inputId: null, quantity: null }], START);
    // 100 US gal and 500 ml; the kilograms of meal add no volume.
    const expected = batchFit({ geometry: tank.geometry, safeFillLevelMm: 1400, latest: { grossL: 600, takenAt: '2026-03-02T08:15:00.000Z' }, startedAt: START.toISOString(), batchL: 100 * L_PER_USGAL + 0.5 });
    if (!fit || fit.verdict === 'unknown' || expected.verdict === 'unknown') throw new Error('expected a verdict with figures');
    expect(fit.verdict).toBe(expected.verdict);
    for (const key of ['batchL', 'safeFillL', 'heldL', 'freeL', 'leftL'] as const) expect(fit[key]).toBeCloseTo(expected[key], 9);
    expect(fit.safeFillL).toBeCloseTo(volumeAtLevel(tank.geometry, 1400), 6);
  });

  it('says over when the water alone passes the free space, and cannot judge before the latest reading', async () => {
    const { store, tank } = await withOptions();
    const freeL = volumeAtLevel(tank.geometry, 1400) - 600;
    expect(store.batchFitOf(tank, freeL + 1, [], START)).toMatchObject({ verdict: 'over' });
    expect(store.batchFitOf(tank, freeL * 0.95, [], START)).toMatchObject({ verdict: 'tight' });
    expect(store.batchFitOf(tank, freeL * 0.5, [], START)).toMatchObject({ verdict: 'fits' });
    expect(store.batchFitOf(tank, freeL + 1, [], new Date('2026-03-02T08:00:00.000Z'))).toMatchObject({ verdict: 'unknown', reason: 'reading-after-start' });
    expect(store.batchFitOf(tank, null, [], START)).toBeNull();
  });

  it('names each input the lines take more of than is on hand, with the amount missing', async () => {
    const { store } = await withOptions();
    expect(store.shortfallsOf(11, [{ inputId: 9, quantity: 20 }, { inputId: 10, quantity: 4 }, { inputId: 9, quantity: 15 }])).toEqual([
      { inputId: 9, lines: [0, 2], wanted: 35, onHand: 30, missing: 5, name: 'Kelp concentrate', unit: 'ml' },
    ]);
    expect(store.shortfallsOf(11, [{ inputId: 9, quantity: 30 }])).toEqual([]);
  });
});

const mountChecks = (props: { fit: BatchFit | null; shortfalls?: NamedShortfall[]; context?: 'form' | 'calculator'; unitSystem?: 'metric' | 'us' }) =>
  mount(BrewsBatchChecks, { props: { tankName: 'Culture tank', unitSystem: 'metric', context: 'form', ...props }, global: { plugins: [[PrimeVue, { unstyled: true }]] } });

// 1 m × 1 m cylinder with its line at 500 mm: π/8 m³ = 392.699 L (hand derivation, π r² h).
const SMALL = { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1000 } as const;
const fitOf = (heldL: number, batchL: number) => batchFit({ geometry: SMALL, safeFillLevelMm: 500, latest: { grossL: heldL, takenAt: '2026-03-02T08:15:00.000Z' }, startedAt: START.toISOString(), batchL });

describe('BrewsBatchChecks', () => {
  it('refuses a batch over the free space with its figures', () => {
    const text = mountChecks({ fit: fitOf(300, 100) }).get('[data-testid="batch-over-form"]').text();
    expect(text).toContain('Does not fit Culture tank.');
    expect(text).toContain('This brew makes 100.0 L, 7.3 L more than the 92.7 L of free space below its safe fill line (it holds 300.0 L of 392.7 L).');
  });

  it('warns of a batch in the last 10 % of the free space with what would be left', () => {
    const text = mountChecks({ fit: fitOf(300, 90), context: 'calculator' }).get('[data-testid="batch-tight-calculator"]').text();
    expect(text).toContain('These amounts make 90.0 L, 97 % of the 92.7 L free in Culture tank: 2.7 L would be left.');
  });

  it('words the figures in US gallons for a US user', () => {
    // 92.699 L = 24.5 US gal (NIST Handbook 44, Appendix C: 3.785411784 L per gal).
    expect(mountChecks({ fit: fitOf(300, 100), unitSystem: 'us' }).get('[data-testid="batch-over-form"]').text()).toContain('than the 24.5 gal of free space');
  });

  it('shows nothing for a batch that fits, and says why a fit cannot be checked', () => {
    expect(mountChecks({ fit: fitOf(0, 100) }).find('[data-testid="batch-checks-form"]').exists()).toBe(false);
    const unknown = batchFit({ geometry: SMALL, safeFillLevelMm: 500, latest: null, startedAt: START.toISOString(), batchL: 10 });
    expect(mountChecks({ fit: unknown }).get('[data-testid="batch-unknown-form"]').text()).toMatch(/has no reading yet/);
  });

  it('lists each short input with what is missing in its own unit', () => {
    const shortfalls: NamedShortfall[] = [{ inputId: 9, lines: [0], wanted: 35, onHand: 30, missing: 5, name: 'Kelp concentrate', unit: 'ml' }];
    const text = mountChecks({ fit: null, shortfalls }).get('[data-testid="batch-short-9"]').text();
    expect(text).toBe('Kelp concentrate: this brew takes 35 ml, 5 ml more than the 30 ml on hand.');
  });
});

describe('BrewsMixingCalculator fit', () => {
  it('will not hand over amounts that do not fit the chosen tank', async () => {
    const checkFit = vi.fn((a: { waterL: number; concentrateL: number }) => fitOf(300, a.waterL + a.concentrateL));
    const wrapper = mount(BrewsMixingCalculator, {
      props: { unitSystem: 'metric', kind: 'fertilizer', tankFill: null, tankName: 'Culture tank', checkFit },
      global: { plugins: [[PrimeVue, { unstyled: true }]] },
    });
    await wrapper.find('[data-testid="mix-n"]').setValue('50');
    await wrapper.find('[data-testid="mix-total"]').setValue('102');
    await wrapper.find('[data-testid="mix-conv-water"] input').setValue(true);
    await flushPromises();
    expect(checkFit).toHaveBeenLastCalledWith(expect.objectContaining({ waterL: 100, concentrateL: 2 }));
    expect(wrapper.get('[data-testid="batch-over-calculator"]').text()).toContain('These amounts make 102.0 L, 9.3 L more');
    expect(wrapper.get('[data-testid="mix-use"]').attributes('disabled')).toBeDefined();
    await wrapper.find('[data-testid="mix-total"]').setValue('51');
    await flushPromises();
    expect(wrapper.find('[data-testid="batch-over-calculator"]').exists()).toBe(false);
    expect(wrapper.get('[data-testid="mix-use"]').attributes('disabled')).toBeUndefined();
  });
});
