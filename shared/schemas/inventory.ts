import { z } from 'zod';
import { idSchema, patchSchema, text } from './common';
import { emailSchema } from './auth';

const money = (label: string) => z.number({ error: `${label} must be a number` }).finite().min(0, 'must be 0 or more').max(1_000_000, 'must be at most 1,000,000');
const quantity = z.number({ error: 'must be a number' }).finite().max(100_000_000, 'must be at most 100,000,000');

/** Body of POST /api/suppliers. */
export const supplierCreateSchema = z.object({
  name: text(120),
  contactName: z.string().trim().max(120).default(''),
  email: emailSchema,
  phone: z.string().trim().max(40).default(''),
  leadTimeDays: z.number({ error: 'must be a number' }).finite().min(0, 'must be 0 days or more').max(365, 'must be at most 365 days').default(7),
  notes: z.string().trim().max(1000).default(''),
});
export type SupplierCreateInput = z.infer<typeof supplierCreateSchema>;
/** Body of PATCH /api/suppliers/:id. */
export const supplierUpdateSchema = patchSchema(supplierCreateSchema).extend({ archived: z.boolean().optional() });
export type SupplierUpdateInput = z.infer<typeof supplierUpdateSchema>;

/** A supplier as the API returns it. */
export interface Supplier {
  id: number;
  name: string;
  contactName: string;
  email: string;
  phone: string;
  leadTimeDays: number;
  notes: string;
  archivedAt: string | null;
}

/** Categories of purchased inputs. */
export const INPUT_CATEGORIES = ['fertilizer', 'pest-control', 'culture-starter', 'amendment', 'other'] as const;
export type InputCategory = (typeof INPUT_CATEGORIES)[number];

/** Body of POST /api/inputs: a purchased material stocked on one farm. */
export const inputCreateSchema = z.object({
  farmId: idSchema,
  name: text(120),
  /** The unit stock is counted in: "L", "kg", "bag (25 kg)"… */
  unit: text(30),
  category: z.enum(INPUT_CATEGORIES),
  supplierId: idSchema.nullable().default(null),
  /** Days from order to delivery; null takes the supplier's. */
  leadTimeDays: z.number().finite().min(0, 'must be 0 days or more').max(365, 'must be at most 365 days').nullable().default(null),
  serviceLevel: z.number({ error: 'must be a number' }).finite().min(0.5, 'must be at least 0.5 (50 %)').max(0.999, 'must be at most 0.999 (99.9 %)').default(0.95),
  orderCost: money('Order cost').default(25),
  holdingCostPerYear: z.number({ error: 'must be a number' }).finite().positive('must be greater than 0').max(1_000_000).default(1),
  unitPrice: money('Unit price').default(0),
  packSize: z.number({ error: 'must be a number' }).finite().positive('must be greater than 0').max(1_000_000).default(1),
  minimumOrder: z.number().finite().min(0, 'must be 0 or more').max(10_000_000).default(0),
  notes: z.string().trim().max(1000).default(''),
});
export type InputCreateInput = z.infer<typeof inputCreateSchema>;
/** Body of PATCH /api/inputs/:id (farm cannot change). */
export const inputUpdateSchema = patchSchema(inputCreateSchema.omit({ farmId: true })).extend({ archived: z.boolean().optional() });
export type InputUpdateInput = z.infer<typeof inputUpdateSchema>;

/** Kinds of movement a person may record by hand (receipts come from booking an order in). */
export const MANUAL_MOVEMENT_KINDS = ['use', 'count', 'adjustment', 'receipt'] as const;

/** Body of POST /api/inputs/:id/movements. */
export const movementCreateSchema = z
  .object({
    kind: z.enum(MANUAL_MOVEMENT_KINDS),
    /** use/receipt: units (> 0); count: the level counted (≥ 0); adjustment: signed change (≠ 0). */
    quantity,
    at: z.iso.datetime({ offset: true }).optional(),
    reason: z.string().trim().max(300).default(''),
  })
  .superRefine((m, ctx) => {
    if ((m.kind === 'use' || m.kind === 'receipt') && !(m.quantity > 0)) ctx.addIssue({ code: 'custom', path: ['quantity'], message: 'must be greater than 0' });
    if (m.kind === 'count' && m.quantity < 0) ctx.addIssue({ code: 'custom', path: ['quantity'], message: 'a count cannot be below 0' });
    if (m.kind === 'adjustment' && m.quantity === 0) ctx.addIssue({ code: 'custom', path: ['quantity'], message: 'an adjustment must change the stock' });
    if (m.kind === 'adjustment' && m.reason.length < 3) ctx.addIssue({ code: 'custom', path: ['reason'], message: 'say why the stock is adjusted' });
  });
export type MovementCreateInput = z.infer<typeof movementCreateSchema>;

/** A stock movement as the API returns it. */
export interface Movement {
  id: number;
  inputId: number;
  kind: 'receipt' | 'use' | 'count' | 'adjustment';
  quantity: number;
  /** For counts: counted minus expected at that moment. */
  difference: number | null;
  at: string;
  reason: string;
  orderId: number | null;
  by: string;
}

/** An input with its stock and reorder advice (units of the input; days; ISO dates). */
export interface InputStatus {
  id: number;
  farmId: number;
  farmName: string;
  name: string;
  unit: string;
  category: InputCategory;
  supplierId: number | null;
  supplierName: string | null;
  leadTimeDays: number;
  serviceLevel: number;
  orderCost: number;
  holdingCostPerYear: number;
  unitPrice: number;
  packSize: number;
  minimumOrder: number;
  notes: string;
  archivedAt: string | null;
  onHand: number;
  onOrder: number;
  dailyDemand: number;
  dailyDemandSd: number;
  daysOfCover: number | null;
  reorderPoint: number;
  safetyStock: number;
  eoq: number;
  suggestedQuantity: number;
  orderBy: string | null;
  due: boolean;
  /** Stock at the end of each of the last 30 days, oldest first (for a sparkline). */
  stockHistory: number[];
}

/** Query of GET /api/inputs. */
export const inputListQuerySchema = z.object({
  farmId: idSchema.optional(),
  supplierId: idSchema.optional(),
  format: z.enum(['json', 'csv']).default('json'),
});

/** Purchase order states. */
export const ORDER_STATUSES = ['draft', 'sent', 'part-received', 'received', 'closed-short', 'cancelled'] as const;
export type OrderStatus = (typeof ORDER_STATUSES)[number];

const orderLine = z.object({ inputId: idSchema, quantity: z.number({ error: 'must be a number' }).finite().positive('must be greater than 0').max(100_000_000), unitPrice: money('Unit price').optional() });

/** Body of POST /api/orders: a draft for one supplier and farm. */
export const orderCreateSchema = z.object({
  supplierId: idSchema,
  farmId: idSchema,
  lines: z.array(orderLine).min(1, 'add at least one line').max(200),
  notes: z.string().trim().max(1000).default(''),
});
export type OrderCreateInput = z.infer<typeof orderCreateSchema>;

/** Body of POST /api/orders/from-suggestions: drafts for every due input (grouped by supplier and farm). */
export const orderFromSuggestionsSchema = z.object({
  farmId: idSchema.optional(),
  /** Only these inputs (default: every input that is due and has a supplier). */
  inputIds: z.array(idSchema).max(500).optional(),
});

/** Body of PATCH /api/orders/:id (drafts only): replace lines or notes. */
export const orderUpdateSchema = z.object({ lines: z.array(orderLine).min(1, 'add at least one line').max(200).optional(), notes: z.string().trim().max(1000).optional() });
export type OrderUpdateInput = z.infer<typeof orderUpdateSchema>;

/** Body of POST /api/orders/:id/receipts: what arrived, per line. */
export const orderReceiptSchema = z.object({
  lines: z.array(z.object({ lineId: idSchema, quantity: z.number({ error: 'must be a number' }).finite().positive('must be greater than 0').max(100_000_000) })).min(1, 'book in at least one line').max(200),
  at: z.iso.datetime({ offset: true }).optional(),
  note: z.string().trim().max(300).default(''),
});
export type OrderReceiptInput = z.infer<typeof orderReceiptSchema>;

/** Body of POST /api/orders/:id/close-short: a part-received order ends, the rest not delivered is cancelled. */
export const orderCloseShortSchema = z.object({
  reason: z.string({ error: 'say why the rest will not come' }).trim().min(3, 'say why the rest will not come').max(300, 'At most 300 characters'),
});
export type OrderCloseShortInput = z.infer<typeof orderCloseShortSchema>;

/** A purchase order with its lines. */
export interface PurchaseOrder {
  id: number;
  number: string;
  farmId: number;
  farmName: string;
  supplierId: number;
  supplierName: string;
  supplierEmail: string;
  status: OrderStatus;
  notes: string;
  createdAt: string;
  sentAt: string | null;
  createdBy: string;
  /** When a part-received order was closed short, and why (null otherwise). */
  closedShortAt: string | null;
  closedShortReason: string | null;
  closedShortBy: string | null;
  /** cancelledQuantity: what will not come on a closed-short order (units; 0 on any other). */
  lines: { id: number; inputId: number; inputName: string; unit: string; quantity: number; unitPrice: number; receivedQuantity: number; cancelledQuantity: number; lineTotal: number }[];
  total: number;
}
