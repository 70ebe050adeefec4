// Flags by text message against the local fake of the SMS service: who gets a text, the daily cap,
// retries with a back-off and the failures on the Profile, a STOP reply, and the texts in the outbox.
import { randomUUID } from 'node:crypto';
import type { Server } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn, type OrgFixture } from '../support/fixtures';
import { makeTank } from '../support/tanks';
import { freePort } from '../../scripts/lib/ports';
import { evaluateTankFlags } from '../../server/services/flags';
import { drainTextQueue, queueText, retryDelayMs } from '../../server/services/flag-texts';
import { readFakeTexts } from '../../server/sms/outbox';

// The fake posts replies to PUBLIC_URL, so the app listens there for the STOP test.
const port = await freePort();
const env = useTestApp({ PUBLIC_URL: `http://127.0.0.1:${port}` });
let server: Server;
beforeAll(async () => {
  server = env.app.listen(port, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
});
afterAll(() => new Promise<void>((r) => server.close(() => r())));

// Invented mobile numbers from the Australian range kept for drama (ACMA, recalled from memory).
let next = 100;
const newMobile = () => `+61491570${String(next++).padStart(3, '0')}`;
const textsTo = (phone: string) => readFakeTexts(env.config.outboxDir).filter((t) => t.to === phone);

async function coldCultureFlag(org: OrgFixture) {
  const cone = await makeTank(env, org, org.farmIds[0], { code: `C${next}`, contents: 'culture', lowStockL: 0 });
  const worker = await signedIn(env, org.users.worker.email);
  await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: cone.id, readingMm: 800, temperatureC: 12, idempotencyKey: randomUUID().replace(/-/g, '') }] }).expect(201);
  await evaluateTankFlags(env.ctx, org.organisationId, [org.farmIds[0]]);
  return cone;
}

describe('flag texts', () => {
  it('sends one text, linking to the tank, to the people who chose texts and none to the others', async () => {
    const org = await makeOrganisation(env);
    const [managerPhone, ownerPhone] = [newMobile(), newMobile()];
    const manager = await signedIn(env, org.users.manager.email);
    const owner = await signedIn(env, org.users.owner.email);
    const saved = await call(manager, 'patch', '/api/auth/me', { phone: managerPhone.replace(/^(\+61)(\d{3})/, '$1 $2 '), flagTexts: 'immediate' }).expect(200);
    expect(saved.body).toMatchObject({ phone: managerPhone, flagTexts: 'immediate' });
    await call(owner, 'patch', '/api/auth/me', { phone: ownerPhone, flagTexts: 'off' }).expect(200);
    const cone = await coldCultureFlag(org);
    await drainTextQueue(env.ctx);
    const mine = textsTo(managerPhone);
    expect(mine).toHaveLength(1);
    expect(mine[0].body).toMatch(/^Brimstock Culture too cold, Farm 1 /);
    expect(mine[0].body.endsWith(`${env.config.publicUrl}/tanks/${cone.id}`)).toBe(true);
    expect(mine[0].body.length).toBeLessThanOrEqual(160);
    expect(mine[0].from).toBe(env.config.sms.from);
    expect(textsTo(ownerPhone)).toHaveLength(0);

    // The outbox lists it for the organisation's managers, not for its buyers or another organisation.
    const outbox = await call(manager, 'get', '/api/dev/outbox').expect(200);
    expect(outbox.body.texts).toEqual([expect.objectContaining({ to: managerPhone, toName: `manager ${org.users.manager.email.split('-')[1].split('@')[0]}`, body: mine[0].body })]);
    const buyer = await signedIn(env, org.users.buyer.email);
    expect((await call(buyer, 'get', '/api/dev/outbox').expect(200)).body.texts).toEqual([]);
    const other = await makeOrganisation(env);
    const otherManager = await signedIn(env, other.users.manager.email);
    expect((await call(otherManager, 'get', '/api/dev/outbox').expect(200)).body.texts).toEqual([]);
  });

  it('refuses a number that is not a mobile one, and texts without a number, naming the phone field', async () => {
    const org = await makeOrganisation(env);
    const manager = await signedIn(env, org.users.manager.email);
    const landline = await call(manager, 'patch', '/api/auth/me', { phone: '+61 2 9876 5432' }).expect(400);
    expect(landline.body.error).toMatchObject({ field: 'phone', message: expect.stringMatching(/mobile number with \+ and the country code/) });
    const none = await call(manager, 'patch', '/api/auth/me', { flagTexts: 'digest' }).expect(422);
    expect(none.body.error).toMatchObject({ code: 'phone_required', field: 'phone' });
    expect((await call(manager, 'get', '/api/auth/me').expect(200)).body).toMatchObject({ phone: null, flagTexts: 'off' });
  });

  it('queues at most the daily cap of texts per person per UTC day and holds back the rest', async () => {
    const org = await makeOrganisation(env);
    const { User, FlagText } = env.ctx.db.models;
    const user = (await User.findByPk(org.users.manager.id))!;
    await user.update({ phone: newMobile(), flagTexts: 'immediate' });
    expect(env.config.sms.dailyCap).toBe(10);
    const day = new Date('2026-03-04T08:00:00Z');
    const statuses = [];
    for (let i = 0; i < 12; i++) statuses.push(await queueText(env.ctx, user, `text ${i}`, day));
    expect(statuses.filter((s) => s === 'pending')).toHaveLength(10);
    expect(statuses.slice(10)).toEqual(['over-cap', 'over-cap']);
    // 23:59 the same UTC day is still capped; 00:00 the next day starts afresh.
    expect(await queueText(env.ctx, user, 'late', new Date('2026-03-04T23:59:00Z'))).toBe('over-cap');
    expect(await queueText(env.ctx, user, 'next day', new Date('2026-03-05T00:00:00Z'))).toBe('pending');
    expect(await FlagText.count({ where: { userId: user.id, status: 'over-cap' } })).toBe(3);
    await FlagText.destroy({ where: { userId: user.id } });
  });

  it('tries a refused text again after a doubling wait, and shows it on the Profile once every attempt failed', async () => {
    const org = await makeOrganisation(env);
    const phone = newMobile();
    const manager = await signedIn(env, org.users.manager.email);
    await call(manager, 'patch', '/api/auth/me', { phone, flagTexts: 'immediate' }).expect(200);
    const user = (await env.ctx.db.models.User.findByPk(org.users.manager.id))!;
    const { retryMs, maxAttempts } = env.config.sms;
    expect([retryMs, maxAttempts]).toEqual([60_000, 5]);
    // Waits of 60, 120, 240 and 480 s between five attempts.
    expect([1, 2, 3, 4].map((n) => retryDelayMs(retryMs, n))).toEqual([60_000, 120_000, 240_000, 480_000]);

    // Whole seconds: the table keeps instants to the second.
    const t0 = new Date(Math.floor(Date.now() / 1000) * 1000 - 3_600_000);
    env.sms.failNext(phone, 2);
    await queueText(env.ctx, user, 'comes through on the third try', t0);
    await drainTextQueue(env.ctx, t0);
    const row = () => env.ctx.db.models.FlagText.findOne({ where: { userId: user.id }, order: [['id', 'DESC']] });
    expect(await row()).toMatchObject({ status: 'pending', attempts: 1, nextAttemptAt: new Date(t0.getTime() + 60_000) });
    await drainTextQueue(env.ctx, new Date(t0.getTime() + 59_000));
    expect((await row())!.attempts).toBe(1);
    await drainTextQueue(env.ctx, new Date(t0.getTime() + 60_000));
    expect(await row()).toMatchObject({ status: 'pending', attempts: 2, nextAttemptAt: new Date(t0.getTime() + 180_000) });
    await drainTextQueue(env.ctx, new Date(t0.getTime() + 180_000));
    expect(await row()).toMatchObject({ status: 'sent', attempts: 3 });
    expect(textsTo(phone).map((t) => t.body)).toEqual(['comes through on the third try']);

    env.sms.failNext(phone, 10);
    await queueText(env.ctx, user, 'never comes through', t0);
    let at = t0.getTime();
    for (let attempt = 1; attempt <= 5; attempt++) {
      await drainTextQueue(env.ctx, new Date(at));
      at += retryDelayMs(retryMs, attempt);
    }
    expect(await row()).toMatchObject({ status: 'failed', attempts: 5, nextAttemptAt: null });
    const failures = (await call(manager, 'get', '/api/auth/me/text-failures').expect(200)).body.failures;
    expect(failures).toEqual([expect.objectContaining({ to: phone, body: 'never comes through', attempts: 5, reason: 'Internal Server Error' })]);
    // A refusal that will not pass (a bad request) is not tried again.
    env.sms.failNext(phone, 1, 400);
    await queueText(env.ctx, user, 'refused for good', t0);
    await drainTextQueue(env.ctx, t0);
    expect(await row()).toMatchObject({ status: 'failed', attempts: 1 });
  });

  it('turns texts off for the number when a STOP reply comes through the service, and refuses an unsigned one', async () => {
    const org = await makeOrganisation(env);
    const phone = newMobile();
    const manager = await signedIn(env, org.users.manager.email);
    await call(manager, 'patch', '/api/auth/me', { phone, flagTexts: 'immediate' }).expect(200);
    const user = (await env.ctx.db.models.User.findByPk(org.users.manager.id))!;
    await queueText(env.ctx, user, 'waiting when STOP comes', new Date(Date.now() + 60_000));

    const forged = await fetch(`${env.config.publicUrl}/api/texts/inbound`, { method: 'POST', headers: { 'Content-Type': 'application/x-www-form-urlencoded' }, body: new URLSearchParams({ From: phone, Body: 'STOP' }) });
    expect(forged.status).toBe(403);
    expect((await call(manager, 'get', '/api/auth/me').expect(200)).body.flagTexts).toBe('immediate');

    expect(await env.sms.reply(phone, ' stop ')).toBe(200);
    const me = (await call(manager, 'get', '/api/auth/me').expect(200)).body;
    expect(me).toMatchObject({ phone, flagTexts: 'off' });
    expect(Date.parse(me.textsStoppedAt)).toBeGreaterThan(Date.now() - 60_000);
    expect(await env.ctx.db.models.FlagText.count({ where: { userId: user.id, status: 'pending' } })).toBe(0);
    await coldCultureFlag(org);
    await drainTextQueue(env.ctx);
    expect(textsTo(phone)).toHaveLength(0);
    // Choosing texts again on the Profile starts afresh.
    const again = await call(manager, 'patch', '/api/auth/me', { flagTexts: 'immediate' }).expect(200);
    expect(again.body.textsStoppedAt).toBeNull();
  });
});
