import { describe, expect, it } from 'vitest';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn } from '../support/fixtures';
import { makeInput } from '../support/inventory';

const env = useTestApp();

async function partDelivered() {
  const org = await makeOrganisation(env);
  const { input, supplier } = await makeInput(env, org, org.farmIds[0], { onHand: 8, usePerDay: 4, days: 40 });
  const buyer = await signedIn(env, org.users.buyer.email);
  const o = (await call(buyer, 'post', '/api/orders', { supplierId: supplier.id, farmId: input.farmId, lines: [{ inputId: input.id, quantity: 60, unitPrice: 6.5 }] }).expect(201)).body;
  await call(buyer, 'post', `/api/orders/${o.id}/send`).expect(200);
  await call(buyer, 'post', `/api/orders/${o.id}/receipts`, { lines: [{ lineId: o.lines[0].id, quantity: 20 }] }).expect(200);
  return { org, input, supplier, buyer, order: o };
}

describe('closing an order short', () => {
  it('cancels the rest of a part-delivered order: on order drops to zero, what came stays in stock', async () => {
    const { buyer, input, order } = await partDelivered();
    const before = (await buyer.get(`/api/inputs/${input.id}`).expect(200)).body;
    expect(before.onOrder).toBeCloseTo(40, 9);
    const closed = await call(buyer, 'post', `/api/orders/${order.id}/close-short`, { reason: 'Supplier has no more this season' }).expect(200);
    expect(closed.body).toMatchObject({ status: 'closed-short', closedShortReason: 'Supplier has no more this season' });
    expect(closed.body.closedShortAt).not.toBeNull();
    expect(closed.body.closedShortBy).not.toBe('');
    expect(closed.body.lines[0]).toMatchObject({ quantity: 60, receivedQuantity: 20, cancelledQuantity: 40, lineTotal: 130 });
    expect(closed.body.total).toBe(130);
    const after = (await buyer.get(`/api/inputs/${input.id}`).expect(200)).body;
    expect(after.onOrder).toBe(0);
    expect(after.onHand).toBeCloseTo(before.onHand, 9);
    // It stays in the list under its own status, and takes no more deliveries.
    expect((await buyer.get('/api/orders?status=closed-short').expect(200)).body.map((o: { id: number }) => o.id)).toContain(order.id);
    const late = await call(buyer, 'post', `/api/orders/${order.id}/receipts`, { lines: [{ lineId: order.lines[0].id, quantity: 5 }] }).expect(409);
    expect(late.body.error.code).toBe('not_sent');
  });

  it('writes the status, the cancelled rest, the currency and the reason in the orders CSV', async () => {
    const { buyer, order } = await partDelivered();
    await call(buyer, 'post', `/api/orders/${order.id}/close-short`, { reason: 'rest back-ordered; bought elsewhere' }).expect(200);
    const csv = (await buyer.get('/api/orders?format=csv&status=closed-short').expect(200)).text;
    const [head, row] = csv.trim().split(/\r?\n/);
    expect(head).toBe('order,status,farm,supplier,created,sent,item,quantity,unit,unit_price,line_total,currency,received,cancelled,closed_short_reason');
    expect(row).toContain(`${order.number},closed-short,`);
    // toCsv quotes a cell holding ";" so no spreadsheet separator setting splits the reason.
    expect(row!.endsWith(',60,L,6.5,130,EUR,20,40,"rest back-ordered; bought elsewhere"')).toBe(true);
  });

  it('needs a reason, naming the field, and changes nothing without one', async () => {
    const { buyer, order, input } = await partDelivered();
    const res = await call(buyer, 'post', `/api/orders/${order.id}/close-short`, { reason: ' ' }).expect(400);
    expect(res.body.error).toMatchObject({ code: 'invalid_input', field: 'reason' });
    expect((await buyer.get(`/api/orders/${order.id}`).expect(200)).body.status).toBe('part-received');
    expect((await buyer.get(`/api/inputs/${input.id}`).expect(200)).body.onOrder).toBeCloseTo(40, 9);
  });

  it('refuses orders with nothing delivered yet or already complete', async () => {
    const { buyer, input, supplier } = await partDelivered();
    const sent = (await call(buyer, 'post', '/api/orders', { supplierId: supplier.id, farmId: input.farmId, lines: [{ inputId: input.id, quantity: 20 }] }).expect(201)).body;
    expect((await call(buyer, 'post', `/api/orders/${sent.id}/close-short`, { reason: 'never mind' }).expect(409)).body.error.code).toBe('cannot_close_short');
    await call(buyer, 'post', `/api/orders/${sent.id}/send`).expect(200);
    expect((await call(buyer, 'post', `/api/orders/${sent.id}/close-short`, { reason: 'never mind' }).expect(409)).body.error.code).toBe('nothing_received');
    await call(buyer, 'post', `/api/orders/${sent.id}/receipts`, { lines: [{ lineId: sent.lines[0].id, quantity: 20 }] }).expect(200);
    expect((await call(buyer, 'post', `/api/orders/${sent.id}/close-short`, { reason: 'never mind' }).expect(409)).body.error.code).toBe('cannot_close_short');
  });
});
