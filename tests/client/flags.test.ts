import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import { FLAG_CAUTIONS, FLAG_LABELS } from '@shared/flags';
import { FLAG_KINDS, FLAG_STATUSES, type Flag } from '@shared/schemas';
import * as authApi from '@/api/auth';
import * as farmsApi from '@/api/farms';
import * as flagsApi from '@/api/flags';
import { useFlagsStore } from '@/stores/flags';
import FlagsView from '@/views/FlagsView.vue';
import { FLAG_KIND_LOOKS } from '@/components/flags/flagKinds';
import { setLanguage } from '@/i18n';
import { englishLeft } from './support/englishLeft';
import { makeFarm, makeUser, sessionOf } from './support/fixtures';
import { mountWithApp } from './support/mountApp';

vi.mock('@/api/flags', () => ({ fetchFlags: vi.fn(), acknowledgeFlag: vi.fn(), clearFlag: vi.fn(), onFlagsPush: vi.fn(() => () => undefined) }));
vi.mock('@/api/auth', () => ({ fetchSession: vi.fn(), signIn: vi.fn(), signOut: vi.fn(), updateProfile: vi.fn(), setPassword: vi.fn(), requestPasswordReset: vi.fn(), fetchTokenInfo: vi.fn() }));
vi.mock('@/api/farms', () => ({ fetchFarms: vi.fn(), fetchFarm: vi.fn(), createFarm: vi.fn(), updateFarm: vi.fn() }));

const api = vi.mocked(flagsApi);
let pinia: Pinia;

// Invented flags on two invented farms (11 Creek site, 12 Ridge block).
function makeFlag(id: number, overrides: Partial<Flag> = {}): Flag {
  return {
    id, farmId: 11, farmName: 'Creek site', kind: 'low-stock', subjectType: 'tank', subjectId: 100 + id, subjectName: `Tank ${id} (CS-${id})`, status: 'open',
    message: `Tank ${id} has 120 L usable, under its 300 L threshold`, value: 120, raisedAt: `2026-03-02T0${id % 10}:00:00.000Z`, lastSeenAt: `2026-03-02T0${id % 10}:30:00.000Z`,
    acknowledgedAt: null, acknowledgedBy: null, ackNote: null, clearedAt: null, clearedBy: null, clearNote: null, ...overrides,
  };
}

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
});

describe('useFlagsStore', () => {
  it('replaces only the pushed farm’s active flags when a flags:farm push arrives', async () => {
    api.fetchFlags.mockResolvedValue([makeFlag(3, { farmId: 12, farmName: 'Ridge block' }), makeFlag(2), makeFlag(1, { kind: 'stale-tank' })]);
    const store = useFlagsStore();
    await store.loadActive();
    await store.load();

    store.applyFarmPush({ farmId: 11, flags: [makeFlag(4, { kind: 'cold-culture', value: 15 }), makeFlag(2)] });

    expect(store.active.map((f) => f.id)).toEqual([4, 3, 2]);
    expect(store.list.map((f) => f.id)).toEqual([4, 3, 2]);
    expect(store.activeByKind.map((k) => [k.kind, k.flags.length])).toEqual([['low-stock', 2], ['cold-culture', 1]]);
  });

  it('drops a farm’s flags when its push is empty and keeps the list’s farm filter', async () => {
    api.fetchFlags.mockResolvedValue([makeFlag(2)]);
    const store = useFlagsStore();
    await store.setFilters({ farmId: 11 });

    store.applyFarmPush({ farmId: 12, flags: [makeFlag(5, { farmId: 12 })] });
    expect(store.list.map((f) => f.id)).toEqual([2]);
    store.applyFarmPush({ farmId: 11, flags: [] });
    expect(store.list).toEqual([]);
  });

  it('replays a push that arrived while the first load was on its way', async () => {
    let answer: (rows: Flag[]) => void = () => undefined;
    api.fetchFlags.mockReturnValue(new Promise((resolve) => (answer = resolve)));
    const store = useFlagsStore();
    const loading = store.loadActive();

    store.applyFarmPush({ farmId: 11, flags: [makeFlag(7, { kind: 'frost-risk' })] });
    answer([makeFlag(2), makeFlag(3, { farmId: 12 })]);
    await loading;

    expect(store.active.map((f) => f.id)).toEqual([7, 3]);
  });

  it('re-asks the server when a push arrives while cleared history is shown', async () => {
    api.fetchFlags.mockResolvedValue([makeFlag(1, { status: 'cleared', clearedAt: '2026-03-02T05:00:00.000Z' })]);
    const store = useFlagsStore();
    await store.setFilters({ status: 'cleared' });
    store.applyFarmPush({ farmId: 11, flags: [] });
    await flushPromises();
    expect(api.fetchFlags).toHaveBeenCalledTimes(2);
    expect(api.fetchFlags).toHaveBeenLastCalledWith({ status: 'cleared', farmId: undefined, kind: undefined });
  });

  it('updates the row and the board list when a flag is acknowledged', async () => {
    api.fetchFlags.mockResolvedValue([makeFlag(2), makeFlag(1)]);
    const seen = makeFlag(2, { status: 'acknowledged', acknowledgedAt: '2026-03-02T09:00:00.000Z', acknowledgedBy: 'Dana Okafor', ackNote: 'Refill booked for noon' });
    api.acknowledgeFlag.mockResolvedValue(seen);
    const store = useFlagsStore();
    await Promise.all([store.load(), store.loadActive()]);

    await store.acknowledge(2, 'Refill booked for noon');

    expect(api.acknowledgeFlag).toHaveBeenCalledWith(2, 'Refill booked for noon');
    expect(store.list.find((f) => f.id === 2)).toEqual(seen);
    expect(store.active.find((f) => f.id === 2)!.status).toBe('acknowledged');
    expect(store.list.find((f) => f.id === 1)!.status).toBe('open');
  });
});

describe('FlagsView', () => {
  beforeEach(() => {
    vi.mocked(authApi).fetchSession.mockResolvedValue(sessionOf(makeUser('manager')));
    vi.mocked(farmsApi).fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site'), makeFarm(12, 'Ridge block')]);
  });

  it('shows the caution for cold-culture and frost-risk flags and none for low stock', async () => {
    api.fetchFlags.mockResolvedValue([
      makeFlag(1, { kind: 'cold-culture', message: 'Culture A (CS-C1) is at 15 °C, under 18 °C: the culture slows or stops' }),
      makeFlag(2, { kind: 'frost-risk', message: 'Water (CS-W1) is at 1 °C (at or under 2 °C): drain or protect' }),
      makeFlag(3, { kind: 'low-stock' }),
    ]);
    const { wrapper } = await mountWithApp(FlagsView, { pinia, path: '/flags' });

    expect(wrapper.get('[data-testid="flags-row-1"]').text()).toContain('Culture too cold');
    expect(wrapper.get('[data-testid="flags-caution-1"]').text()).toContain(FLAG_CAUTIONS['cold-culture']!);
    expect(wrapper.get('[data-testid="flags-caution-1"]').text()).toMatch(/residual-current/);
    expect(wrapper.get('[data-testid="flags-caution-2"]').text()).toContain(FLAG_CAUTIONS['frost-risk']!);
    expect(wrapper.find('[data-testid="flags-caution-3"]').exists()).toBe(false);
    expect(wrapper.get('[data-testid="flags-subject-1"]').attributes('href')).toBe('/tanks/101');
  });

  it('gives every kind an icon and words of its own, and every status an icon beside its word', async () => {
    api.fetchFlags.mockResolvedValue(FLAG_KINDS.map((kind, i) => makeFlag(i + 1, { kind, status: FLAG_STATUSES[i % FLAG_STATUSES.length]! })));
    const { wrapper } = await mountWithApp(FlagsView, { pinia, path: '/flags' });

    const icons = FLAG_KINDS.map((_kind, i) => wrapper.get(`[data-testid="flags-icon-${i + 1}"]`).classes().join(' '));
    const meanings = FLAG_KINDS.map((_kind, i) => wrapper.get(`[data-testid="flags-meaning-${i + 1}"]`).text());
    expect(icons.every((icon) => /\bpi-[a-z-]+/.test(icon))).toBe(true);
    expect(new Set(icons).size).toBe(FLAG_KINDS.length);
    expect(new Set(meanings).size).toBe(FLAG_KINDS.length);
    FLAG_KINDS.forEach((kind, i) => {
      expect(wrapper.get(`[data-testid="flags-row-${i + 1}"] .flag__kind`).text()).toBe(FLAG_LABELS[kind]);
      expect(meanings[i]).toBe(FLAG_KIND_LOOKS[kind].meaning);
    });
    const statusIcons = FLAG_STATUSES.map((_s, i) => wrapper.get(`[data-testid="flags-row-${i + 1}"] .flag__status i`).classes().join(' '));
    expect(new Set(statusIcons).size).toBe(FLAG_STATUSES.length);
    expect(FLAG_STATUSES.map((_s, i) => wrapper.get(`[data-testid="flags-status-${i + 1}"]`).text())).toEqual(['Needs someone', 'Seen', 'Over']);
  });

  it('acknowledges a flag with a note and shows it on the row', async () => {
    api.fetchFlags.mockResolvedValue([makeFlag(1, { kind: 'cold-culture' })]);
    api.acknowledgeFlag.mockImplementation(async (id, note) => makeFlag(id, { kind: 'cold-culture', status: 'acknowledged', acknowledgedAt: new Date().toISOString(), acknowledgedBy: 'Dana Okafor', ackNote: note }));
    const { wrapper } = await mountWithApp(FlagsView, { pinia, path: '/flags' });

    await wrapper.get('[data-testid="flags-ack-1"]').trigger('click');
    await flushPromises();
    const note = document.querySelector<HTMLTextAreaElement>('[data-testid="flags-ack-note"]')!;
    note.value = 'x';
    note.dispatchEvent(new Event('input'));
    document.querySelector<HTMLButtonElement>('[data-testid="flags-ack-submit"]')!.click();
    await flushPromises();
    // flagAckSchema wants at least two characters: refused with the field's message, nothing sent.
    expect(document.querySelector('[data-testid="flags-ack-note-error"]')!.textContent).toContain('say what was done');
    expect(api.acknowledgeFlag).not.toHaveBeenCalled();

    note.value = 'Heater reset, checked again at 14:00';
    note.dispatchEvent(new Event('input'));
    document.querySelector<HTMLButtonElement>('[data-testid="flags-ack-submit"]')!.click();
    await flushPromises();

    expect(api.acknowledgeFlag).toHaveBeenCalledWith(1, 'Heater reset, checked again at 14:00');
    expect(wrapper.get('[data-testid="flags-status-1"]').text()).toBe('Seen');
    expect(wrapper.get('[data-testid="flags-acknowledged-1"]').text()).toContain('Heater reset');
    expect(wrapper.find('[data-testid="flags-ack-1"]').exists()).toBe(false);
  });

  it('lets a manager clear a frost flag by hand only with a note, and offers no such button for low stock', async () => {
    api.fetchFlags.mockResolvedValue([makeFlag(1, { kind: 'frost-risk' }), makeFlag(2, { kind: 'low-stock' })]);
    api.clearFlag.mockImplementation(async (id, note) => makeFlag(id, { kind: 'frost-risk', status: 'cleared', clearedAt: new Date().toISOString(), clearedBy: 'Dana Okafor', clearNote: note }));
    const { wrapper } = await mountWithApp(FlagsView, { pinia, path: '/flags' });
    expect(wrapper.find('[data-testid="flags-clear-2"]').exists()).toBe(false);

    await wrapper.get('[data-testid="flags-clear-1"]').trigger('click');
    await flushPromises();
    expect(document.querySelector('[data-testid="flags-ack-dialog"]')!.textContent).toContain('Why is it over?');
    document.querySelector<HTMLButtonElement>('[data-testid="flags-ack-submit"]')!.click();
    await flushPromises();
    expect(document.querySelector('[data-testid="flags-ack-note-error"]')!.textContent).toContain('say why the flag is over');
    expect(api.clearFlag).not.toHaveBeenCalled();

    const note = document.querySelector<HTMLTextAreaElement>('[data-testid="flags-ack-note"]')!;
    note.value = 'Tote drained and stored indoors';
    note.dispatchEvent(new Event('input'));
    document.querySelector<HTMLButtonElement>('[data-testid="flags-ack-submit"]')!.click();
    await flushPromises();
    expect(api.clearFlag).toHaveBeenCalledWith(1, 'Tote drained and stored indoors');
    // The list shows flags needing attention: the cleared one leaves it at once.
    expect(wrapper.find('[data-testid="flags-row-1"]').exists()).toBe(false);
    expect(useFlagsStore().list.map((f) => f.id)).toEqual([2]);
  });

  it('shows a worker no clear-by-hand button', async () => {
    vi.mocked(authApi).fetchSession.mockResolvedValue(sessionOf(makeUser('worker')));
    api.fetchFlags.mockResolvedValue([makeFlag(1, { kind: 'frost-risk' })]);
    const { wrapper } = await mountWithApp(FlagsView, { pinia, path: '/flags' });
    expect(wrapper.find('[data-testid="flags-ack-1"]').exists()).toBe(true);
    expect(wrapper.find('[data-testid="flags-clear-1"]').exists()).toBe(false);
  });

  it('says nothing needs the person when there are no flags, and shows a load error with retry', async () => {
    api.fetchFlags.mockResolvedValueOnce([]);
    const { wrapper } = await mountWithApp(FlagsView, { pinia, path: '/flags' });
    expect(wrapper.get('[data-testid="empty-state"]').text()).toContain('Nothing needs you right now');

    api.fetchFlags.mockRejectedValueOnce(new Error('Cannot reach the server.'));
    await useFlagsStore().load();
    await flushPromises();
    expect(wrapper.get('[data-testid="load-error"]').text()).toContain('Cannot reach the server.');
  });
});

describe('FlagsView in French', () => {
  afterEach(() => setLanguage('en'));

  it('shows the filters, the count and who saw or cleared each flag in French, the notes in French quotation marks', async () => {
    vi.mocked(authApi).fetchSession.mockResolvedValue(sessionOf(makeUser('manager', { language: 'fr' })));
    vi.mocked(farmsApi).fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site')]);
    api.fetchFlags.mockResolvedValue([
      makeFlag(1, { kind: 'cold-culture', status: 'acknowledged', acknowledgedAt: '2026-03-02T02:00:00.000Z', acknowledgedBy: 'Dana Okafor', ackNote: 'Chauffage relancé' }),
      makeFlag(2, { kind: 'frost-risk', status: 'cleared', clearedAt: '2026-03-02T03:00:00.000Z', clearedBy: 'Dana Okafor', clearNote: 'Cuve vidée' }),
      makeFlag(3, { kind: 'low-stock' }),
    ]);
    const { wrapper } = await mountWithApp(FlagsView, { pinia, path: '/flags' });

    expect(wrapper.get('h1').text()).toBe('Alertes');
    expect(wrapper.get('label[for="flags-filter-status"]').text()).toBe('Afficher');
    expect(wrapper.get('[data-testid="flags-filter-status"]').text()).toContain('À traiter (ouvertes ou vues)');
    expect(wrapper.get('[data-testid="flags-count"]').text()).toBe('3 alertes');
    // The server keeps the flag's sentence in English; the card says it in French with the same figures.
    expect(wrapper.get('[data-testid="flags-row-3"] .flag__message').text()).toBe('Tank 3 a 120 L utiles, sous son seuil de 300 L');
    expect(wrapper.get('[data-testid="flags-row-1"] .flag__times').text()).toMatch(/^Déclenchée il y a \d+ jours · dernière constatation il y a \d+ jours$/);
    expect(wrapper.get('[data-testid="flags-row-2"] .flag__times').text()).toMatch(/^Déclenchée il y a \d+ jours · terminée il y a \d+ jours$/);
    expect(wrapper.get('[data-testid="flags-acknowledged-1"]').text()).toMatch(/^Vue par Dana Okafor il y a \d+ jours : « Chauffage relancé »$/);
    expect(wrapper.get('[data-testid="flags-cleared-by-2"]').text()).toBe('Levée à la main par Dana Okafor : « Cuve vidée »');
    expect(englishLeft(wrapper.text(), ['flags'])).toEqual([]);
  });
});
