// Purchased inputs: suppliers, stock from movements (never edited directly), reorder advice from
// shared/inventory, and purchase orders from draft to received.
import type { Transaction } from 'sequelize';
import { demandFromMovements, stockOnHand, suggestOrder } from '@shared/inventory';
import type {
  InputCreateInput, InputStatus, InputUpdateInput, Movement, MovementCreateInput, OrderCreateInput, OrderReceiptInput, OrderUpdateInput,
  PurchaseOrder as OrderDto, SessionUser, Supplier as SupplierDto, SupplierCreateInput, SupplierUpdateInput,
} from '@shared/schemas';
import type { AppContext } from '../context';
import { toCsv } from '../csv';
import { AppError, forbidden, notFound } from '../errors';
import { assertFarmAccess } from '../middleware/access';
import type { Input, PurchaseOrder, StockMovement, Supplier } from '../models';
import { escapeHtml } from '../mail/mailer';

const DAY_MS = 86_400_000;
/** Demand is estimated from the use of the last 60 days (or of the days since the input's first movement, when fewer). */
const DEMAND_WINDOW_DAYS = 60;

// ---------- suppliers ----------

const toSupplierDto = (s: Supplier): SupplierDto => ({
  id: s.id, name: s.name, contactName: s.contactName, email: s.email, phone: s.phone, leadTimeDays: s.leadTimeDays, notes: s.notes,
  archivedAt: s.archivedAt ? s.archivedAt.toISOString() : null,
});

export async function listSuppliers(ctx: AppContext, actor: SessionUser): Promise<SupplierDto[]> {
  const rows = await ctx.db.models.Supplier.findAll({ where: { organisationId: actor.organisationId }, order: [['name', 'ASC']] });
  return rows.map(toSupplierDto);
}

async function supplierFor(ctx: AppContext, actor: SessionUser, id: number, transaction?: Transaction) {
  const s = await ctx.db.models.Supplier.findOne({ where: { id, organisationId: actor.organisationId }, transaction });
  if (!s) throw notFound('Supplier');
  return s;
}

export async function createSupplier(ctx: AppContext, actor: SessionUser, input: SupplierCreateInput): Promise<SupplierDto> {
  return toSupplierDto(await ctx.db.models.Supplier.create({ ...input, organisationId: actor.organisationId, archivedAt: null }));
}

export async function updateSupplier(ctx: AppContext, actor: SessionUser, id: number, input: SupplierUpdateInput): Promise<SupplierDto> {
  const s = await supplierFor(ctx, actor, id);
  const { archived, ...fields } = input;
  await s.update({ ...fields, ...(archived === undefined ? {} : { archivedAt: archived ? (s.archivedAt ?? new Date()) : null }) });
  return toSupplierDto(s);
}

// ---------- inputs and stock ----------

/** An input the actor may see: 404 outside the organisation, 403 on a farm not granted. */
async function inputFor(ctx: AppContext, actor: SessionUser, id: number, transaction?: Transaction, lock = false) {
  const input = await ctx.db.models.Input.findOne({ where: { id, organisationId: actor.organisationId }, transaction, lock: lock ? transaction?.LOCK.UPDATE : undefined });
  if (!input) throw notFound('Input');
  if (!actor.farmIds.includes(input.farmId)) throw forbidden('You do not have access to this farm');
  return input;
}

const asMovements = (rows: StockMovement[]) => rows.map((m) => ({ kind: m.kind, quantity: m.quantity, at: m.at.getTime() }));

function statusOf(input: Input, movements: StockMovement[], extra: { farmName: string; supplier: Supplier | null; onOrder: number; now: number }): InputStatus {
  const ms = asMovements(movements);
  const { onHand } = stockOnHand(ms);
  // An input kept for less than the window is averaged over the days it has been kept, not over 60.
  const firstAt = ms.reduce((t, m) => Math.min(t, m.at), extra.now);
  const keptDays = Math.max(1, Math.round((extra.now - firstAt) / 86_400_000));
  const demand = demandFromMovements(ms, { windowDays: Math.min(DEMAND_WINDOW_DAYS, keptDays), now: extra.now });
  const leadTimeDays = input.leadTimeDays ?? extra.supplier?.leadTimeDays ?? 7;
  const advice = suggestOrder({
    now: extra.now, onHand, onOrder: extra.onOrder, dailyDemand: demand.dailyMean, dailyDemandSd: demand.dailySd, leadTimeDays,
    serviceLevel: input.serviceLevel, orderCost: input.orderCost, holdingCostPerUnitPerYear: input.holdingCostPerYear, packSize: input.packSize, minimumOrder: input.minimumOrder,
  });
  const stockHistory: number[] = [];
  for (let d = 29; d >= 0; d--) {
    const end = extra.now - d * DAY_MS;
    stockHistory.push(stockOnHand(ms.filter((m) => m.at <= end)).onHand);
  }
  return {
    id: input.id, farmId: input.farmId, farmName: extra.farmName, name: input.name, unit: input.unit, category: input.category,
    supplierId: input.supplierId, supplierName: extra.supplier?.name ?? null, leadTimeDays, serviceLevel: input.serviceLevel, orderCost: input.orderCost,
    holdingCostPerYear: input.holdingCostPerYear, unitPrice: input.unitPrice, packSize: input.packSize, minimumOrder: input.minimumOrder, notes: input.notes,
    archivedAt: input.archivedAt ? input.archivedAt.toISOString() : null,
    onHand, onOrder: extra.onOrder, dailyDemand: demand.dailyMean, dailyDemandSd: demand.dailySd,
    daysOfCover: Number.isFinite(advice.daysOfCover) ? advice.daysOfCover : null,
    reorderPoint: advice.reorderPoint, safetyStock: advice.safetyStock, eoq: advice.eoq, suggestedQuantity: advice.suggestedQuantity,
    orderBy: advice.orderBy === null ? null : new Date(advice.orderBy).toISOString(), due: advice.due, stockHistory,
  };
}

/** Open (sent or part-received) quantities per input. */
async function onOrderByInput(ctx: AppContext, organisationId: number, inputIds: number[]): Promise<Map<number, number>> {
  const out = new Map<number, number>();
  if (!inputIds.length) return out;
  const open = await ctx.db.models.PurchaseOrder.findAll({ where: { organisationId, status: ['sent', 'part-received'] }, attributes: ['id'] });
  if (!open.length) return out;
  const lines = await ctx.db.models.PurchaseOrderLine.findAll({ where: { orderId: open.map((o) => o.id), inputId: inputIds } });
  for (const l of lines) out.set(l.inputId, (out.get(l.inputId) ?? 0) + Math.max(0, l.quantity - l.receivedQuantity));
  return out;
}

/** Every input the actor may see with stock and reorder advice, most urgent first. */
export async function listInputs(ctx: AppContext, actor: SessionUser, q: { farmId?: number; supplierId?: number; includeArchived?: boolean } = {}): Promise<InputStatus[]> {
  if (q.farmId !== undefined) await assertFarmAccess(ctx, actor, q.farmId);
  const { Input, StockMovement, Supplier, Farm } = ctx.db.models;
  const inputs = await Input.findAll({
    where: { organisationId: actor.organisationId, farmId: q.farmId ?? actor.farmIds, ...(q.supplierId ? { supplierId: q.supplierId } : {}), ...(q.includeArchived ? {} : { archivedAt: null }) },
  });
  const ids = inputs.map((i) => i.id);
  const movements = ids.length ? await StockMovement.findAll({ where: { inputId: ids }, order: [['at', 'ASC'], ['id', 'ASC']] }) : [];
  const byInput = new Map<number, StockMovement[]>();
  for (const m of movements) byInput.set(m.inputId, [...(byInput.get(m.inputId) ?? []), m]);
  const suppliers = new Map((await Supplier.findAll({ where: { organisationId: actor.organisationId } })).map((s) => [s.id, s]));
  const farms = new Map((await Farm.findAll({ where: { organisationId: actor.organisationId } })).map((f) => [f.id, f.name]));
  const onOrder = await onOrderByInput(ctx, actor.organisationId, ids);
  const now = Date.now();
  const rows = inputs.map((i) => statusOf(i, byInput.get(i.id) ?? [], { farmName: farms.get(i.farmId) ?? '', supplier: i.supplierId ? (suppliers.get(i.supplierId) ?? null) : null, onOrder: onOrder.get(i.id) ?? 0, now }));
  // Due first, then by the date stock reaches the reorder point, then by name.
  return rows.sort((a, b) => Number(b.due) - Number(a.due) || (a.orderBy ?? '9999').localeCompare(b.orderBy ?? '9999') || a.name.localeCompare(b.name));
}

export async function getInput(ctx: AppContext, actor: SessionUser, id: number): Promise<InputStatus> {
  const input = await inputFor(ctx, actor, id);
  return (await listInputs(ctx, actor, { farmId: input.farmId, includeArchived: true })).find((i) => i.id === id)!;
}

export async function createInput(ctx: AppContext, actor: SessionUser, body: InputCreateInput): Promise<InputStatus> {
  await assertFarmAccess(ctx, actor, body.farmId);
  if (body.supplierId) await supplierFor(ctx, actor, body.supplierId);
  const input = await ctx.db.models.Input.create({ ...body, organisationId: actor.organisationId, archivedAt: null });
  return getInput(ctx, actor, input.id);
}

export async function updateInput(ctx: AppContext, actor: SessionUser, id: number, body: InputUpdateInput): Promise<InputStatus> {
  const input = await inputFor(ctx, actor, id);
  if (body.supplierId) await supplierFor(ctx, actor, body.supplierId);
  const { archived, ...fields } = body;
  await input.update({ ...fields, ...(archived === undefined ? {} : { archivedAt: archived ? (input.archivedAt ?? new Date()) : null }) });
  return getInput(ctx, actor, id);
}

async function toMovementDtos(ctx: AppContext, rows: StockMovement[]): Promise<Movement[]> {
  const names = new Map((await ctx.db.models.User.findAll({ where: { id: [...new Set(rows.map((r) => r.byUserId).filter((v): v is number => v !== null))] } })).map((u) => [u.id, u.name]));
  // Count differences need the running level, so walk the history in time order.
  const ordered = [...rows].sort((a, b) => a.at.getTime() - b.at.getTime() || a.id - b.id);
  const { countDifferences } = stockOnHand(asMovements(ordered));
  const diffs = [...countDifferences];
  return ordered
    .map((m) => ({
      id: Number(m.id), inputId: m.inputId, kind: m.kind, quantity: m.quantity,
      difference: m.kind === 'count' ? (diffs.shift()?.difference ?? null) : null,
      at: m.at.toISOString(), reason: m.reason, orderId: m.orderId, by: (m.byUserId && names.get(m.byUserId)) || '',
    }))
    .reverse();
}

/** The input's movements, newest first. */
export async function listMovements(ctx: AppContext, actor: SessionUser, inputId: number): Promise<Movement[]> {
  const input = await inputFor(ctx, actor, inputId);
  return toMovementDtos(ctx, await ctx.db.models.StockMovement.findAll({ where: { inputId: input.id } }));
}

/**
 * Records a use, count, adjustment or unplanned receipt. The input row is locked for the check, so
 * two people drawing at once cannot take stock below zero; only a count may set any level.
 */
export async function recordMovement(ctx: AppContext, actor: SessionUser, inputId: number, body: MovementCreateInput, opts: { brewId?: number; transaction?: Transaction } = {}): Promise<Movement> {
  if (body.kind !== 'use' && body.kind !== 'count' && actor.role === 'worker') throw forbidden('Workers record use and counts; ask a buyer or manager for receipts and adjustments');
  const at = body.at ? new Date(body.at) : new Date();
  if (at.getTime() > Date.now() + 5 * 60_000) throw new AppError(400, 'invalid_input', 'at: cannot be in the future', 'at');
  const run = async (transaction: Transaction) => {
    const input = await inputFor(ctx, actor, inputId, transaction, true);
    const existing = await ctx.db.models.StockMovement.findAll({ where: { inputId: input.id }, transaction });
    const before = stockOnHand(asMovements(existing).filter((m) => m.at <= at.getTime())).onHand;
    const change = body.kind === 'use' ? -body.quantity : body.kind === 'receipt' || body.kind === 'adjustment' ? body.quantity : 0;
    if (change < 0 && before + change < -1e-9) {
      throw new AppError(409, 'insufficient_stock', `quantity: only ${round(before)} ${input.unit} on hand; record a count if the shelf holds more`, 'quantity');
    }
    return ctx.db.models.StockMovement.create(
      { organisationId: input.organisationId, farmId: input.farmId, inputId: input.id, kind: body.kind, quantity: body.quantity, at, reason: body.reason, orderId: null, orderLineId: null, brewId: opts.brewId ?? null, byUserId: actor.id },
      { transaction },
    );
  };
  // Inside a caller's transaction (a brew) the row is not committed yet: the caller announces the
  // change after its commit, and reads are kept inside the transaction.
  const transaction = opts.transaction;
  const row = transaction ? await run(transaction) : await ctx.db.sequelize.transaction(run);
  if (!transaction) ctx.events.emit('stock', { organisationId: actor.organisationId, farmIds: [row.farmId] });
  const all = await ctx.db.models.StockMovement.findAll({ where: { inputId: row.inputId }, transaction });
  return (await toMovementDtos(ctx, all)).find((m) => m.id === Number(row.id))!;
}

const round = (v: number) => Math.round(v * 1000) / 1000;

/** The inputs as CSV (toCsv: no cell runs as a formula in a spreadsheet). */
export async function inputsCsv(ctx: AppContext, actor: SessionUser, q: { farmId?: number; supplierId?: number }): Promise<string> {
  const rows = await listInputs(ctx, actor, q);
  return toCsv(
    {
      fields: ['farm', 'input', 'unit', 'supplier', 'on_hand', 'on_order', 'use_per_day', 'days_of_cover', 'reorder_point', 'suggested_quantity', 'order_by', 'due'],
      data: rows.map((r) => [r.farmName, r.name, r.unit, r.supplierName ?? '', round(r.onHand), round(r.onOrder), round(r.dailyDemand), r.daysOfCover === null ? '' : round(r.daysOfCover), round(r.reorderPoint), r.suggestedQuantity, r.orderBy?.slice(0, 10) ?? '', r.due ? 'yes' : 'no']),
    },
  );
}

// ---------- purchase orders ----------

async function orderFor(ctx: AppContext, actor: SessionUser, id: number, transaction?: Transaction, lock = false) {
  const order = await ctx.db.models.PurchaseOrder.findOne({ where: { id, organisationId: actor.organisationId }, transaction, lock: lock ? transaction?.LOCK.UPDATE : undefined });
  if (!order) throw notFound('Order');
  if (!actor.farmIds.includes(order.farmId)) throw forbidden('You do not have access to this farm');
  return order;
}

async function toOrderDtos(ctx: AppContext, orders: PurchaseOrder[]): Promise<OrderDto[]> {
  if (!orders.length) return [];
  const { PurchaseOrderLine, Input, Supplier, Farm, User } = ctx.db.models;
  const lines = await PurchaseOrderLine.findAll({ where: { orderId: orders.map((o) => o.id) }, order: [['id', 'ASC']] });
  const inputs = new Map((await Input.findAll({ where: { id: [...new Set(lines.map((l) => l.inputId))] } })).map((i) => [i.id, i]));
  const suppliers = new Map((await Supplier.findAll({ where: { id: [...new Set(orders.map((o) => o.supplierId))] } })).map((s) => [s.id, s]));
  const farms = new Map((await Farm.findAll({ where: { id: [...new Set(orders.map((o) => o.farmId))] } })).map((f) => [f.id, f.name]));
  const users = new Map((await User.findAll({ where: { id: [...new Set(orders.map((o) => o.createdById).filter((v): v is number => v !== null))] } })).map((u) => [u.id, u.name]));
  return orders.map((o) => {
    const own = lines.filter((l) => l.orderId === o.id).map((l) => ({
      id: l.id, inputId: l.inputId, inputName: inputs.get(l.inputId)?.name ?? '', unit: inputs.get(l.inputId)?.unit ?? '', quantity: l.quantity, unitPrice: l.unitPrice,
      receivedQuantity: l.receivedQuantity, lineTotal: Math.round(l.quantity * l.unitPrice * 100) / 100,
    }));
    const s = suppliers.get(o.supplierId);
    return {
      id: o.id, number: o.number, farmId: o.farmId, farmName: farms.get(o.farmId) ?? '', supplierId: o.supplierId, supplierName: s?.name ?? '', supplierEmail: s?.email ?? '',
      status: o.status, notes: o.notes, createdAt: o.createdAt.toISOString(), sentAt: o.sentAt ? o.sentAt.toISOString() : null, createdBy: (o.createdById && users.get(o.createdById)) || '',
      lines: own, total: Math.round(own.reduce((t, l) => t + l.lineTotal, 0) * 100) / 100,
    };
  });
}

/** Orders newest first; the screen gets the newest `limit`, the CSV export (limit null) all of them. */
export async function listOrders(ctx: AppContext, actor: SessionUser, q: { status?: string; farmId?: number } = {}, limit: number | null = 200): Promise<OrderDto[]> {
  const orders = await ctx.db.models.PurchaseOrder.findAll({
    where: { organisationId: actor.organisationId, farmId: q.farmId ? [q.farmId].filter((f) => actor.farmIds.includes(f)) : actor.farmIds, ...(q.status ? { status: q.status } : {}) },
    order: [['createdAt', 'DESC'], ['id', 'DESC']],
    ...(limit === null ? {} : { limit }),
  });
  return toOrderDtos(ctx, orders);
}

export async function getOrder(ctx: AppContext, actor: SessionUser, id: number): Promise<OrderDto> {
  return (await toOrderDtos(ctx, [await orderFor(ctx, actor, id)]))[0];
}

async function checkLines(ctx: AppContext, actor: SessionUser, farmId: number, lines: OrderCreateInput['lines'], transaction: Transaction) {
  const inputs = await ctx.db.models.Input.findAll({ where: { id: lines.map((l) => l.inputId), organisationId: actor.organisationId }, transaction });
  const byId = new Map(inputs.map((i) => [i.id, i]));
  return lines.map((l, i) => {
    const input = byId.get(l.inputId);
    if (!input) throw new AppError(422, 'unknown_input', `lines.${i}.inputId: no such input`, `lines.${i}.inputId`);
    if (input.farmId !== farmId) throw new AppError(422, 'wrong_farm', `lines.${i}.inputId: ${input.name} is stocked on another farm`, `lines.${i}.inputId`);
    return { inputId: input.id, quantity: l.quantity, unitPrice: l.unitPrice ?? input.unitPrice };
  });
}

/** Creates a draft order. */
export async function createOrder(ctx: AppContext, actor: SessionUser, body: OrderCreateInput): Promise<OrderDto> {
  await assertFarmAccess(ctx, actor, body.farmId);
  await supplierFor(ctx, actor, body.supplierId);
  const order = await ctx.db.sequelize.transaction(async (transaction) => {
    const lines = await checkLines(ctx, actor, body.farmId, body.lines, transaction);
    const o = await ctx.db.models.PurchaseOrder.create({ organisationId: actor.organisationId, farmId: body.farmId, supplierId: body.supplierId, number: `tmp-${Date.now()}-${Math.random()}`.slice(0, 20), status: 'draft', notes: body.notes, sentAt: null, createdById: actor.id }, { transaction });
    await o.update({ number: `PO-${String(o.id).padStart(5, '0')}` }, { transaction });
    await ctx.db.models.PurchaseOrderLine.bulkCreate(lines.map((l) => ({ ...l, orderId: o.id })), { transaction });
    return o;
  });
  return getOrder(ctx, actor, order.id);
}

/** Drafts one order per supplier and farm from every due input (or the chosen ones), at the suggested quantities. */
export async function ordersFromSuggestions(ctx: AppContext, actor: SessionUser, q: { farmId?: number; inputIds?: number[] }): Promise<OrderDto[]> {
  // Due inputs already on a draft are left out, so pressing the button twice drafts nothing twice.
  const drafts = await ctx.db.models.PurchaseOrder.findAll({ where: { organisationId: actor.organisationId, status: 'draft' }, attributes: ['id'] });
  const drafted = new Set(drafts.length ? (await ctx.db.models.PurchaseOrderLine.findAll({ where: { orderId: drafts.map((d) => d.id) }, attributes: ['inputId'] })).map((l) => l.inputId) : []);
  // Inputs picked by hand are ordered even when not due yet (at least one pack); otherwise every due one.
  const statuses = (await listInputs(ctx, actor, { farmId: q.farmId }))
    .filter((i) => q.inputIds !== undefined || !drafted.has(i.id))
    .filter((i) => (q.inputIds ? q.inputIds.includes(i.id) : i.due && i.suggestedQuantity > 0) && i.supplierId)
    .map((i) => ({ ...i, suggestedQuantity: i.suggestedQuantity > 0 ? i.suggestedQuantity : Math.max(i.packSize, i.minimumOrder) }));
  if (!statuses.length) throw new AppError(409, 'nothing_due', 'No input with a supplier needs ordering right now (inputs already on a draft order are left out)');
  const groups = new Map<string, typeof statuses>();
  for (const s of statuses) groups.set(`${s.supplierId}|${s.farmId}`, [...(groups.get(`${s.supplierId}|${s.farmId}`) ?? []), s]);
  const out: OrderDto[] = [];
  for (const group of groups.values()) {
    out.push(await createOrder(ctx, actor, { supplierId: group[0].supplierId!, farmId: group[0].farmId, notes: '', lines: group.map((s) => ({ inputId: s.id, quantity: s.suggestedQuantity, unitPrice: s.unitPrice })) }));
  }
  return out;
}

export async function updateOrder(ctx: AppContext, actor: SessionUser, id: number, body: OrderUpdateInput): Promise<OrderDto> {
  await ctx.db.sequelize.transaction(async (transaction) => {
    const order = await orderFor(ctx, actor, id, transaction, true);
    if (order.status !== 'draft') throw new AppError(409, 'not_draft', 'Only a draft order can be edited');
    if (body.lines) {
      const lines = await checkLines(ctx, actor, order.farmId, body.lines, transaction);
      await ctx.db.models.PurchaseOrderLine.destroy({ where: { orderId: order.id }, transaction });
      await ctx.db.models.PurchaseOrderLine.bulkCreate(lines.map((l) => ({ ...l, orderId: order.id })), { transaction });
    }
    if (body.notes !== undefined) await order.update({ notes: body.notes }, { transaction });
  });
  return getOrder(ctx, actor, id);
}

function orderMail(order: OrderDto, org: string, sender: SessionUser) {
  const money = (v: number) => v.toLocaleString('en-US', { minimumFractionDigits: 2, maximumFractionDigits: 2 });
  const qty = (v: number) => v.toLocaleString('en-US', { maximumFractionDigits: 3 });
  const lines = order.lines.map((l, i) => `${i + 1}. ${l.inputName} — ${qty(l.quantity)} ${l.unit}${l.unitPrice ? ` at ${money(l.unitPrice)} = ${money(l.lineTotal)}` : ''}`);
  const text = [
    `Purchase order ${order.number} from ${org}`,
    `Deliver to: ${order.farmName}`,
    '',
    ...lines,
    '',
    `Order total: ${money(order.total)}`,
    ...(order.notes ? ['', `Notes: ${order.notes}`] : []),
    '',
    `Please confirm the delivery date by replying to this message. — ${sender.name}, ${org}`,
  ].join('\n');
  const rows = order.lines.map((l) => `<tr><td>${escapeHtml(l.inputName)}</td><td style="text-align:right">${qty(l.quantity)} ${escapeHtml(l.unit)}</td><td style="text-align:right">${money(l.unitPrice)}</td><td style="text-align:right">${money(l.lineTotal)}</td></tr>`).join('');
  const html = `<h2>Purchase order ${escapeHtml(order.number)}</h2><p>From ${escapeHtml(org)} — deliver to <strong>${escapeHtml(order.farmName)}</strong>.</p>
<table cellpadding="6" style="border-collapse:collapse" border="1"><thead><tr><th>Item</th><th>Quantity</th><th>Unit price</th><th>Line total</th></tr></thead><tbody>${rows}</tbody>
<tfoot><tr><td colspan="3"><strong>Order total</strong></td><td style="text-align:right"><strong>${money(order.total)}</strong></td></tr></tfoot></table>
${order.notes ? `<p>Notes: ${escapeHtml(order.notes)}</p>` : ''}<p>Please confirm the delivery date by replying to this message.<br>${escapeHtml(sender.name)}, ${escapeHtml(org)}</p>`;
  const csv = toCsv({ fields: ['order', 'item', 'quantity', 'unit', 'unit_price', 'line_total'], data: order.lines.map((l) => [order.number, l.inputName, l.quantity, l.unit, l.unitPrice, l.lineTotal]) });
  return { subject: `Purchase order ${order.number} — ${org}`, text, html, csv };
}

/** E-mails a draft order to its supplier (HTML, text and a CSV of the lines) and marks it sent. */
export async function sendOrder(ctx: AppContext, actor: SessionUser, id: number): Promise<OrderDto> {
  const claimed = await ctx.db.sequelize.transaction(async (transaction) => {
    const order = await orderFor(ctx, actor, id, transaction, true);
    if (order.status !== 'draft') throw new AppError(409, 'not_draft', `This order is ${order.status} already`);
    await order.update({ status: 'sent', sentAt: new Date() }, { transaction });
    return order;
  });
  const dto = await getOrder(ctx, actor, claimed.id);
  const mail = orderMail(dto, actor.organisationName, actor);
  try {
    await ctx.mailer.send({ organisationId: actor.organisationId, kind: 'order', to: dto.supplierEmail, subject: mail.subject, text: mail.text, html: mail.html, attachments: [{ filename: `${dto.number}.csv`, content: mail.csv, contentType: 'text/csv' }] });
  } catch (err) {
    // Nothing left the building: put the order back to draft so it can be sent again.
    await claimed.update({ status: 'draft', sentAt: null });
    ctx.logger.error({ err }, 'order mail failed');
    throw new AppError(502, 'mail_failed', 'The order e-mail could not be sent; it is still a draft — try again');
  }
  return dto;
}

export async function cancelOrder(ctx: AppContext, actor: SessionUser, id: number): Promise<OrderDto> {
  await ctx.db.sequelize.transaction(async (transaction) => {
    const order = await orderFor(ctx, actor, id, transaction, true);
    if (order.status !== 'draft' && order.status !== 'sent') throw new AppError(409, 'cannot_cancel', `A ${order.status} order cannot be cancelled`);
    await order.update({ status: 'cancelled' }, { transaction });
  });
  return getOrder(ctx, actor, id);
}

/**
 * Books a delivery in: receipt movements for what arrived. The order row is locked, so two people
 * booking the same delivery at once cannot both succeed; a fully received order takes no more.
 */
export async function receiveOrder(ctx: AppContext, actor: SessionUser, id: number, body: OrderReceiptInput): Promise<OrderDto> {
  const at = body.at ? new Date(body.at) : new Date();
  if (at.getTime() > Date.now() + 5 * 60_000) throw new AppError(400, 'invalid_input', 'at: a delivery cannot be booked in before it arrives (the date is in the future)', 'at');
  const farmId = await ctx.db.sequelize.transaction(async (transaction) => {
    const order = await orderFor(ctx, actor, id, transaction, true);
    if (order.status === 'received') throw new AppError(409, 'already_received', `${order.number} has been received in full already`);
    if (order.status !== 'sent' && order.status !== 'part-received') throw new AppError(409, 'not_sent', `A ${order.status} order cannot be booked in`);
    const lines = await ctx.db.models.PurchaseOrderLine.findAll({ where: { orderId: order.id }, transaction });
    const byId = new Map(lines.map((l) => [l.id, l]));
    for (const [i, r] of body.lines.entries()) {
      const line = byId.get(r.lineId);
      if (!line) throw new AppError(422, 'unknown_line', `lines.${i}.lineId: not a line of this order`, `lines.${i}.lineId`);
      const open = line.quantity - line.receivedQuantity;
      if (r.quantity > open + 1e-9) throw new AppError(422, 'over_receipt', `lines.${i}.quantity: only ${round(open)} still due on this line`, `lines.${i}.quantity`);
      await line.update({ receivedQuantity: line.receivedQuantity + r.quantity }, { transaction });
      await ctx.db.models.StockMovement.create(
        { organisationId: order.organisationId, farmId: order.farmId, inputId: line.inputId, kind: 'receipt', quantity: r.quantity, at, reason: body.note || `Delivery of ${order.number}`, orderId: order.id, orderLineId: line.id, brewId: null, byUserId: actor.id },
        { transaction },
      );
    }
    const complete = lines.every((l) => l.receivedQuantity >= l.quantity - 1e-9);
    await order.update({ status: complete ? 'received' : 'part-received' }, { transaction });
    return order.farmId;
  });
  ctx.events.emit('stock', { organisationId: actor.organisationId, farmIds: [farmId] });
  return getOrder(ctx, actor, id);
}

/** Orders as CSV, one row per line (toCsv: no cell runs as a formula in a spreadsheet). */
export async function ordersCsv(ctx: AppContext, actor: SessionUser, q: { status?: string; farmId?: number } = {}): Promise<string> {
  const orders = await listOrders(ctx, actor, q, null);
  return toCsv(
    {
      fields: ['order', 'status', 'farm', 'supplier', 'created', 'sent', 'item', 'quantity', 'unit', 'unit_price', 'line_total', 'received'],
      data: orders.flatMap((o) => o.lines.map((l) => [o.number, o.status, o.farmName, o.supplierName, o.createdAt.slice(0, 10), o.sentAt?.slice(0, 10) ?? '', l.inputName, l.quantity, l.unit, l.unitPrice, l.lineTotal, l.receivedQuantity])),
    },
  );
}

