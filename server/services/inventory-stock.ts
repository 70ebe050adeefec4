// Inputs and their stock: stock from movements (never edited directly), reorder advice, movements and the inputs CSV.
import type { Transaction } from 'sequelize';
import { demandFromMovements, stockOnHand, suggestOrder } from '@shared/inventory';
import type { InputCreateInput, InputStatus, InputUpdateInput, Movement, MovementCreateInput, SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { toCsv } from '../csv';
import { AppError, forbidden, notFound } from '../errors';
import { assertFarmAccess } from './access';
import type { Input, StockMovement, Supplier } from '../models';
import { supplierFor } from './inventory-suppliers';

const DAY_MS = 86_400_000;
/** Demand is estimated from the use of the last 60 days (or of the days since the input's first movement, when fewer). */
const DEMAND_WINDOW_DAYS = 60;

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

export const round = (v: number) => Math.round(v * 1000) / 1000;

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
