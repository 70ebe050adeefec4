import { describe, expect, it } from 'vitest';
import { yearIn } from '@shared/inventory';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn } from '../support/fixtures';
import { makeInput } from '../support/inventory';
import { waitForMail } from '../support/mail';

const env = useTestApp();
// makeOrganisation puts its farms in Europe/Dublin: order numbers count in that farm's year.
const yy = () => String(yearIn(new Date(), 'Europe/Dublin') % 100).padStart(2, '0');

async function buying() {
  const org = await makeOrganisation(env);
  const { input, supplier } = await makeInput(env, org, org.farmIds[0]);
  const owner = await signedIn(env, org.users.owner.email);
  const buyer = await signedIn(env, org.users.buyer.email);
  const newOrder = (quantity = 20) => call(buyer, 'post', '/api/orders', { supplierId: supplier.id, farmId: input.farmId, lines: [{ inputId: input.id, quantity }] });
  return { org, input, supplier, owner, buyer, newOrder };
}

describe('order numbers', () => {
  it('numbers orders by organisation code and year, counting up from 001', async () => {
    const { owner, newOrder } = await buying();
    await call(owner, 'patch', '/api/organisation', { code: `Q${String.fromCharCode(65 + Math.floor(Math.random() * 26))}${String.fromCharCode(65 + Math.floor(Math.random() * 26))}` }).expect(200);
    const { code } = (await owner.get('/api/organisation').expect(200)).body;
    const first = (await newOrder().expect(201)).body;
    const second = (await newOrder().expect(201)).body;
    expect(first.number).toBe(`${code}-${yy()}-001`);
    expect(second.number).toBe(`${code}-${yy()}-002`);
    expect((await owner.get('/api/organisation').expect(200)).body.nextOrderNumber).toBe(`${code}-${yy()}-003`);
  });

  it('gives two orders made at the same moment two numbers, one after the other', async () => {
    const { owner, newOrder } = await buying();
    const { code } = (await owner.get('/api/organisation').expect(200)).body;
    const made = await Promise.all([newOrder(), newOrder(), newOrder(), newOrder()]);
    expect(made.map((r) => r.status)).toEqual([201, 201, 201, 201]);
    const numbers = made.map((r) => r.body.number as string).sort();
    expect(numbers).toEqual([1, 2, 3, 4].map((n) => `${code}-${yy()}-00${n}`));
  });

  it('keeps one count per organisation: another organisation starts at 001 too', async () => {
    const a = await buying();
    const b = await buying();
    await a.newOrder().expect(201);
    const other = (await b.newOrder().expect(201)).body;
    expect(other.number).toMatch(new RegExp(`-${yy()}-001$`));
  });

  it('keeps the number an order was made with after the code changes, and sends it in the mail', async () => {
    const { owner, buyer, supplier, newOrder } = await buying();
    const old = (await newOrder().expect(201)).body;
    const renamed = `Z${String.fromCharCode(65 + Math.floor(Math.random() * 26))}${String.fromCharCode(65 + Math.floor(Math.random() * 26))}${String.fromCharCode(65 + Math.floor(Math.random() * 26))}`;
    await call(owner, 'patch', '/api/organisation', { code: renamed.toLowerCase(), currency: 'nzd' }).expect(200);
    expect((await buyer.get(`/api/orders/${old.id}`).expect(200)).body.number).toBe(old.number);
    const next = (await newOrder().expect(201)).body;
    expect(next.number).toBe(`${renamed}-${yy()}-002`);
    await call(buyer, 'post', `/api/orders/${next.id}/send`).expect(200);
    const mail = await waitForMail(env.config.outboxDir, supplier.email);
    expect(mail.subject).toContain(next.number);
    // NZD in Intl.NumberFormat (en-GB): "NZ$130.00" for 20 L at 6.50.
    expect(mail.text).toContain(`Order total: ${new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'NZD' }).format(130)}`);
    expect(mail.attachments[0]?.filename).toBe(`${next.number}.csv`);
  });

  it('still reads orders numbered the old way (PO-00001)', async () => {
    const { org, input, supplier, buyer } = await buying();
    const o = await env.ctx.db.models.PurchaseOrder.create({ organisationId: org.organisationId, farmId: input.farmId, supplierId: supplier.id, number: 'PO-00001', status: 'sent', notes: '', sentAt: new Date(), createdById: null });
    expect((await buyer.get(`/api/orders/${o.id}`).expect(200)).body.number).toBe('PO-00001');
  });
});

describe('organisation settings', () => {
  it('lets owners set the code and currency, naming the field of a bad value, and refuses others', async () => {
    const { owner, buyer, org } = await buying();
    const bad = await call(owner, 'patch', '/api/organisation', { currency: 'XYZ' }).expect(400);
    expect(bad.body.error).toMatchObject({ code: 'invalid_input', field: 'currency' });
    expect(bad.body.error.message).toMatch(/ISO 4217/);
    const badCode = await call(owner, 'patch', '/api/organisation', { code: 'T1' }).expect(400);
    expect(badCode.body.error.field).toBe('code');
    await call(buyer, 'patch', '/api/organisation', { currency: 'GBP' }).expect(403);
    const saved = await call(owner, 'patch', '/api/organisation', { currency: 'gbp' }).expect(200);
    expect(saved.body.currency).toBe('GBP');
    // Nothing stored was lost by the refused requests, and the session shows the new currency.
    expect((await buyer.get('/api/auth/me').expect(200)).body).toMatchObject({ currency: 'GBP', organisationCode: saved.body.code });
    expect((await env.ctx.db.models.Organisation.findByPk(org.organisationId))!.code).toBe(saved.body.code);
  });

  it('refuses a code another organisation uses, naming the field', async () => {
    const a = await buying();
    const b = await buying();
    const taken = (await a.owner.get('/api/organisation').expect(200)).body.code;
    const res = await call(b.owner, 'patch', '/api/organisation', { code: taken }).expect(409);
    expect(res.body.error).toMatchObject({ code: 'code_taken', field: 'code' });
  });

  it('gives every new organisation a free code of 2 to 4 letters from its name', async () => {
    const codes: string[] = [];
    for (let i = 0; i < 3; i++) codes.push((await env.ctx.db.models.Organisation.create({ name: 'Kestrel Hill Growers' })).code);
    // Initials first (KHG, then KH), then the stem KH with one more letter.
    for (const c of codes) expect(c).toMatch(/^KH[A-Z]{0,2}$/);
    expect(new Set(codes).size).toBe(3);
  });
});
