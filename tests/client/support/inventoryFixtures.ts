import type { InputStatus, Movement, PurchaseOrder, Supplier } from '@shared/schemas';

// Invented inputs, suppliers and orders of the Hollowbrook test co-operative. The advice figures
// stand for what the server sends (it works them out in shared/inventory); the client only shows
// them, so they are typed in here rather than worked out.

export function makeSupplier(id: number, overrides: Partial<Supplier> = {}): Supplier {
  return {
    id,
    name: `Supplier ${id}`,
    contactName: 'Rhea Marsh',
    email: `orders-${id}@supplier.example`,
    phone: '+353 1 555 0100',
    leadTimeDays: 6,
    notes: '',
    archivedAt: null,
    ...overrides,
  };
}

/** A liquid fertilizer used at 5.2 L a day with a 6-day lead time, due for reorder. */
export function makeInput(id: number, overrides: Partial<InputStatus> = {}): InputStatus {
  return {
    id,
    farmId: 11,
    farmName: 'Creek site',
    name: `Input ${id}`,
    unit: 'L',
    category: 'fertilizer',
    supplierId: 31,
    supplierName: 'Supplier 31',
    leadTimeDays: 6,
    serviceLevel: 0.95,
    orderCost: 18,
    holdingCostPerYear: 0.6,
    unitPrice: 2.4,
    packSize: 20,
    minimumOrder: 0,
    notes: '',
    archivedAt: null,
    onHand: 30,
    onOrder: 0,
    dailyDemand: 5.2,
    dailyDemandSd: 2.6,
    daysOfCover: 5.8,
    reorderPoint: 41.6,
    safetyStock: 10.4,
    eoq: 337.5,
    suggestedQuantity: 340,
    orderBy: '2026-03-02T09:00:00.000Z',
    due: true,
    stockHistory: Array.from({ length: 30 }, (_, i) => 180 - i * 5),
    ...overrides,
  };
}

export function makeMovement(id: number, inputId: number, overrides: Partial<Movement> = {}): Movement {
  return { id, inputId, kind: 'use', quantity: 5, difference: null, at: '2026-03-01T08:00:00.000Z', reason: '', orderId: null, by: 'Tomas Lind', ...overrides };
}

export function makeOrder(id: number, overrides: Partial<PurchaseOrder> = {}): PurchaseOrder {
  return {
    id,
    number: `HG-26-${String(id).padStart(3, '0')}`,
    farmId: 11,
    farmName: 'Creek site',
    supplierId: 31,
    supplierName: 'Supplier 31',
    supplierEmail: 'orders-31@supplier.example',
    status: 'draft',
    notes: '',
    createdAt: '2026-03-02T09:00:00.000Z',
    sentAt: null,
    createdBy: 'Priya Nand',
    closedShortAt: null,
    closedShortReason: null,
    closedShortBy: null,
    lines: [{ id: 501, inputId: 41, inputName: 'Input 41', unit: 'L', quantity: 180, unitPrice: 2.4, receivedQuantity: 0, cancelledQuantity: 0, lineTotal: 432 }],
    total: 432,
    ...overrides,
  };
}
