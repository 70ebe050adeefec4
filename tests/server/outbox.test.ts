// The development outbox holds live sign-in links: only owners and managers of the organisation a
// mail was sent for may read it (buyers: their purchase orders only), and production never serves it.
import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import type { MailKind } from '@shared/schemas';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn, type OrgFixture } from '../support/fixtures';
import { waitForMail } from '../support/mail';

const env = useTestApp();

async function mail(org: OrgFixture, kind: MailKind, to: string, attachment?: string) {
  await env.ctx.mailer.send({
    organisationId: org.organisationId,
    kind,
    to,
    subject: `${kind} for ${to}`,
    text: `A ${kind} mail`,
    html: `<p>A ${kind} mail</p>`,
    attachments: attachment ? [{ filename: 'order.csv', content: attachment, contentType: 'text/csv' }] : undefined,
  });
  await waitForMail(env.config.outboxDir, to);
}

async function world() {
  const a = await makeOrganisation(env);
  const b = await makeOrganisation(env);
  await mail(a, 'account', a.users.manager.email);
  await mail(a, 'order', 'supplier-a@test.example', 'line,litres\n1,200\n');
  await mail(b, 'account', b.users.manager.email);
  return { a, b };
}

const subjectsOf = (res: request.Response) => (res.body.messages as { subject: string }[]).map((m) => m.subject).sort();

describe('development outbox', () => {
  it('answers 401 to nobody and 403 to a worker', async () => {
    const { a } = await world();
    await request(env.app).get('/api/dev/outbox').expect(401);
    const worker = await signedIn(env, a.users.worker.email);
    await call(worker, 'get', '/api/dev/outbox').expect(403);
    await call(worker, 'delete', '/api/dev/outbox').expect(403);
  });

  it("shows an owner their own organisation's mail only, and a buyer only the purchase orders", async () => {
    const { a, b } = await world();
    const ownerA = await signedIn(env, a.users.owner.email);
    expect(subjectsOf(await call(ownerA, 'get', '/api/dev/outbox').expect(200))).toEqual([`account for ${a.users.manager.email}`, 'order for supplier-a@test.example']);
    const ownerB = await signedIn(env, b.users.owner.email);
    expect(subjectsOf(await call(ownerB, 'get', '/api/dev/outbox').expect(200))).toEqual([`account for ${b.users.manager.email}`]);
    const buyerA = await signedIn(env, a.users.buyer.email);
    expect(subjectsOf(await call(buyerA, 'get', '/api/dev/outbox').expect(200))).toEqual(['order for supplier-a@test.example']);
  });

  it("gives another organisation's owner 404 for an attachment, and the mail's own buyer the file", async () => {
    const { a, b } = await world();
    const buyerA = await signedIn(env, a.users.buyer.email);
    const order = (await call(buyerA, 'get', '/api/dev/outbox').expect(200)).body.messages[0];
    expect(order.attachments).toEqual([{ index: 0, filename: 'order.csv', contentType: 'text/csv', size: expect.any(Number) }]);
    const file = await call(buyerA, 'get', `/api/dev/outbox/${order.id}/attachments/0`).expect(200);
    expect(file.text).toBe('line,litres\n1,200\n');
    const ownerB = await signedIn(env, b.users.owner.email);
    await call(ownerB, 'get', `/api/dev/outbox/${order.id}/attachments/0`).expect(404);
    await call(ownerB, 'get', '/api/dev/outbox/..%2F..%2Fetc/attachments/0').expect(404);
  });

  it("empties only the caller's organisation's mail", async () => {
    const { a, b } = await world();
    const ownerB = await signedIn(env, b.users.owner.email);
    await call(ownerB, 'delete', '/api/dev/outbox').expect(204);
    expect((await call(ownerB, 'get', '/api/dev/outbox').expect(200)).body.messages).toEqual([]);
    const ownerA = await signedIn(env, a.users.owner.email);
    expect((await call(ownerA, 'get', '/api/dev/outbox').expect(200)).body.messages).toHaveLength(2);
  });

  it('is not served at all in production, even with DEV_OUTBOX=true', async () => {
    const { a } = await world();
    const config = loadConfig({ ...process.env, NODE_ENV: 'production', SESSION_SECRET: 'x'.repeat(32), DEV_OUTBOX: 'true', DB_NAME: env.config.db.name });
    const app = createApp({ ...env.ctx, config: { ...env.config, env: config.env, devOutbox: config.devOutbox } });
    const agent = request.agent(app);
    const session = await agent.get('/api/auth/session').expect(200);
    const signIn = await agent.post('/api/auth/sign-in').set('x-csrf-token', session.body.csrfToken).send({ email: a.users.owner.email, password: 'correct-horse-battery' }).expect(200);
    await agent.get('/api/dev/outbox').set('x-csrf-token', signIn.body.csrfToken).expect(404);
  });
});
