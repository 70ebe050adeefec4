import { describe, expect, it } from 'vitest';
import { reorderPoint } from '@shared/inventory';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn } from '../support/fixtures';
import { makeInput } from '../support/inventory';
import { waitForMail } from '../support/mail';

const env = useTestApp();

describe('inputs', () => {
  it('shows stock from movements with reorder advice from shared/inventory', async () => {
    const org = await makeOrganisation(env);
    const { input } = await makeInput(env, org, org.farmIds[0], { onHand: 30, usePerDay: 5, days: 20 });
    const buyer = await signedIn(env, org.users.buyer.email);
    const res = await buyer.get('/api/inputs').expect(200);
    const row = res.body.find((r: { id: number }) => r.id === input.id);
    expect(row.onHand).toBeCloseTo(30, 9);
    // 5 L on each of the last 20 days of an input kept for 21 (opening stock 21 days ago, under the
    // 60-day window): mean 5·20/21 per day, and ROP = d·L + z·σ·√L from the shared function.
    expect(row.dailyDemand).toBeCloseTo(100 / 21, 9);
    expect(row.reorderPoint).toBeCloseTo(reorderPoint({ dailyDemand: row.dailyDemand, dailyDemandSd: row.dailyDemandSd, leadTimeDays: 7, serviceLevel: 0.95 }), 9);
    expect(row.due).toBe(row.onHand <= row.reorderPoint);
    expect(row.suggestedQuantity % 20).toBe(0);
    expect(row.stockHistory).toHaveLength(30);
  });

  it('never lets use take stock below zero without a count', async () => {
    const org = await makeOrganisation(env);
    const { input } = await makeInput(env, org, org.farmIds[0], { onHand: 10 });
    const worker = await signedIn(env, org.users.worker.email);
    const res = await call(worker, 'post', `/api/inputs/${input.id}/movements`, { kind: 'use', quantity: 12 }).expect(409);
    expect(res.body.error).toMatchObject({ code: 'insufficient_stock', field: 'quantity' });
    const count = await call(worker, 'post', `/api/inputs/${input.id}/movements`, { kind: 'count', quantity: 14, reason: 'shelf count' }).expect(201);
    expect(count.body.difference).toBeCloseTo(4, 9);
    await call(worker, 'post', `/api/inputs/${input.id}/movements`, { kind: 'use', quantity: 12 }).expect(201);
    await call(worker, 'post', `/api/inputs/${input.id}/movements`, { kind: 'adjustment', quantity: 5, reason: 'found a drum' }).expect(403);
  });

  it('names the field of a bad movement', async () => {
    const org = await makeOrganisation(env);
    const { input } = await makeInput(env, org, org.farmIds[0]);
    const buyer = await signedIn(env, org.users.buyer.email);
    const res = await call(buyer, 'post', `/api/inputs/${input.id}/movements`, { kind: 'adjustment', quantity: -3 }).expect(400);
    expect(res.body.error.field).toBe('reason');
  });

  it('exports inputs as CSV with formulas defused', async () => {
    const org = await makeOrganisation(env);
    const { input } = await makeInput(env, org, org.farmIds[0]);
    await input.update({ name: '=cmd|calc' });
    const buyer = await signedIn(env, org.users.buyer.email);
    const res = await buyer.get('/api/inputs?format=csv').expect(200);
    expect(res.text).toContain("'=cmd|calc");
  });
});

describe('purchase orders', () => {
  async function dueInput() {
    const org = await makeOrganisation(env);
    const { input, supplier } = await makeInput(env, org, org.farmIds[0], { onHand: 8, usePerDay: 4, days: 40 });
    const buyer = await signedIn(env, org.users.buyer.email);
    return { org, input, supplier, buyer };
  }

  it('drafts an order from the suggestions, e-mails it, and books the delivery in once', async () => {
    const { input, supplier, buyer } = await dueInput();
    const drafts = await call(buyer, 'post', '/api/orders/from-suggestions', {}).expect(201);
    expect(drafts.body).toHaveLength(1);
    const order = drafts.body[0];
    expect(order).toMatchObject({ status: 'draft', supplierId: supplier.id });
    const line = order.lines[0];
    expect(line.inputId).toBe(input.id);

    // A second press drafts nothing twice.
    await call(buyer, 'post', '/api/orders/from-suggestions', {}).expect(409);
    const sent = await call(buyer, 'post', `/api/orders/${order.id}/send`).expect(200);
    expect(sent.body.status).toBe('sent');
    const mail = await waitForMail(env.config.outboxDir, supplier.email);
    expect(mail.subject).toBe(`Purchase order ${order.number} — ${sent.body.farmName ? (await buyer.get('/api/auth/me')).body.organisationName : ''}`);
    // Money in the organisation's currency (EUR unless an owner chose another), as Intl.NumberFormat writes it.
    const euro = new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'EUR' });
    expect(mail.text).toContain(`Kelp concentrate — ${line.quantity.toLocaleString('en-GB')} L at ${euro.format(6.5)}`);
    expect(mail.text).toContain(`Order total: ${euro.format(order.total)}`);
    expect(mail.attachments.map((a) => a.filename)).toEqual([`${order.number}.csv`]);
    await call(buyer, 'post', `/api/orders/${order.id}/send`).expect(409);

    const before = (await buyer.get(`/api/inputs/${input.id}`)).body.onHand;
    await call(buyer, 'post', `/api/orders/${order.id}/receipts`, { lines: [{ lineId: line.id, quantity: line.quantity }] }).expect(200);
    const after = (await buyer.get(`/api/inputs/${input.id}`)).body;
    expect(after.onHand).toBeCloseTo(before + line.quantity, 9);
    const again = await call(buyer, 'post', `/api/orders/${order.id}/receipts`, { lines: [{ lineId: line.id, quantity: 1 }] }).expect(409);
    expect(again.body.error.code).toBe('already_received');
  });

  it('lets only one of two simultaneous bookings of the same delivery through', async () => {
    const { buyer, input } = await dueInput();
    const [order] = (await call(buyer, 'post', '/api/orders/from-suggestions', {}).expect(201)).body;
    await call(buyer, 'post', `/api/orders/${order.id}/send`).expect(200);
    const line = order.lines[0];
    const before = (await buyer.get(`/api/inputs/${input.id}`)).body.onHand;
    const results = await Promise.all([1, 2].map(() => call(buyer, 'post', `/api/orders/${order.id}/receipts`, { lines: [{ lineId: line.id, quantity: line.quantity }] })));
    expect(results.map((r) => r.status).sort()).toEqual([200, 409]);
    expect((await buyer.get(`/api/inputs/${input.id}`)).body.onHand).toBeCloseTo(before + line.quantity, 9);
  });

  it('keeps every receipt when deliveries of two orders for one input land at once', async () => {
    const { buyer, input, supplier } = await dueInput();
    const ids: number[] = [];
    for (let i = 0; i < 2; i++) {
      const o = (await call(buyer, 'post', '/api/orders', { supplierId: supplier.id, farmId: input.farmId, lines: [{ inputId: input.id, quantity: 20 }] }).expect(201)).body;
      await call(buyer, 'post', `/api/orders/${o.id}/send`).expect(200);
      ids.push(o.id);
    }
    const before = (await buyer.get(`/api/inputs/${input.id}`)).body.onHand;
    const orders = await Promise.all(ids.map((id) => buyer.get(`/api/orders/${id}`)));
    await Promise.all(orders.map((o) => call(buyer, 'post', `/api/orders/${o.body.id}/receipts`, { lines: [{ lineId: o.body.lines[0].id, quantity: 20 }] }).expect(200)));
    expect((await buyer.get(`/api/inputs/${input.id}`)).body.onHand).toBeCloseTo(before + 40, 9);
  });

  it('records a part delivery and refuses more than is still due', async () => {
    const { buyer, input, supplier } = await dueInput();
    const o = (await call(buyer, 'post', '/api/orders', { supplierId: supplier.id, farmId: input.farmId, lines: [{ inputId: input.id, quantity: 40 }] }).expect(201)).body;
    await call(buyer, 'post', `/api/orders/${o.id}/receipts`, { lines: [{ lineId: o.lines[0].id, quantity: 10 }] }).expect(409);
    await call(buyer, 'post', `/api/orders/${o.id}/send`).expect(200);
    const part = await call(buyer, 'post', `/api/orders/${o.id}/receipts`, { lines: [{ lineId: o.lines[0].id, quantity: 15 }] }).expect(200);
    expect(part.body.status).toBe('part-received');
    const over = await call(buyer, 'post', `/api/orders/${o.id}/receipts`, { lines: [{ lineId: o.lines[0].id, quantity: 30 }] }).expect(422);
    expect(over.body.error.field).toBe('lines.0.quantity');
    const tomorrow = await call(buyer, 'post', `/api/orders/${o.id}/receipts`, { at: new Date(Date.now() + 86_400_000).toISOString(), lines: [{ lineId: o.lines[0].id, quantity: 5 }] }).expect(400);
    expect(tomorrow.body.error.field).toBe('at');
    expect((await buyer.get(`/api/orders/${o.id}`)).body.lines[0].receivedQuantity).toBe(15);
    const rest = await call(buyer, 'post', `/api/orders/${o.id}/receipts`, { lines: [{ lineId: o.lines[0].id, quantity: 25 }] }).expect(200);
    expect(rest.body.status).toBe('received');
  });

  it('edits drafts only and exports orders as CSV', async () => {
    const { buyer, input, supplier } = await dueInput();
    const o = (await call(buyer, 'post', '/api/orders', { supplierId: supplier.id, farmId: input.farmId, lines: [{ inputId: input.id, quantity: 20 }] }).expect(201)).body;
    const edited = await call(buyer, 'patch', `/api/orders/${o.id}`, { lines: [{ inputId: input.id, quantity: 60 }] }).expect(200);
    expect(edited.body.lines[0].quantity).toBe(60);
    await call(buyer, 'post', `/api/orders/${o.id}/send`).expect(200);
    await call(buyer, 'patch', `/api/orders/${o.id}`, { notes: 'late' }).expect(409);
    const csv = await buyer.get('/api/orders?format=csv').expect(200);
    expect(csv.text.split('\n')[0]).toContain('order,status,farm,supplier');
    expect(csv.text).toContain(o.number);
    // The export follows the list's filter.
    expect((await buyer.get('/api/orders?format=csv&status=sent').expect(200)).text).toContain(o.number);
    expect((await buyer.get('/api/orders?format=csv&status=draft').expect(200)).text).not.toContain(o.number);
  });

  it('refuses a line for an input of another farm, naming the line', async () => {
    const { org, buyer, supplier } = await dueInput();
    const manager = await signedIn(env, org.users.manager.email);
    const elsewhere = await makeInput(env, org, org.farmIds[1]);
    const res = await call(manager, 'post', '/api/orders', { supplierId: supplier.id, farmId: org.farmIds[0], lines: [{ inputId: elsewhere.input.id, quantity: 5 }] }).expect(422);
    expect(res.body.error.field).toBe('lines.0.inputId');
    void buyer;
  });
});
