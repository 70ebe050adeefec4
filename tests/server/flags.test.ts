import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn, type Agent } from '../support/fixtures';
import { makeTank } from '../support/tanks';
import { makeInput } from '../support/inventory';
import { attachFlagRules, evaluateInputFlags, evaluateTankFlags } from '../../server/services/flags';
import { sendFlagDigests } from '../../server/services/flag-mail';
import { readOutbox } from '../../server/mail/outbox';
import { waitForMail } from '../support/mail';

const env = useTestApp();
let stop: () => void;
beforeAll(() => {
  stop = attachFlagRules(env.ctx, { delayMs: 0, firstSweepMs: null });
});
afterAll(() => stop());

const key = () => randomUUID().replace(/-/g, '');
async function until<T>(get: () => Promise<T>, ok: (v: T) => boolean, ms = 4000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await get();
    if (ok(v)) return v;
    if (Date.now() > end) throw new Error(`condition not met: ${JSON.stringify(v)}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}
const flagsOf = (agent: Agent, q = '') => async () => (await agent.get(`/api/flags${q}`).expect(200)).body as { id: number; kind: string; status: string; subjectId: number; message: string }[];

describe('flag rules', () => {
  it('raises one cold-culture flag, keeps it deduplicated, and clears it when the culture warms', async () => {
    const org = await makeOrganisation(env);
    const cone = await makeTank(env, org, org.farmIds[0], { code: 'C1', contents: 'culture', lowStockL: 0 });
    const worker = await signedIn(env, org.users.worker.email);
    const round = (temperatureC: number, minutesAgo: number) =>
      call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], takenAt: new Date(Date.now() - minutesAgo * 60_000).toISOString(), entries: [{ tankId: cone.id, readingMm: 800, temperatureC, idempotencyKey: key() }] }).expect(201);
    await round(16.5, 30);
    const raised = await until(flagsOf(worker), (f) => f.some((x) => x.kind === 'cold-culture'));
    expect(raised.filter((f) => f.kind === 'cold-culture')).toHaveLength(1);
    expect(raised[0].message).toMatch(/16\.5 °C, under 18 °C/);
    await round(15, 20);
    await new Promise((r) => setTimeout(r, 300));
    expect((await flagsOf(worker)()).filter((f) => f.kind === 'cold-culture')).toHaveLength(1);

    const ack = await call(worker, 'post', `/api/flags/${raised[0].id}/acknowledge`, { note: 'heater reset' }).expect(200);
    expect(ack.body).toMatchObject({ status: 'acknowledged', ackNote: 'heater reset' });

    await round(19, 10);
    await until(flagsOf(worker), (f) => !f.some((x) => x.kind === 'cold-culture'));
    const history = await flagsOf(worker, '?status=cleared')();
    expect(history.map((f) => f.kind)).toContain('cold-culture');
    await call(worker, 'post', `/api/flags/${raised[0].id}/acknowledge`, { note: 'late' }).expect(409);
  });

  it('raises frost risk for water at 2 °C, low stock and overfill from one reading each', async () => {
    const org = await makeOrganisation(env);
    const tank = await makeTank(env, org, org.farmIds[0], { code: 'W1', lowStockL: 300 });
    const manager = await signedIn(env, org.users.manager.email);
    // 300 mm tube reading = 200 mm above the outlet = 157 L usable, under 300 L.
    await call(manager, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: tank.id, readingMm: 300, temperatureC: 2, idempotencyKey: key() }] }).expect(201);
    // The rules run just after the commit; wait for them to settle, then check the exact set.
    const kinds = (f: { kind: string }[]) => f.map((x) => x.kind).sort().join(',');
    await until(flagsOf(manager), (f) => kinds(f) === 'frost-risk,low-stock');
    // Safe fill at 1,400 mm; 1,450 mm is above it.
    await call(manager, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: tank.id, readingMm: 1450, temperatureC: 8, idempotencyKey: key() }] }).expect(201);
    await until(flagsOf(manager), (f) => kinds(f) === 'overfill');
    const cleared = await flagsOf(manager, '?status=cleared')();
    expect(cleared.map((f) => f.kind).sort()).toEqual(['frost-risk', 'low-stock']);
  });

  it('reads a temperature logged on a working brew as its tank\'s: cold culture, then frost risk, cleared when the brew ends', async () => {
    const org = await makeOrganisation(env);
    const cone = await makeTank(env, org, org.farmIds[0], { code: 'B1', contents: 'culture', lowStockL: 0 });
    const worker = await signedIn(env, org.users.worker.email);
    const brew = (await call(worker, 'post', '/api/brews', { tankId: cone.id, kind: 'culture', name: 'Starter', waterL: 150, startedAt: new Date(Date.now() - 7_200_000).toISOString() }).expect(201)).body;
    const coneFlags = async () => (await flagsOf(worker)()).filter((f) => f.subjectId === cone.id).map((f) => f.kind).sort().join(',');
    // No level reading yet: the brew's own log is all the rules know of the tank.
    await call(worker, 'post', `/api/brews/${brew.id}/temperatures`, { temperatureC: 17.9 }).expect(201);
    await until(coneFlags, (k) => k === 'cold-culture');
    // A round reading taken earlier than the brew's log does not override it …
    await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], takenAt: new Date(Date.now() - 3_600_000).toISOString(), entries: [{ tankId: cone.id, readingMm: 800, temperatureC: 21, idempotencyKey: key() }] }).expect(201);
    await new Promise((r) => setTimeout(r, 300));
    expect(await coneFlags()).toBe('cold-culture');
    // … a newer brew temperature at the frost line does.
    await call(worker, 'post', `/api/brews/${brew.id}/temperatures`, { temperatureC: 2 }).expect(201);
    await until(coneFlags, (k) => k === 'frost-risk');
    // Once the brew is used up its log stops speaking for the tank; the round reading (21 °C) holds.
    await call(worker, 'patch', `/api/brews/${brew.id}`, { status: 'used-up' }).expect(200);
    await until(coneFlags, (k) => k === '');
  });

  it('keeps frost-risk and cold-culture open through a level-only round; only a temperature reading clears them', async () => {
    const org = await makeOrganisation(env);
    const farmId = org.farmIds[0];
    const tote = await makeTank(env, org, farmId, { code: 'F1', contents: 'fertilizer', lowStockL: 0 });
    const cone = await makeTank(env, org, farmId, { code: 'C2', contents: 'culture', lowStockL: 0 });
    const worker = await signedIn(env, org.users.worker.email);
    const round = (minutesAgo: number, temperatures: { tote?: number; cone?: number }) =>
      call(worker, 'post', '/api/rounds', {
        farmId, takenAt: new Date(Date.now() - minutesAgo * 60_000).toISOString(),
        entries: [
          { tankId: tote.id, readingMm: 700, ...(temperatures.tote === undefined ? {} : { temperatureC: temperatures.tote }), idempotencyKey: key() },
          { tankId: cone.id, readingMm: 800, ...(temperatures.cone === undefined ? {} : { temperatureC: temperatures.cone }), idempotencyKey: key() },
        ],
      }).expect(201);
    const open = async () => (await flagsOf(worker)()).filter((f) => f.kind === 'frost-risk' || f.kind === 'cold-culture').map((f) => `${f.kind}@${f.subjectId}`).sort().join(',');
    const both = [`cold-culture@${cone.id}`, `frost-risk@${tote.id}`].sort().join(',');
    await round(30, { tote: 1.5, cone: 12 });
    await until(open, (k) => k === both);

    // Levels only: the rules know nothing new of either temperature.
    await round(20, {});
    await new Promise((r) => setTimeout(r, 300));
    await evaluateTankFlags(env.ctx, org.organisationId, [farmId]);
    expect(await open()).toBe(both);

    await round(10, { tote: 9, cone: 21 });
    await until(open, (k) => k === '');
    const cleared = await flagsOf(worker, '?status=cleared')();
    expect(cleared.filter((f) => f.kind === 'frost-risk' || f.kind === 'cold-culture')).toHaveLength(2);
  });

  it('lets a manager clear a temperature flag by hand with a note, and raises it again only on a cold reading taken after that', async () => {
    const org = await makeOrganisation(env);
    const farmId = org.farmIds[0];
    const tank = await makeTank(env, org, farmId, { code: 'W9', lowStockL: 300 });
    const manager = await signedIn(env, org.users.manager.email);
    const worker = await signedIn(env, org.users.worker.email);
    const round = (minutesAgo: number, temperatureC: number) =>
      call(worker, 'post', '/api/rounds', { farmId, takenAt: new Date(Date.now() - minutesAgo * 60_000).toISOString(), entries: [{ tankId: tank.id, readingMm: 300, temperatureC, idempotencyKey: key() }] }).expect(201);
    await round(30, 1);
    const flags = await until(flagsOf(manager), (f) => f.some((x) => x.kind === 'frost-risk') && f.some((x) => x.kind === 'low-stock'));
    const frost = flags.find((f) => f.kind === 'frost-risk')!;
    const low = flags.find((f) => f.kind === 'low-stock')!;

    await call(worker, 'post', `/api/flags/${frost.id}/clear`, { note: 'drained it' }).expect(403);
    const noNote = await call(manager, 'post', `/api/flags/${frost.id}/clear`, {}).expect(400);
    expect(noNote.body.error.field).toBe('note');
    await call(manager, 'post', `/api/flags/${frost.id}/clear`, { note: ' ' }).expect(400);
    // Stock flags end with the stock, never by hand.
    const lowRefused = await call(manager, 'post', `/api/flags/${low.id}/clear`, { note: 'topped up' }).expect(409);
    expect(lowRefused.body.error.code).toBe('flag_not_clearable');

    const done = await call(manager, 'post', `/api/flags/${frost.id}/clear`, { note: 'Thermometer was in the sun-shade box; tank drained' }).expect(200);
    expect(done.body).toMatchObject({ status: 'cleared', clearNote: 'Thermometer was in the sun-shade box; tank drained', clearedBy: expect.any(String) });
    expect(done.body.clearedAt).not.toBeNull();
    await call(manager, 'post', `/api/flags/${frost.id}/clear`, { note: 'again' }).expect(409);

    // The same reading does not raise it again …
    await evaluateTankFlags(env.ctx, org.organisationId, [farmId]);
    expect((await flagsOf(manager)()).some((f) => f.kind === 'frost-risk')).toBe(false);
    // … one taken after the clearing does.
    await round(0, 0.5);
    await until(flagsOf(manager), (f) => f.some((x) => x.kind === 'frost-risk' && x.id !== frost.id));
  });

  it('raises a stale-tank flag for a reading older than the farm setting', async () => {
    const org = await makeOrganisation(env);
    const tank = await makeTank(env, org, org.farmIds[0], { code: 'S1', lowStockL: 0 });
    const manager = await signedIn(env, org.users.manager.email);
    await call(manager, 'post', '/api/rounds', { farmId: org.farmIds[0], takenAt: new Date(Date.now() - 4 * 86_400_000).toISOString(), entries: [{ tankId: tank.id, readingMm: 700, idempotencyKey: key() }] }).expect(201);
    await evaluateTankFlags(env.ctx, org.organisationId, [org.farmIds[0]]);
    const flags = await until(flagsOf(manager), (f) => f.some((x) => x.kind === 'stale-tank'));
    expect(flags.find((f) => f.kind === 'stale-tank')!.message).toMatch(/not been read for 4 days/);
    await call(manager, 'patch', `/api/farms/${org.farmIds[0]}`, { staleAfterDays: 7 }).expect(200);
    await evaluateTankFlags(env.ctx, org.organisationId, [org.farmIds[0]]);
    expect((await flagsOf(manager)()).some((f) => f.kind === 'stale-tank')).toBe(false);
  });

  it('raises reorder-due when use takes an input to its reorder point; buyers acknowledge it, not tank flags', async () => {
    const org = await makeOrganisation(env);
    const { input } = await makeInput(env, org, org.farmIds[0], { onHand: 40, usePerDay: 4, days: 30 });
    const buyer = await signedIn(env, org.users.buyer.email);
    await call(buyer, 'post', `/api/inputs/${input.id}/movements`, { kind: 'use', quantity: 30 }).expect(201);
    const flags = await until(flagsOf(buyer), (f) => f.some((x) => x.kind === 'reorder-due'));
    const due = flags.find((f) => f.kind === 'reorder-due')!;
    expect(due.subjectId).toBe(input.id);
    await call(buyer, 'post', `/api/flags/${due.id}/acknowledge`, { note: 'order drafted' }).expect(200);
  });
});

describe('flag mail', () => {
  it('mails a new flag at once to those who chose it, only for kinds of their role', async () => {
    const org = await makeOrganisation(env);
    const cone = await makeTank(env, org, org.farmIds[0], { code: 'M1', contents: 'culture', lowStockL: 0 });
    const manager = await signedIn(env, org.users.manager.email);
    const worker = await signedIn(env, org.users.worker.email);
    await call(manager, 'patch', '/api/auth/me', { flagMail: 'immediate' }).expect(200);
    await call(worker, 'patch', '/api/auth/me', { flagMail: 'immediate' }).expect(200);
    await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: cone.id, readingMm: 800, temperatureC: 12, idempotencyKey: key() }] }).expect(201);
    const mail = await waitForMail(env.config.outboxDir, org.users.manager.email);
    expect(mail.subject).toMatch(/Culture too cold/);
    expect(mail.text).toMatch(/residual-current/);
    // Workers hear only of stale tanks.
    expect((await readOutbox(env.config.outboxDir)).some((m) => m.to.includes(org.users.worker.email))).toBe(false);
  });

  it('sends one daily summary per person from the local digest hour, and not again that day', async () => {
    const org = await makeOrganisation(env);
    const { input } = await makeInput(env, org, org.farmIds[0], { onHand: 5, usePerDay: 4, days: 30 });
    await evaluateInputFlags(env.ctx, org.organisationId, [org.farmIds[0]]);
    const buyerMails = async () => (await readOutbox(env.config.outboxDir)).filter((m) => m.to.includes(org.users.buyer.email)).length;
    // The farms keep Europe/Dublin time: 05:30 UTC on 10 June is 06:30 there, before the 07:00 digest hour.
    expect(env.ctx.config.flagDigestHour).toBe(7);
    await sendFlagDigests(env.ctx, new Date('2030-06-10T05:30:00Z'));
    expect(await buyerMails()).toBe(0);
    await sendFlagDigests(env.ctx, new Date('2030-06-10T06:10:00Z'));
    const mail = await waitForMail(env.config.outboxDir, org.users.buyer.email);
    expect(mail.subject).toMatch(/daily summary: 1 flag needs a look/);
    expect(mail.text).toContain(input.name);
    // Later the same local day: nothing more; the next local morning: the next summary.
    await sendFlagDigests(env.ctx, new Date('2030-06-10T21:00:00Z'));
    await sendFlagDigests(env.ctx, new Date('2030-06-11T05:59:00Z'));
    expect(await buyerMails()).toBe(1);
    await sendFlagDigests(env.ctx, new Date('2030-06-11T06:00:00Z'));
    await expect.poll(buyerMails).toBe(2);
  });
});
