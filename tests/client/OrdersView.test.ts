import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import * as authApi from '@/api/auth';
import * as farmsApi from '@/api/farms';
import * as inventoryApi from '@/api/inventory';
import * as outboxApi from '@/api/outbox';
import { ApiError } from '@/api/http';
import OrdersView from '@/views/OrdersView.vue';
import { setLanguage } from '@/i18n';
import { makeFarm, makeUser, sessionOf } from './support/fixtures';
import { makeInput, makeOrder, makeSupplier } from './support/inventoryFixtures';
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
  inputsCsvUrl: () => '/api/inputs?format=csv',
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
  closeOrderShort: vi.fn(),
  receiveOrder: vi.fn(),
}));
vi.mock('@/api/outbox', () => ({ fetchOutbox: vi.fn(), clearOutbox: vi.fn() }));

const auth = vi.mocked(authApi);
const farms = vi.mocked(farmsApi);
const api = vi.mocked(inventoryApi);
const outbox = vi.mocked(outboxApi);
let pinia: Pinia;

const draft = makeOrder(8, { supplierName: 'Gorse Lane Supply', supplierEmail: 'sales@gorse-lane.example' });
const partReceived = makeOrder(9, {
  status: 'part-received',
  sentAt: '2026-03-02T10:00:00.000Z',
  lines: [{ id: 601, inputId: 41, inputName: 'Fish emulsion', unit: 'L', quantity: 180, unitPrice: 2.4, receivedQuantity: 100, cancelledQuantity: 0, lineTotal: 432 }],
});

async function mountAt(path: string) {
  return mountWithApp(OrdersView, { pinia, path });
}

function confirmButton(label: string): HTMLButtonElement {
  const button = Array.from(document.querySelectorAll<HTMLButtonElement>('button')).find((b) => b.textContent?.trim() === label);
  if (!button) throw new Error(`No button "${label}"`);
  return button;
}

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  setViewportWidth(1280);
  pinia = createPinia();
  setActivePinia(pinia);
  auth.fetchSession.mockResolvedValue(sessionOf(makeUser('buyer')));
  farms.fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site')]);
  api.fetchSuppliers.mockResolvedValue([makeSupplier(31)]);
  api.fetchInputs.mockResolvedValue([makeInput(41)]);
  api.fetchOrders.mockResolvedValue([partReceived, draft]);
});

describe('OrdersView', () => {
  it('names the orders’ states in our words', async () => {
    const { wrapper } = await mountAt('/orders');

    expect(wrapper.get('[data-testid="order-row-8"] [data-testid="order-row-status"]').text()).toBe('Draft');
    expect(wrapper.get('[data-testid="order-row-9"] [data-testid="order-row-status"]').text()).toBe('Part received');
    expect(wrapper.get('[data-testid="orders-csv"]').attributes('href')).toBe('/api/orders?format=csv');
  });

  it('asks before sending, naming the supplier’s e-mail, then says the mail went out and where to read it', async () => {
    api.sendOrder.mockResolvedValue({ ...draft, status: 'sent', sentAt: '2026-03-02T11:00:00.000Z' });
    outbox.fetchOutbox.mockResolvedValue([]);
    await mountAt('/orders?order=8');

    await inDocument('order-send').trigger('click');
    await flushPromises();
    expect(document.body.textContent).toContain('This e-mails the order to sales@gorse-lane.example (Gorse Lane Supply)');
    expect(api.sendOrder).not.toHaveBeenCalled();

    confirmButton('E-mail Gorse Lane Supply').click();
    await flushPromises();

    expect(api.sendOrder).toHaveBeenCalledWith(8);
    expect(inDocument('order-status').text()).toBe('Sent');
    expect(inDocument('order-sent-notice').text()).toContain('The order went out by e-mail to sales@gorse-lane.example.');
    expect(existsInDocument('order-outbox-link')).toBe(true);
  });

  it('leaves the order a draft and says so when the mail could not go', async () => {
    api.sendOrder.mockRejectedValue(new ApiError(502, 'mail_failed', 'The order e-mail could not be sent; it is still a draft — try again'));
    await mountAt('/orders?order=8');

    await inDocument('order-send').trigger('click');
    await flushPromises();
    confirmButton('E-mail Gorse Lane Supply').click();
    await flushPromises();

    expect(inDocument('order-status').text()).toBe('Draft');
    expect(existsInDocument('order-sent-notice')).toBe(false);
    expect(document.body.textContent).toContain('it is still a draft');
  });

  it('books a part delivery in, each line starting at what is still to come', async () => {
    api.receiveOrder.mockResolvedValue({ ...partReceived, status: 'received', lines: partReceived.lines.map((l) => ({ ...l, receivedQuantity: 180 })) });
    await mountAt('/orders?order=9');

    await inDocument('order-receive').trigger('click');
    await flushPromises();
    const field = inDocument('receipt-qty-601').find('input');
    expect(field.element.value).toBe('80 L');
    await inDocument('receipt-submit').trigger('submit');
    await flushPromises();

    expect(api.receiveOrder).toHaveBeenCalledWith(9, { lines: [{ lineId: 601, quantity: 80 }], note: '' });
    expect(inDocument('order-status').text()).toBe('Received');
    expect(api.fetchInputs).toHaveBeenCalled();
  });

  it('puts the server’s over-receipt refusal under the line it names', async () => {
    api.receiveOrder.mockRejectedValue(new ApiError(422, 'over_receipt', 'lines.0.quantity: only 80 still due on this line', 'lines.0.quantity'));
    await mountAt('/orders?order=9');

    await inDocument('order-receive').trigger('click');
    await flushPromises();
    await inDocument('receipt-submit').trigger('submit');
    await flushPromises();

    expect(inDocument('receipt-qty-601-error').text()).toBe('only 80 still due on this line');
  });

  it('shows every total in the organisation’s currency', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('buyer', { currency: 'NZD' })));
    const { wrapper } = await mountAt('/orders');

    const nzd = new Intl.NumberFormat(undefined, { style: 'currency', currency: 'NZD' });
    expect(wrapper.get('[data-testid="order-row-9"]').text()).toContain(nzd.format(432));
    await mountAt('/orders?order=9');
    expect(inDocument('order-total').text()).toContain(nzd.format(432));
  });

  it('closes a part delivery short only with a reason, then shows the status, the reason and the cancelled rest', async () => {
    api.closeOrderShort.mockResolvedValue({
      ...partReceived,
      status: 'closed-short',
      closedShortAt: '2026-03-09T10:00:00.000Z',
      closedShortReason: 'Out of stock until spring',
      closedShortBy: 'Priya Nand',
      lines: partReceived.lines.map((l) => ({ ...l, cancelledQuantity: 80, lineTotal: 240 })),
      total: 240,
    });
    await mountAt('/orders?order=9');

    await inDocument('order-close-short').trigger('click');
    await flushPromises();
    expect(inDocument('close-short-rest').text()).toBe('Fish emulsion: 80 L of 180 L');
    await inDocument('close-short-submit').trigger('submit');
    await flushPromises();
    expect(api.closeOrderShort).not.toHaveBeenCalled();
    expect(inDocument('close-short-reason-error').text()).toBe('say why the rest will not come');

    const reason = inDocument('close-short-reason');
    await reason.setValue('Out of stock until spring');
    await inDocument('close-short-submit').trigger('submit');
    await flushPromises();

    expect(api.closeOrderShort).toHaveBeenCalledWith(9, { reason: 'Out of stock until spring' });
    expect(inDocument('order-status').text()).toBe('Closed short');
    expect(inDocument('order-closed-short').text()).toContain('by Priya Nand: Out of stock until spring');
    expect(inDocument('order-line-cancelled').text()).toBe('80 L');
    expect(existsInDocument('order-receive')).toBe(false);
    expect(existsInDocument('order-close-short')).toBe(false);
  });

  describe('in French', () => {
    afterEach(() => setLanguage('en'));

    it('names the states, the columns and a part-delivered order in French, with no English sentence left', async () => {
      auth.fetchSession.mockResolvedValue(sessionOf(makeUser('buyer', { language: 'fr' })));
      // 99.5 L of 180 L in: 80.5 L still to come, which a French buyer reads and types with a decimal comma.
      api.fetchOrders.mockResolvedValue([{ ...partReceived, lines: partReceived.lines.map((l) => ({ ...l, receivedQuantity: 99.5 })) }, draft]);
      const { wrapper } = await mountAt('/orders?order=9');

      expect(wrapper.get('[data-testid="order-row-8"] [data-testid="order-row-status"]').text()).toBe('Brouillon');
      expect(wrapper.get('[data-testid="order-row-9"] [data-testid="order-row-status"]').text()).toBe('Reçue en partie');
      expect(wrapper.get('h1').text()).toBe('Commandes');
      expect(inDocument('order-status').text()).toBe('Reçue en partie');

      await inDocument('order-receive').trigger('click');
      await flushPromises();
      expect(inDocument('receipt-dialog').text()).toContain('Saisissez ce qui est arrivé sur chaque ligne.');
      expect(inDocument('receipt-line-601').text()).toContain('Commandé : 180 L · 99,5 L déjà reçus');
      expect(inDocument('receipt-qty-601').find('input').element.value).toBe('80,5 L');

      const shown = `${wrapper.text()} ${inDocument('order-drawer').text()} ${inDocument('receipt-dialog').text()}`;
      expect(englishLeft(shown, ['inputs', 'orders'])).toEqual([]);
    });
  });
});
