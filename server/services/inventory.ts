// Purchased inputs: suppliers, stock from movements (never edited directly), reorder advice from
// shared/inventory, and purchase orders from draft to received.
import type { Transaction } from 'sequelize';
import { roundUpToPack } from '@shared/inventory';
import type { OrderCloseShortInput, OrderCreateInput, OrderReceiptInput, OrderUpdateInput, PurchaseOrder as OrderDto, SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { toCsv } from '../csv';
import { AppError, forbidden, notFound } from '../errors';
import { assertFarmAccess } from './access';
import type { PurchaseOrder } from '../models';
import { orderMail } from './inventory-order-mail';
import { isDeadlock, takeOrderNumber } from './order-numbers';
import { listInputs, round } from './inventory-stock';
import { supplierFor } from './inventory-suppliers';

// Suppliers and stock live in the sibling files; callers keep importing everything from here.
export { createSupplier, listSuppliers, updateSupplier } from './inventory-suppliers';
export { createInput, getInput, inputsCsv, listInputs, listMovements, recordMovement, updateInput } from './inventory-stock';

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
  const userIds = new Set(orders.flatMap((o) => [o.createdById, o.closedShortById]).filter((v): v is number => v !== null && v !== undefined));
  const users = new Map((await User.findAll({ where: { id: [...userIds] } })).map((u) => [u.id, u.name]));
  return orders.map((o) => {
    const closedShort = o.status === 'closed-short';
    const own = lines.filter((l) => l.orderId === o.id).map((l) => {
      // A closed-short order is owed for what came; the rest is cancelled.
      const cancelledQuantity = closedShort ? Math.max(0, l.quantity - l.receivedQuantity) : 0;
      const billed = closedShort ? l.receivedQuantity : l.quantity;
      return {
        id: l.id, inputId: l.inputId, inputName: inputs.get(l.inputId)?.name ?? '', unit: inputs.get(l.inputId)?.unit ?? '', quantity: l.quantity, unitPrice: l.unitPrice,
        receivedQuantity: l.receivedQuantity, cancelledQuantity, lineTotal: Math.round(billed * l.unitPrice * 100) / 100,
      };
    });
    const s = suppliers.get(o.supplierId);
    return {
      id: o.id, number: o.number, farmId: o.farmId, farmName: farms.get(o.farmId) ?? '', supplierId: o.supplierId, supplierName: s?.name ?? '', supplierEmail: s?.email ?? '',
      status: o.status, notes: o.notes, createdAt: o.createdAt.toISOString(), sentAt: o.sentAt ? o.sentAt.toISOString() : null, createdBy: (o.createdById && users.get(o.createdById)) || '',
      closedShortAt: o.closedShortAt ? o.closedShortAt.toISOString() : null, closedShortReason: o.closedShortReason ?? null,
      closedShortBy: o.closedShortAt ? (o.closedShortById && users.get(o.closedShortById)) || '' : null,
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

/**
 * Creates a draft order numbered CODE-YY-NNN. The number comes from the organisation's counter row
 * for the year, raised in this transaction; a deadlock between two first orders of a year is retried.
 */
export async function createOrder(ctx: AppContext, actor: SessionUser, body: OrderCreateInput): Promise<OrderDto> {
  await assertFarmAccess(ctx, actor, body.farmId);
  await supplierFor(ctx, actor, body.supplierId);
  const make = () =>
    ctx.db.sequelize.transaction(async (transaction) => {
      const lines = await checkLines(ctx, actor, body.farmId, body.lines, transaction);
      const number = await takeOrderNumber(ctx, actor.organisationId, body.farmId, transaction);
      const o = await ctx.db.models.PurchaseOrder.create({ organisationId: actor.organisationId, farmId: body.farmId, supplierId: body.supplierId, number, status: 'draft', notes: body.notes, sentAt: null, createdById: actor.id }, { transaction });
      await ctx.db.models.PurchaseOrderLine.bulkCreate(lines.map((l) => ({ ...l, orderId: o.id })), { transaction });
      return o;
    });
  let order;
  for (let attempt = 1; ; attempt++) {
    try {
      order = await make();
      break;
    } catch (err) {
      if (!isDeadlock(err) || attempt >= 3) throw err;
    }
  }
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
    .map((i) => ({ ...i, suggestedQuantity: i.suggestedQuantity > 0 ? i.suggestedQuantity : roundUpToPack(i.packSize, i.packSize, i.minimumOrder) }));
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

/** E-mails a draft order to its supplier (HTML, text and a CSV of the lines) and marks it sent. */
export async function sendOrder(ctx: AppContext, actor: SessionUser, id: number): Promise<OrderDto> {
  const claimed = await ctx.db.sequelize.transaction(async (transaction) => {
    const order = await orderFor(ctx, actor, id, transaction, true);
    if (order.status !== 'draft') throw new AppError(409, 'not_draft', `This order is ${order.status} already`);
    await order.update({ status: 'sent', sentAt: new Date() }, { transaction });
    return order;
  });
  const dto = await getOrder(ctx, actor, claimed.id);
  const mail = orderMail(dto, actor);
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

/**
 * Closes a part-received order short: what came stays booked in, the rest is cancelled with the
 * reason, so it no longer counts as on order. The supplier is not mailed; the buyer tells them.
 */
export async function closeOrderShort(ctx: AppContext, actor: SessionUser, id: number, body: OrderCloseShortInput): Promise<OrderDto> {
  const farmId = await ctx.db.sequelize.transaction(async (transaction) => {
    const order = await orderFor(ctx, actor, id, transaction, true);
    if (order.status === 'sent') throw new AppError(409, 'nothing_received', `Nothing of ${order.number} has arrived yet: cancel the order instead of closing it short`);
    if (order.status !== 'part-received') throw new AppError(409, 'cannot_close_short', `A ${order.status} order cannot be closed short; only a part-received one can`);
    await order.update({ status: 'closed-short', closedShortAt: new Date(), closedShortReason: body.reason, closedShortById: actor.id }, { transaction });
    return order.farmId;
  });
  ctx.events.emit('stock', { organisationId: actor.organisationId, farmIds: [farmId] });
  return getOrder(ctx, actor, id);
}

/** Orders as CSV, one row per line (toCsv: no cell runs as a formula in a spreadsheet), money in the organisation's currency. */
export async function ordersCsv(ctx: AppContext, actor: SessionUser, q: { status?: string; farmId?: number } = {}): Promise<string> {
  const orders = await listOrders(ctx, actor, q, null);
  return toCsv(
    {
      fields: ['order', 'status', 'farm', 'supplier', 'created', 'sent', 'item', 'quantity', 'unit', 'unit_price', 'line_total', 'currency', 'received', 'cancelled', 'closed_short_reason'],
      data: orders.flatMap((o) =>
        o.lines.map((l) => [
          o.number, o.status, o.farmName, o.supplierName, o.createdAt.slice(0, 10), o.sentAt?.slice(0, 10) ?? '', l.inputName, l.quantity, l.unit, l.unitPrice, l.lineTotal,
          actor.currency, l.receivedQuantity, l.cancelledQuantity, o.closedShortReason ?? '',
        ]),
      ),
    },
  );
}
