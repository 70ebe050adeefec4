import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, type VueWrapper } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import * as authApi from '@/api/auth';
import * as farmsApi from '@/api/farms';
import * as inventoryApi from '@/api/inventory';
import { ApiError } from '@/api/http';
import { cautionText } from '@shared/cautions';
import InputsView from '@/views/InputsView.vue';
import { setLanguage } from '@/i18n';
import { makeFarm, makeUser, sessionOf } from './support/fixtures';
import { makeInput, makeMovement, makeOrder, makeSupplier } from './support/inventoryFixtures';
import { existsInDocument, inDocument, mountWithApp, setViewportWidth } from './support/mountApp';
import { englishLeft } from './support/englishLeft';

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
vi.mock('@/api/inventory', () => ({
  fetchSuppliers: vi.fn(),
  createSupplier: vi.fn(),
  updateSupplier: vi.fn(),
  fetchInputs: vi.fn(),
  inputsCsvUrl: (filter: { farmId?: number }) => `/api/inputs?${filter.farmId ? `farmId=${filter.farmId}&` : ''}format=csv`,
  fetchInput: vi.fn(),
  createInput: vi.fn(),
  updateInput: vi.fn(),
  fetchMovements: vi.fn(),
  createMovement: vi.fn(),
  fetchOrders: vi.fn(),
  ordersCsvUrl: () => '/api/orders?format=csv',
  fetchOrder: vi.fn(),
  createOrder: vi.fn(),
  createOrdersFromSuggestions: vi.fn(),
  updateOrder: vi.fn(),
  sendOrder: vi.fn(),
  cancelOrder: vi.fn(),
  receiveOrder: vi.fn(),
}));
vi.mock('@/api/outbox', () => ({ fetchOutbox: vi.fn(), clearOutbox: vi.fn() }));

const auth = vi.mocked(authApi);
const farms = vi.mocked(farmsApi);
const api = vi.mocked(inventoryApi);
let pinia: Pinia;

// Two inputs as the server sorts them: the fish emulsion is due, the kelp is not yet.
const dueInput = makeInput(41, { name: 'Fish emulsion', onHand: 30, due: true });
const laterInput = makeInput(42, {
  name: 'Kelp concentrate',
  onHand: 160,
  dailyDemand: 2.1,
  daysOfCover: 76.2,
  reorderPoint: 20.8,
  safetyStock: 8.2,
  suggestedQuantity: 220,
  due: false,
  orderBy: '2026-12-12T09:00:00.000Z',
});

async function mountAs(role: 'buyer' | 'worker') {
  auth.fetchSession.mockResolvedValue(sessionOf(makeUser(role)));
  return mountWithApp(InputsView, { pinia, path: '/inputs' });
}

async function openInput(wrapper: VueWrapper, id: number) {
  await wrapper.get(`[data-testid="input-open-${id}"]`).trigger('click');
  await flushPromises();
}

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  setViewportWidth(1280);
  pinia = createPinia();
  setActivePinia(pinia);
  farms.fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site')]);
  api.fetchSuppliers.mockResolvedValue([makeSupplier(31)]);
  api.fetchInputs.mockResolvedValue([dueInput, laterInput]);
  api.fetchMovements.mockResolvedValue([]);
});

describe('InputsView', () => {
  it('groups the reorder list by urgency in plain sentences: the due input under “Buy now”, the other with its date', async () => {
    const { wrapper } = await mountAs('buyer');

    const rows = wrapper.findAll('[data-testid^="input-row-"]');
    expect(rows.map((r) => r.attributes('data-testid'))).toEqual(['input-row-41', 'input-row-42']);
    const now = wrapper.get('[data-testid="reorder-group-now"]');
    expect(now.get('h2').text()).toBe('Buy now 1');
    expect(now.find('[data-testid="input-row-41"]').exists()).toBe(true);
    expect(now.get('[data-testid="input-suggested"]').text()).toBe('Buy 340 L (17 packs of 20 L) now.');
    expect(now.get('[data-testid="input-onhand"]').text()).toMatch(/^30 L on hand/);
    const date = new Intl.DateTimeFormat(undefined, { day: 'numeric', month: 'short', ...(new Date().getFullYear() === 2026 ? {} : { year: 'numeric' }) }).format(new Date('2026-12-12T09:00:00.000Z'));
    const later = wrapper.get('[data-testid="input-row-42"]');
    expect(later.get('[data-testid="input-suggested"]').text()).toMatch(new RegExp(`^Buy .+ by ${date}\\.$`));
    expect(later.element.closest('[data-testid^="reorder-group-"]')?.getAttribute('data-testid')).not.toBe('reorder-group-now');
    // No chips and no trend column: the words carry the urgency.
    expect(wrapper.find('.p-tag').exists()).toBe(false);
    expect(wrapper.text()).not.toMatch(/Order now|Order by/);
    expect(wrapper.get('[data-testid="inputs-due-banner"]').text()).toContain('1 input is at or below the reorder point.');
    expect(wrapper.get('[data-testid="inputs-draft-orders"]').text()).toBe('Prepare orders from the reorder list');
  });

  it('explains the reorder point and the suggestion in words, with the server’s own figures', async () => {
    const { wrapper } = await mountAs('buyer');

    await openInput(wrapper, 41);

    const advice = inDocument('input-advice');
    expect(advice.get('[data-testid="input-advice-rop"]').text()).toContain(
      'Reorder point 41.6 L = 6 days of lead time × 5.2 L a day + 10.4 L safety stock for a 95 % service level.',
    );
    expect(advice.get('[data-testid="input-advice-order"]').text()).toBe('Buy 340 L (17 packs of 20 L) now.');
    expect(advice.get('[data-testid="input-advice-cover"]').text()).toBe('30 L on hand lasts about 5.8 days at 5.2 L a day.');
    expect(advice.get('[data-testid="input-advice-why"]').text()).toContain('economic order quantity, 337.5 L');
  });

  it('follows the figures the server sends instead of working them out again', async () => {
    api.fetchInputs.mockResolvedValue([makeInput(41, { reorderPoint: 50, safetyStock: 18.8, serviceLevel: 0.99 })]);
    const { wrapper } = await mountAs('buyer');

    await openInput(wrapper, 41);

    expect(inDocument('input-advice-rop').text()).toContain('Reorder point 50 L = 6 days of lead time × 5.2 L a day + 18.8 L safety stock for a 99 % service level.');
  });

  it('shows the pest-control caution on the list and on such an input, deferring to the label', async () => {
    api.fetchInputs.mockResolvedValue([makeInput(43, { name: 'Neem oil emulsion', category: 'pest-control' })]);
    const { wrapper } = await mountAs('buyer');

    expect(wrapper.get('[data-testid="inputs-caution"]').text()).toContain(cautionText('pest-control-storage'));
    await openInput(wrapper, 43);
    const caution = inDocument('input-caution');
    expect(caution.text()).toBe(cautionText('pest-control-storage'));
    expect(caution.text()).toMatch(/Follow the label and your local rules\.$/);
    // Under test the Message's transition is stubbed and takes the test id; its root is inside.
    const root = caution.find('[data-pc-name="message"]');
    expect((root.exists() ? root : caution).attributes('data-p')).toBe('warn');
  });

  it('gives a worker use and count but not adjustments, edits or orders', async () => {
    const { wrapper } = await mountAs('worker');

    expect(wrapper.find('[data-testid="inputs-new"]').exists()).toBe(false);
    expect(wrapper.find('[data-testid="inputs-due-banner"]').exists()).toBe(false);
    await openInput(wrapper, 41);
    expect(existsInDocument('input-record-use')).toBe(true);
    expect(existsInDocument('input-record-count')).toBe(true);
    expect(existsInDocument('input-adjust')).toBe(false);
    expect(existsInDocument('input-edit')).toBe(false);
    expect(existsInDocument('input-order')).toBe(false);
  });

  it('shows each count with its difference from the records', async () => {
    api.fetchMovements.mockResolvedValue([makeMovement(902, 41, { kind: 'count', quantity: 28, difference: -1.5 }), makeMovement(901, 41, { kind: 'use', quantity: 4 })]);
    const { wrapper } = await mountAs('buyer');

    await openInput(wrapper, 41);

    expect(inDocument('movement-902').text()).toContain('Counted 28 L, 1.5 L less than the records');
    expect(inDocument('movement-901').text()).toContain('−4 L');
  });

  it('refuses an adjustment without a reason with the shared schema’s message, and sends nothing', async () => {
    const { wrapper } = await mountAs('buyer');
    await openInput(wrapper, 41);
    await inDocument('input-adjust').trigger('click');
    await flushPromises();

    inDocument('movement-quantity').find('input').element.value = '3';
    await inDocument('movement-quantity').find('input').trigger('input');
    await inDocument('movement-quantity').find('input').trigger('blur');
    await inDocument('movement-submit').trigger('submit');
    await flushPromises();

    expect(api.createMovement).not.toHaveBeenCalled();
    expect(inDocument('movement-reason-error').text()).toBe('say why the stock is adjusted');
  });

  it('puts the server’s “not that much on hand” under the quantity of a use', async () => {
    api.createMovement.mockRejectedValue(new ApiError(409, 'insufficient_stock', 'quantity: only 30 L on hand; record a count if the shelf holds more', 'quantity'));
    const { wrapper } = await mountAs('worker');
    await openInput(wrapper, 41);
    await inDocument('input-record-use').trigger('click');
    await flushPromises();

    const field = inDocument('movement-quantity').find('input');
    field.element.value = '45';
    await field.trigger('input');
    await field.trigger('blur');
    await inDocument('movement-submit').trigger('submit');
    await flushPromises();

    expect(api.createMovement).toHaveBeenCalledWith(41, { kind: 'use', quantity: 45, reason: '' });
    expect(inDocument('movement-quantity-error').text()).toBe('only 30 L on hand; record a count if the shelf holds more');
  });

  it('drafts orders from the banner and opens the draft on the Orders screen', async () => {
    api.createOrdersFromSuggestions.mockResolvedValue([makeOrder(8)]);
    api.fetchOrders.mockResolvedValue([makeOrder(8)]);
    const { wrapper, router } = await mountAs('buyer');

    await wrapper.get('[data-testid="inputs-draft-orders"]').trigger('click');
    await flushPromises();

    expect(api.createOrdersFromSuggestions).toHaveBeenCalledWith({ farmId: undefined });
    // The Orders screen is a lazy route: its first load in the test runner may take a moment.
    await vi.waitFor(() => expect(router.currentRoute.value.name).toBe('orders'), { timeout: 8000 });
    expect(router.currentRoute.value.query.order).toBe('8');
  });

  describe('in Spanish', () => {
    afterEach(() => setLanguage('en'));

    it('shows the reorder list, the banner and the advice in Spanish, with no English sentence left', async () => {
      auth.fetchSession.mockResolvedValue(sessionOf(makeUser('buyer', { language: 'es' })));
      const { wrapper } = await mountWithApp(InputsView, { pinia, path: '/inputs' });

      const now = wrapper.get('[data-testid="reorder-group-now"]');
      expect(now.get('h2').text()).toBe('Comprar ya 1');
      expect(now.get('[data-testid="input-suggested"]').text()).toBe('Compre 340 L (17 envases de 20 L) ya.');
      expect(now.get('[data-testid="input-onhand"]').text()).toBe('Con 30 L en existencia hay para unos 5,8 días a 5,2 L al día.');
      expect(wrapper.get('[data-testid="inputs-due-banner"]').text()).toContain('1 insumo está en el punto de pedido o por debajo.');
      expect(wrapper.get('[data-testid="inputs-draft-orders"]').text()).toBe('Preparar pedidos desde la lista de reposición');
      expect(wrapper.get('h1').text()).toBe('Insumos');

      await openInput(wrapper, 41);
      const advice = inDocument('input-advice');
      expect(advice.get('[data-testid="input-advice-cover"]').text()).toBe('Con 30 L en existencia hay para unos 5,8 días a 5,2 L al día.');
      expect(advice.text()).toContain('Punto de pedido 41,6 L = 6 días de plazo de entrega × 5,2 L al día');

      // The reorder list and the drawer: every message of the area in Spanish, and no English word among the figures.
      const shown = `${wrapper.get('[data-testid="inputs-list"]').text()} ${inDocument('input-drawer').text()}`;
      expect(englishLeft(shown, ['inputs', 'orders'])).toEqual([]);
      expect(shown.replace(/Fish emulsion|Kelp concentrate|Creek site|Supplier \d+/g, '')).not.toMatch(/\b(the|and|of|with|is|are|by|days?|buy|order|lasts|hand)\b/i);
    });
  });
});
