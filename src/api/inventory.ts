import type {
  InputCreateInput,
  InputStatus,
  InputUpdateInput,
  Movement,
  MovementCreateInput,
  OrderCloseShortInput,
  OrderCreateInput,
  OrderReceiptInput,
  OrderStatus,
  OrderUpdateInput,
  PurchaseOrder,
  Supplier,
  SupplierCreateInput,
  SupplierUpdateInput,
} from '@shared/schemas';
import { http } from './http';

/** Which inputs to list: one farm, one supplier, or all the user may see. */
export interface InputFilter {
  farmId?: number;
  supplierId?: number;
}

/** Which orders to list. */
export interface OrderFilter {
  status?: OrderStatus;
  farmId?: number;
}

function query(filter: object, extra: Record<string, string> = {}): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries({ ...filter, ...extra })) {
    if (value !== undefined && value !== null && value !== '') params.set(key, String(value));
  }
  const text = params.toString();
  return text ? `?${text}` : '';
}

// ---- suppliers ----

/** Every supplier of the organisation, archived ones too, by name. */
export function fetchSuppliers(): Promise<Supplier[]> {
  return http.get<Supplier[]>('/api/suppliers');
}

/** Adds a supplier. */
export function createSupplier(input: SupplierCreateInput): Promise<Supplier> {
  return http.post<Supplier>('/api/suppliers', input);
}

/** Edits, archives (archived: true) or restores (archived: false) a supplier. */
export function updateSupplier(supplierId: number, input: SupplierUpdateInput): Promise<Supplier> {
  return http.patch<Supplier>(`/api/suppliers/${supplierId}`, input);
}

// ---- inputs and stock ----

/** Inputs with stock and reorder advice, most urgent first (the server sorts). */
export function fetchInputs(filter: InputFilter = {}): Promise<InputStatus[]> {
  return http.get<InputStatus[]>(`/api/inputs${query(filter)}`);
}

/** Where the browser downloads the same list as CSV. */
export function inputsCsvUrl(filter: InputFilter = {}): string {
  return `/api/inputs${query(filter, { format: 'csv' })}`;
}

/** One input with its stock and advice. */
export function fetchInput(inputId: number): Promise<InputStatus> {
  return http.get<InputStatus>(`/api/inputs/${inputId}`);
}

/** Adds an input on a farm. */
export function createInput(input: InputCreateInput): Promise<InputStatus> {
  return http.post<InputStatus>('/api/inputs', input);
}

/** Edits, archives or restores an input. */
export function updateInput(inputId: number, input: InputUpdateInput): Promise<InputStatus> {
  return http.patch<InputStatus>(`/api/inputs/${inputId}`, input);
}

/** The input's stock movements, newest first. */
export function fetchMovements(inputId: number): Promise<Movement[]> {
  return http.get<Movement[]>(`/api/inputs/${inputId}/movements`);
}

/** Records a use, count, adjustment or receipt. */
export function createMovement(inputId: number, input: MovementCreateInput): Promise<Movement> {
  return http.post<Movement>(`/api/inputs/${inputId}/movements`, input);
}

// ---- purchase orders ----

/** Purchase orders, newest first. */
export function fetchOrders(filter: OrderFilter = {}): Promise<PurchaseOrder[]> {
  return http.get<PurchaseOrder[]>(`/api/orders${query(filter)}`);
}

/** Where the browser downloads the order lines as CSV, with the same filter as the list. */
export function ordersCsvUrl(filter: OrderFilter = {}): string {
  return `/api/orders${query(filter, { format: 'csv' })}`;
}

/** One order with its lines. */
export function fetchOrder(orderId: number): Promise<PurchaseOrder> {
  return http.get<PurchaseOrder>(`/api/orders/${orderId}`);
}

/** Creates a draft order for one supplier and farm. */
export function createOrder(input: OrderCreateInput): Promise<PurchaseOrder> {
  return http.post<PurchaseOrder>('/api/orders', input);
}

/** Drafts one order per supplier and farm from the inputs that are due (or the chosen ones). */
export function createOrdersFromSuggestions(input: { farmId?: number; inputIds?: number[] } = {}): Promise<PurchaseOrder[]> {
  return http.post<PurchaseOrder[]>('/api/orders/from-suggestions', input);
}

/** Replaces a draft's lines and/or notes. */
export function updateOrder(orderId: number, input: OrderUpdateInput): Promise<PurchaseOrder> {
  return http.patch<PurchaseOrder>(`/api/orders/${orderId}`, input);
}

/** E-mails a draft to its supplier and marks it sent. */
export function sendOrder(orderId: number): Promise<PurchaseOrder> {
  return http.post<PurchaseOrder>(`/api/orders/${orderId}/send`);
}

/** Cancels a draft or sent order. */
export function cancelOrder(orderId: number): Promise<PurchaseOrder> {
  return http.post<PurchaseOrder>(`/api/orders/${orderId}/cancel`);
}

/** Closes a part-delivered order short: the rest is cancelled with the reason and no longer on order. */
export function closeOrderShort(orderId: number, input: OrderCloseShortInput): Promise<PurchaseOrder> {
  return http.post<PurchaseOrder>(`/api/orders/${orderId}/close-short`, input);
}

/** Books a delivery in; stock rises by what arrived. */
export function receiveOrder(orderId: number, input: OrderReceiptInput): Promise<PurchaseOrder> {
  return http.post<PurchaseOrder>(`/api/orders/${orderId}/receipts`, input);
}
