// Order numbers CODE-YY-NNN: a counter row per organisation and year (order_counters), raised in the
// transaction that makes the order, so two orders made at once wait on the row and never share a number.
import { QueryTypes, type Transaction } from 'sequelize';
import { formatOrderNumber, yearIn } from '@shared/inventory';
import type { AppContext } from '../context';

/** The year an order made now on `farmId` counts in, by that farm's clock (UTC when the farm is gone). */
async function orderYear(ctx: Pick<AppContext, 'db'>, farmId: number | null, organisationId: number, transaction?: Transaction): Promise<number> {
  const farm = farmId
    ? await ctx.db.models.Farm.findOne({ where: { id: farmId, organisationId }, attributes: ['timeZone'], transaction })
    : await ctx.db.models.Farm.findOne({ where: { organisationId }, attributes: ['timeZone'], order: [['id', 'ASC']], transaction });
  return yearIn(new Date(), farm?.timeZone ?? 'UTC');
}

/** Takes the next order number of the organisation inside `transaction` (the counter row stays locked until it ends). */
export async function takeOrderNumber(ctx: Pick<AppContext, 'db'>, organisationId: number, farmId: number, transaction: Transaction): Promise<string> {
  const org = await ctx.db.models.Organisation.findByPk(organisationId, { attributes: ['code'], transaction });
  if (!org) throw new Error(`organisation ${organisationId} is gone`);
  const year = await orderYear(ctx, farmId, organisationId, transaction);
  await ctx.db.sequelize.query(
    'INSERT INTO order_counters (organisationId, year, lastCount) VALUES (?, ?, 1) ON DUPLICATE KEY UPDATE lastCount = lastCount + 1',
    { replacements: [organisationId, year], transaction },
  );
  const [row] = await ctx.db.sequelize.query<{ lastCount: number }>('SELECT lastCount FROM order_counters WHERE organisationId = ? AND year = ?', {
    replacements: [organisationId, year],
    type: QueryTypes.SELECT,
    transaction,
  });
  return formatOrderNumber(org.code, year, Number(row!.lastCount));
}

/** The number the organisation's next order would get (by its first farm's clock), without taking it. */
export async function peekOrderNumber(ctx: Pick<AppContext, 'db'>, organisationId: number, code: string): Promise<string> {
  const year = await orderYear(ctx, null, organisationId);
  const [row] = await ctx.db.sequelize.query<{ lastCount: number }>('SELECT lastCount FROM order_counters WHERE organisationId = ? AND year = ?', {
    replacements: [organisationId, year],
    type: QueryTypes.SELECT,
  });
  return formatOrderNumber(code, year, Number(row?.lastCount ?? 0) + 1);
}

/** Whether `err` is MariaDB giving up a transaction to break a deadlock (safe to run it again). */
export function isDeadlock(err: unknown): boolean {
  const e = err as { parent?: { errno?: number }; original?: { errno?: number } } | null;
  return e?.parent?.errno === 1213 || e?.original?.errno === 1213;
}
