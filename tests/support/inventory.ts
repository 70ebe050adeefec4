import type { TestEnv } from './db';
import type { OrgFixture } from './fixtures';

/** A supplier and an input on a farm, with `usePerDay` units used on each of the last `days` days after an opening receipt. */
export async function makeInput(env: TestEnv, org: OrgFixture, farmId: number, opts: { onHand?: number; usePerDay?: number; days?: number; leadTimeDays?: number; packSize?: number } = {}) {
  const { Supplier, Input, StockMovement } = env.ctx.db.models;
  const supplier = await Supplier.create({ organisationId: org.organisationId, name: `Supplier ${Math.random().toString(36).slice(2, 7)}`, contactName: 'Rhea', email: `sales-${Date.now()}-${Math.random().toString(36).slice(2, 6)}@supplier.example`, phone: '', leadTimeDays: opts.leadTimeDays ?? 7, notes: '', archivedAt: null });
  const input = await Input.create({
    organisationId: org.organisationId, farmId, name: 'Kelp concentrate', unit: 'L', category: 'fertilizer', supplierId: supplier.id, leadTimeDays: null, serviceLevel: 0.95,
    orderCost: 40, holdingCostPerYear: 2, unitPrice: 6.5, packSize: opts.packSize ?? 20, minimumOrder: 0, notes: '', archivedAt: null,
  });
  const days = opts.days ?? 0;
  const use = opts.usePerDay ?? 0;
  const start = Date.now() - (days + 1) * 86_400_000;
  await StockMovement.create({ organisationId: org.organisationId, farmId, inputId: input.id, kind: 'receipt', quantity: (opts.onHand ?? 100) + use * days, at: new Date(start), reason: 'opening stock', orderId: null, orderLineId: null, brewId: null, byUserId: null });
  for (let d = days; d >= 1; d--) {
    await StockMovement.create({ organisationId: org.organisationId, farmId, inputId: input.id, kind: 'use', quantity: use, at: new Date(Date.now() - d * 86_400_000 + 3_600_000), reason: '', orderId: null, orderLineId: null, brewId: null, byUserId: null });
  }
  return { supplier, input };
}
