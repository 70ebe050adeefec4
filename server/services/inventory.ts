// Purchased inputs: suppliers, stock from movements (never edited directly), reorder advice from
// shared/inventory, and purchase orders from draft to received.
import type { Transaction } from 'sequelize';
import type { OrderCreateInput, OrderReceiptInput, OrderUpdateInput, PurchaseOrder as OrderDto, SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { toCsv } from '../csv';
import { AppError, forbidden, notFound } from '../errors';
import { assertFarmAccess } from './access';
import type { PurchaseOrder } from '../models';
import { escapeHtml } from '../mail/mailer';
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

