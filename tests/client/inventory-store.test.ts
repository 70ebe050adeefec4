import { beforeEach, describe, expect, it, vi } from 'vitest';
import { setActivePinia } from 'pinia';
import * as authApi from '@/api/auth';
import * as inventoryApi from '@/api/inventory';
import * as outboxApi from '@/api/outbox';
import { ApiError } from '@/api/http';
import { useInventoryStore } from '@/stores/inventory';
import { useSessionStore } from '@/stores/session';
import { makeUser, sessionOf } from './support/fixtures';
import { makeInput, makeMovement, makeOrder } from './support/inventoryFixtures';
import { appPinia } from './support/appPinia';

vi.mock('@/api/auth', () => ({
  fetchSession: vi.fn(),
  signIn: vi.fn(),
  signOut: vi.fn(),
  updateProfile: vi.fn(),
  setPassword: vi.fn(),
  requestPasswordReset: vi.fn(),
  fetchTokenInfo: vi.fn(),
}));
vi.mock('@/api/inventory', () => ({
  fetchSuppliers: vi.fn(),
  createSupplier: vi.fn(),
  updateSupplier: vi.fn(),
  fetchInputs: vi.fn(),
  inputsCsvUrl: vi.fn(),
  fetchInput: vi.fn(),
  createInput: vi.fn(),
  updateInput: vi.fn(),
  fetchMovements: vi.fn(),
  createMovement: vi.fn(),
  fetchOrders: vi.fn(),
  ordersCsvUrl: vi.fn(),
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
const api = vi.mocked(inventoryApi);
const outbox = vi.mocked(outboxApi);

async function signedInStore(role: 'buyer' | 'worker' = 'buyer', id?: number) {
  auth.fetchSession.mockResolvedValue(sessionOf(makeUser(role, id === undefined ? {} : { id })));
  await useSessionStore().load(true);
  return useInventoryStore();
}

beforeEach(() => {
  vi.clearAllMocks();
  setActivePinia(appPinia());
});

describe('useInventoryStore', () => {
  it('keeps the server’s urgency order and the filter it loaded with', async () => {
    const store = await signedInStore();
    api.fetchInputs.mockResolvedValue([makeInput(41), makeInput(42, { due: false })]);

    await store.loadInputs({ farmId: 11 });

    expect(api.fetchInputs).toHaveBeenCalledWith({ farmId: 11 });
    expect(store.inputs.map((i) => i.id)).toEqual([41, 42]);
    expect(store.dueInputs.map((i) => i.id)).toEqual([41]);
    expect(store.inputsStatus).toBe('ready');
  });

  it('shows the error of a failed load and keeps nothing from before', async () => {
    const store = await signedInStore();
    api.fetchInputs.mockRejectedValue(new ApiError(0, 'network', 'Cannot reach the server.'));

    await store.loadInputs();

    expect(store.inputsStatus).toBe('error');
    expect(store.inputsError).toBe('Cannot reach the server.');
  });

  it('drafts orders from the suggestions and lists them first, newest first', async () => {
    const store = await signedInStore();
    api.fetchOrders.mockResolvedValue([makeOrder(7, { status: 'received', createdAt: '2026-02-01T09:00:00.000Z' })]);
    await store.loadOrders();
    const drafts = [
      makeOrder(8, { supplierId: 31, createdAt: '2026-03-02T10:00:00.000Z' }),
      makeOrder(9, { supplierId: 32, supplierName: 'Supplier 32', createdAt: '2026-03-02T10:00:00.000Z' }),
    ];
    api.createOrdersFromSuggestions.mockResolvedValue(drafts);

    const made = await store.draftFromSuggestions({ farmId: 11 });

    expect(api.createOrdersFromSuggestions).toHaveBeenCalledWith({ farmId: 11 });
    expect(made.map((o) => o.id)).toEqual([8, 9]);
    expect(store.orders.map((o) => o.id)).toEqual([9, 8, 7]);
    expect(store.orderById.get(8)?.status).toBe('draft');
  });

  it('passes on the server’s refusal when nothing is due', async () => {
    const store = await signedInStore();
    api.createOrdersFromSuggestions.mockRejectedValue(new ApiError(409, 'nothing_due', 'No input with a supplier needs ordering right now'));

    await expect(store.draftFromSuggestions()).rejects.toMatchObject({ code: 'nothing_due' });
    expect(store.orders).toEqual([]);
  });

  it('raises the stock shown for an input when a delivery is booked in', async () => {
    const store = await signedInStore();
    api.fetchInputs.mockResolvedValueOnce([makeInput(41, { onHand: 30, onOrder: 180, due: false })]);
    await store.loadInputs({ farmId: 11 });
    const sent = makeOrder(8, { status: 'sent', sentAt: '2026-03-02T11:00:00.000Z' });
    api.fetchOrders.mockResolvedValue([sent]);
    await store.loadOrders();
    api.receiveOrder.mockResolvedValue({ ...sent, status: 'received', lines: sent.lines.map((l) => ({ ...l, receivedQuantity: 180 })) });
    api.fetchInputs.mockResolvedValueOnce([makeInput(41, { onHand: 210, onOrder: 0, due: false })]);

    const received = await store.receiveOrder(8, { lines: [{ lineId: 501, quantity: 180 }], note: '' });

    expect(api.receiveOrder).toHaveBeenCalledWith(8, { lines: [{ lineId: 501, quantity: 180 }], note: '' });
    expect(received.status).toBe('received');
    expect(store.orderById.get(8)?.status).toBe('received');
    // The list is fetched again with the same filter, so the Inputs screen shows the new stock.
    expect(api.fetchInputs).toHaveBeenLastCalledWith({ farmId: 11 });
    expect(store.inputById.get(41)?.onHand).toBe(210);
    expect(store.inputById.get(41)?.onOrder).toBe(0);
  });

  it('counts a sent order as on order by fetching the inputs again', async () => {
    const store = await signedInStore();
    api.fetchInputs.mockResolvedValueOnce([makeInput(41, { onOrder: 0, due: true })]);
    await store.loadInputs();
    api.sendOrder.mockResolvedValue(makeOrder(8, { status: 'sent' }));
    api.fetchInputs.mockResolvedValueOnce([makeInput(41, { onOrder: 340, due: false })]);

    await store.sendOrder(8);

    expect(store.orderById.get(8)?.status).toBe('sent');
    expect(store.inputById.get(41)).toMatchObject({ onOrder: 340, due: false });
  });

  it('records a use and then shows the new stock and the history of the open input', async () => {
    const store = await signedInStore('worker');
    api.fetchInputs.mockResolvedValueOnce([makeInput(41, { onHand: 30 })]);
    await store.loadInputs();
    api.fetchMovements.mockResolvedValueOnce([]);
    await store.loadMovements(41);
    const use = makeMovement(900, 41, { quantity: 4 });
    api.createMovement.mockResolvedValue(use);
    api.fetchInputs.mockResolvedValueOnce([makeInput(41, { onHand: 26 })]);
    api.fetchMovements.mockResolvedValueOnce([use]);

    await store.recordMovement(41, { kind: 'use', quantity: 4, reason: '' });

    expect(api.createMovement).toHaveBeenCalledWith(41, { kind: 'use', quantity: 4, reason: '' });
    expect(store.inputById.get(41)?.onHand).toBe(26);
    expect(store.movements.map((m) => m.id)).toEqual([900]);
  });

  it('forgets the lists of the previous person when someone else signs in on the device', async () => {
    const store = await signedInStore('buyer', 4);
    api.fetchInputs.mockResolvedValueOnce([makeInput(41)]);
    await store.loadInputs({ farmId: 11 });
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('worker')));
    await useSessionStore().load(true);
    api.fetchInputs.mockRejectedValueOnce(new ApiError(0, 'network', 'Cannot reach the server.'));

    await store.loadInputs({});

    expect(store.inputs).toEqual([]);
    expect(store.inputsStatus).toBe('error');
  });

  it('closes an order short in place and fetches the inputs again, whose on-order quantity has dropped', async () => {
    const store = await signedInStore();
    api.fetchInputs.mockResolvedValue([makeInput(41, { onOrder: 80 })]);
    await store.loadInputs();
    api.fetchOrders.mockResolvedValue([makeOrder(9, { status: 'part-received' })]);
    await store.loadOrders();
    api.closeOrderShort.mockResolvedValue(makeOrder(9, { status: 'closed-short', closedShortReason: 'none left', closedShortAt: '2026-03-09T10:00:00.000Z' }));
    api.fetchInputs.mockResolvedValue([makeInput(41, { onOrder: 0 })]);

    await store.closeOrderShort(9, { reason: 'none left' });

    expect(api.closeOrderShort).toHaveBeenCalledWith(9, { reason: 'none left' });
    expect(store.orderById.get(9)?.status).toBe('closed-short');
    expect(store.inputById.get(41)?.onOrder).toBe(0);
  });

  it('says the outbox is there only when the development route answers', async () => {
    const store = await signedInStore();
    outbox.fetchOutbox.mockRejectedValueOnce(new ApiError(404, 'not_found', 'Not found.'));

    expect(await store.checkOutbox()).toBe(false);
    expect(store.outboxAvailable).toBe(false);
    expect(outbox.fetchOutbox).toHaveBeenCalledTimes(1);
  });
});
