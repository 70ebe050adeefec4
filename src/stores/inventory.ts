import { computed, ref, shallowRef } from 'vue';
import { defineStore } from 'pinia';
import type {
  InputCreateInput,
  InputStatus,
  InputUpdateInput,
  Movement,
  MovementCreateInput,
  OrderCloseShortInput,
  OrderCreateInput,
  OrderReceiptInput,
  OrderUpdateInput,
  PurchaseOrder,
  Supplier,
  SupplierCreateInput,
  SupplierUpdateInput,
} from '@shared/schemas';
import * as api from '@/api/inventory';
import { fetchOutbox } from '@/api/outbox';
import { errorMessage, isApiError } from '@/api/http';
import type { LoadStatus } from './farms';

function byName(a: Supplier, b: Supplier): number {
  return a.name.localeCompare(b.name);
}

/**
 * The buyer's side: suppliers, inputs with their reorder advice, stock movements of the input
 * open in detail, and purchase orders. Every figure of advice comes from the server (shared/inventory).
 */
export const useInventoryStore = defineStore('inventory', () => {
  const suppliers = shallowRef<Supplier[]>([]);
  const suppliersStatus = ref<LoadStatus>('idle');
  const suppliersError = ref<string | null>(null);

  const inputs = shallowRef<InputStatus[]>([]);
  const inputsStatus = ref<LoadStatus>('idle');
  const inputsError = ref<string | null>(null);
  const inputFilter = ref<api.InputFilter>({});

  const movementsInputId = ref<number | null>(null);
  const movements = shallowRef<Movement[]>([]);
  const movementsStatus = ref<LoadStatus>('idle');
  const movementsError = ref<string | null>(null);

  const orders = shallowRef<PurchaseOrder[]>([]);
  const ordersStatus = ref<LoadStatus>('idle');
  const ordersError = ref<string | null>(null);

  /** null until asked: whether this server keeps mail in the development outbox. */
  const outboxAvailable = ref<boolean | null>(null);

  const activeSuppliers = computed(() => suppliers.value.filter((s) => s.archivedAt === null));
  const supplierById = computed(() => new Map(suppliers.value.map((s) => [s.id, s])));
  const inputById = computed(() => new Map(inputs.value.map((i) => [i.id, i])));
  const dueInputs = computed(() => inputs.value.filter((i) => i.due));
  /** Due inputs a draft can be made for (the server skips those without a supplier). */
  const orderableDueInputs = computed(() => dueInputs.value.filter((i) => i.supplierId !== null && i.suggestedQuantity > 0));
  const orderById = computed(() => new Map(orders.value.map((o) => [o.id, o])));

  // ---- suppliers ----

  async function loadSuppliers(): Promise<void> {
    suppliersStatus.value = 'loading';
    suppliersError.value = null;
    try {
      suppliers.value = (await api.fetchSuppliers()).slice().sort(byName);
      suppliersStatus.value = 'ready';
    } catch (e) {
      suppliersError.value = errorMessage(e);
      suppliersStatus.value = 'error';
    }
  }

  async function ensureSuppliers(): Promise<void> {
    if (suppliersStatus.value === 'idle' || suppliersStatus.value === 'error') await loadSuppliers();
  }

  function putSupplier(supplier: Supplier): Supplier {
    suppliers.value = [...suppliers.value.filter((s) => s.id !== supplier.id), supplier].sort(byName);
    return supplier;
  }

  async function createSupplier(input: SupplierCreateInput): Promise<Supplier> {
    return putSupplier(await api.createSupplier(input));
  }

  async function updateSupplier(supplierId: number, input: SupplierUpdateInput): Promise<Supplier> {
    const saved = putSupplier(await api.updateSupplier(supplierId, input));
    // Inputs show the supplier's name and may take its lead time.
    if (inputsStatus.value === 'ready') void refreshInputs();
    return saved;
  }

  const archiveSupplier = (supplierId: number) => updateSupplier(supplierId, { archived: true });
  const restoreSupplier = (supplierId: number) => updateSupplier(supplierId, { archived: false });

  // ---- inputs ----

  /** Loads the inputs for `filter` (or the current filter), showing the loading state. */
  async function loadInputs(filter: api.InputFilter = inputFilter.value): Promise<void> {
    inputFilter.value = { ...filter };
    inputsStatus.value = 'loading';
    inputsError.value = null;
    try {
      inputs.value = await api.fetchInputs(inputFilter.value);
      inputsStatus.value = 'ready';
    } catch (e) {
      inputsError.value = errorMessage(e);
      inputsStatus.value = 'error';
    }
  }

  /** Fetches the list again in place (after a change), keeping what is shown if that fails. */
  async function refreshInputs(): Promise<void> {
    try {
      inputs.value = await api.fetchInputs(inputFilter.value);
      inputsStatus.value = 'ready';
      inputsError.value = null;
    } catch {
      // The list on screen stays; the next load shows the error.
    }
  }

  /** One farm's inputs for an order form, without touching the list on the Inputs screen. */
  function inputsOfFarm(farmId: number): Promise<InputStatus[]> {
    return api.fetchInputs({ farmId });
  }

  function putInput(input: InputStatus): InputStatus {
    const list = inputs.value;
    const at = list.findIndex((i) => i.id === input.id);
    inputs.value = at === -1 ? [...list, input] : [...list.slice(0, at), input, ...list.slice(at + 1)];
    return input;
  }

  async function createInput(input: InputCreateInput): Promise<InputStatus> {
    const created = putInput(await api.createInput(input));
    // The server decides where it sorts; the filter decides whether it is listed at all.
    await refreshInputs();
    return created;
  }

  async function updateInput(inputId: number, input: InputUpdateInput): Promise<InputStatus> {
    const saved = putInput(await api.updateInput(inputId, input));
    await refreshInputs();
    return saved;
  }

  const archiveInput = (inputId: number) => updateInput(inputId, { archived: true });

  async function loadMovements(inputId: number): Promise<void> {
    movementsInputId.value = inputId;
    movementsStatus.value = 'loading';
    movementsError.value = null;
    if (movements.value[0]?.inputId !== inputId) movements.value = [];
    try {
      const rows = await api.fetchMovements(inputId);
      // Another input may have been opened meanwhile.
      if (movementsInputId.value !== inputId) return;
      movements.value = rows;
      movementsStatus.value = 'ready';
    } catch (e) {
      if (movementsInputId.value !== inputId) return;
      movementsError.value = errorMessage(e);
      movementsStatus.value = 'error';
    }
  }

  /** Records a movement, then fetches the inputs' new stock and advice and the open input's history. */
  async function recordMovement(inputId: number, input: MovementCreateInput): Promise<Movement> {
    const movement = await api.createMovement(inputId, input);
    // The movement is stored; what follows only refreshes the screen and reports its own failures.
    await Promise.all([refreshInputs(), movementsInputId.value === inputId ? loadMovements(inputId) : Promise.resolve()]);
    return movement;
  }

  // ---- orders ----

  async function loadOrders(): Promise<void> {
    ordersStatus.value = 'loading';
    ordersError.value = null;
    try {
      orders.value = await api.fetchOrders();
      ordersStatus.value = 'ready';
    } catch (e) {
      ordersError.value = errorMessage(e);
      ordersStatus.value = 'error';
    }
  }

  function putOrders(changed: PurchaseOrder[]): void {
    const ids = new Set(changed.map((o) => o.id));
    const kept = orders.value.filter((o) => !ids.has(o.id));
    // Newest first, as the server lists them.
    orders.value = [...changed, ...kept].sort((a, b) => b.createdAt.localeCompare(a.createdAt) || b.id - a.id);
  }

  function putOrder(order: PurchaseOrder): PurchaseOrder {
    putOrders([order]);
    return order;
  }

  /** Loads one order into the list (a link to an order not in the list yet). */
  async function loadOrder(orderId: number): Promise<PurchaseOrder> {
    return putOrder(await api.fetchOrder(orderId));
  }

  async function createOrder(input: OrderCreateInput): Promise<PurchaseOrder> {
    return putOrder(await api.createOrder(input));
  }

  /** Drafts one order per supplier and farm at the suggested quantities; returns the drafts. */
  async function draftFromSuggestions(input: { farmId?: number; inputIds?: number[] } = {}): Promise<PurchaseOrder[]> {
    const drafts = await api.createOrdersFromSuggestions(input);
    putOrders(drafts);
    return drafts;
  }

  async function updateOrder(orderId: number, input: OrderUpdateInput): Promise<PurchaseOrder> {
    return putOrder(await api.updateOrder(orderId, input));
  }

  /** E-mails a draft; what is on order now counts toward each input's reorder point. */
  async function sendOrder(orderId: number): Promise<PurchaseOrder> {
    const sent = putOrder(await api.sendOrder(orderId));
    if (inputsStatus.value !== 'idle') await refreshInputs();
    return sent;
  }

  async function cancelOrder(orderId: number): Promise<PurchaseOrder> {
    const cancelled = putOrder(await api.cancelOrder(orderId));
    if (inputsStatus.value !== 'idle') await refreshInputs();
    return cancelled;
  }

  /** Closes a part-delivered order short; what was on order for the rest drops off the inputs. */
  async function closeOrderShort(orderId: number, input: OrderCloseShortInput): Promise<PurchaseOrder> {
    const closed = putOrder(await api.closeOrderShort(orderId, input));
    if (inputsStatus.value !== 'idle') await refreshInputs();
    return closed;
  }

  /** Books a delivery in and fetches the inputs again: their stock has risen. */
  async function receiveOrder(orderId: number, input: OrderReceiptInput): Promise<PurchaseOrder> {
    const received = putOrder(await api.receiveOrder(orderId, input));
    await refreshInputs();
    const open = movementsInputId.value;
    if (open !== null && received.lines.some((l) => l.inputId === open)) await loadMovements(open);
    return received;
  }

  /** Asks once whether sent mail lands in the development outbox (404 where it does not). */
  async function checkOutbox(): Promise<boolean> {
    if (outboxAvailable.value !== null) return outboxAvailable.value;
    try {
      await fetchOutbox();
      outboxAvailable.value = true;
    } catch (e) {
      // Only a clear "not here" settles it; a network blip may be asked again later.
      if (isApiError(e, { status: 404 })) outboxAvailable.value = false;
      else return false;
    }
    return outboxAvailable.value;
  }

  function reset(): void {
    suppliers.value = [];
    suppliersStatus.value = 'idle';
    suppliersError.value = null;
    inputs.value = [];
    inputsStatus.value = 'idle';
    inputsError.value = null;
    inputFilter.value = {};
    movementsInputId.value = null;
    movements.value = [];
    movementsStatus.value = 'idle';
    movementsError.value = null;
    orders.value = [];
    ordersStatus.value = 'idle';
    ordersError.value = null;
  }

  return {
    suppliers,
    suppliersStatus,
    suppliersError,
    activeSuppliers,
    supplierById,
    loadSuppliers,
    ensureSuppliers,
    createSupplier,
    updateSupplier,
    archiveSupplier,
    restoreSupplier,
    inputs,
    inputsStatus,
    inputsError,
    inputFilter,
    inputById,
    dueInputs,
    orderableDueInputs,
    loadInputs,
    refreshInputs,
    inputsOfFarm,
    createInput,
    updateInput,
    archiveInput,
    movementsInputId,
    movements,
    movementsStatus,
    movementsError,
    loadMovements,
    recordMovement,
    orders,
    ordersStatus,
    ordersError,
    orderById,
    loadOrders,
    loadOrder,
    createOrder,
    draftFromSuggestions,
    updateOrder,
    sendOrder,
    cancelOrder,
    closeOrderShort,
    receiveOrder,
    outboxAvailable,
    checkOutbox,
    reset,
  };
});
