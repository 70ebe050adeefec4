// Migration 0016 on a database that already holds organisations and orders: each organisation gets a
// distinct code from its name and EUR, orders keep the numbers they were sent with, and down/up round-trips.
import { describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { migrator } from '../../server/db';
import { useTestApp } from '../support/db';

const env = useTestApp();
const M = '0016-order-numbers-currency-close-short';

describe('migration 0016', () => {
  it('gives existing organisations distinct codes and EUR, and keeps their orders’ numbers', async () => {
    const { sequelize } = env.ctx.db;
    const umzug = migrator(sequelize);
    const applied = (await umzug.executed()).map((m) => m.name);
    // Revert 0016 (and anything after it), as a database from before it would be.
    await umzug.down({ to: M });
    const now = new Date();
    const org = async (name: string) => {
      const [id] = await sequelize.query('INSERT INTO organisations (name, createdAt, updatedAt) VALUES (?, ?, ?)', { replacements: [name, now, now], type: QueryTypes.INSERT });
      return Number(id);
    };
    const a = await org('Marsh End Growers');
    const b = await org('Marsh End Growers');
    const [farmId] = await sequelize.query("INSERT INTO farms (organisationId, name, timeZone, location, createdAt, updatedAt) VALUES (?, 'Old farm', 'Europe/Dublin', '', ?, ?)", { replacements: [a, now, now], type: QueryTypes.INSERT });
    const [supplierId] = await sequelize.query("INSERT INTO suppliers (organisationId, name, email, leadTimeDays, notes, createdAt, updatedAt) VALUES (?, 'Old supplier', 'old@supplier.example', 5, '', ?, ?)", { replacements: [a, now, now], type: QueryTypes.INSERT });
    await sequelize.query("INSERT INTO purchase_orders (organisationId, farmId, supplierId, number, status, notes, createdAt, updatedAt) VALUES (?, ?, ?, 'PO-00007', 'sent', '', ?, ?)", { replacements: [a, farmId, supplierId, now, now] });

    await umzug.up();
    expect((await umzug.executed()).map((m) => m.name)).toEqual(applied);
    const rows = await sequelize.query<{ id: number; code: string; currency: string }>('SELECT id, code, currency FROM organisations WHERE id IN (?, ?) ORDER BY id', { replacements: [a, b], type: QueryTypes.SELECT });
    expect(rows.map((r) => r.code)).toEqual(['ME', 'MEG']);
    expect(rows.map((r) => r.currency)).toEqual(['EUR', 'EUR']);
    const [order] = await sequelize.query<{ number: string }>('SELECT number FROM purchase_orders WHERE organisationId = ?', { replacements: [a], type: QueryTypes.SELECT });
    expect(order!.number).toBe('PO-00007');
  });
});
