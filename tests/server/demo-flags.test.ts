// Every flag kind arises from the invented demo scenario (samples/demo/scenario.json), reaches the
// people it concerns by mail, and clears when its condition ends. The thresholds themselves are
// rules of thumb (18 °C cold culture, 2 °C frost, quiet hours 23:00–05:00): common practice, no
// published source.
import { randomUUID } from 'node:crypto';
import { afterAll, describe, expect, it } from 'vitest';
import { FLAG_KINDS } from '@shared/schemas';
import { useTestApp } from '../support/db';
import { call, signedIn } from '../support/fixtures';
import { loadDemoScenario, readScenario } from '../../server/services/demo';
import { evaluateInputFlags, evaluateTankFlags } from '../../server/services/flags';
import { sendFlagDigests } from '../../server/services/flag-mail';
import { readOutbox } from '../../server/mail/outbox';
import { waitForMail } from '../support/mail';
import { startFakeWeather } from '../../server/weather/fake';
import { checkAllFarmsFrost } from '../../server/services/frost';

// The fake forecast service answers with the demo's frost tomorrow night.
const weather = await startFakeWeather({ port: 0 });
const env = useTestApp({ WEATHER_URL: weather.url });
afterAll(() => weather.close());
const scenario = readScenario();
const person = (role: string) => scenario.people.find((p) => p.role === role)!;

describe('flags of the demo scenario', () => {
  it('raises every kind, mails each person the kinds of their role, and clears the overfill once the cistern is drawn down', async () => {
    await loadDemoScenario(env.ctx.db, { onlyIfEmpty: true });
    const org = (await env.ctx.db.models.Organisation.findOne({ where: { name: scenario.organisation.name } }))!;
    const farms = await env.ctx.db.models.Farm.findAll({ where: { organisationId: org.id } });
    await evaluateTankFlags(env.ctx, org.id, farms.map((f) => f.id));
    await evaluateInputFlags(env.ctx, org.id, farms.map((f) => f.id));
    await checkAllFarmsFrost(env.ctx);

    const manager = await signedIn(env, person('manager').email, person('manager').password);
    const flags = (await manager.get('/api/flags').expect(200)).body as { id: number; kind: string; subjectName: string; message: string }[];
    const bySubject = (kind: string) => flags.filter((f) => f.kind === kind).map((f) => f.subjectName);
    expect([...new Set(flags.map((f) => f.kind))].sort()).toEqual([...FLAG_KINDS].sort());
    expect(bySubject('cold-culture')).toEqual(['Culture cone B (HR-C2)']);
    expect(bySubject('frost-risk')).toEqual(['Fertigation tote (MF-F1)']);
    expect(bySubject('suspected-leak')).toEqual(['Flats header tank (MF-W1)']);
    // The logger's night: 5 mm a half hour off a drum 1.6 m across and 3.8 m long, roughly 40–80 L/h.
    const leak = flags.find((f) => f.kind === 'suspected-leak')!;
    const rate = Number(/\(([\d.,]+) L\/h\)/.exec(leak.message)![1].replace(/,/g, ''));
    expect(rate).toBeGreaterThan(15);
    expect(rate).toBeLessThan(120);
    expect(bySubject('overfill')).toEqual(['Orchard cistern (SO-W1)']);
    // Hollin Ridge is the one located farm: its water tank and both cultures; the pest-solution tank stands indoors.
    expect(bySubject('frost-ahead').sort()).toEqual(['Culture cone A (HR-C1)', 'Culture cone B (HR-C2)', 'Ridge water tank (HR-W1)'].sort());
    expect(bySubject('stale-tank')).toEqual(['Ball tank by the gate (SO-W2)']);
    expect(bySubject('reorder-due')).toContain('Blackstrap molasses');
    expect(bySubject('low-stock').length).toBeGreaterThan(0);

    // The morning summary, at 08:00 Irish time (GMT in January): managers hear of every kind,
    // buyers of reorders, workers of stale tanks on their farms.
    const sent = await sendFlagDigests(env.ctx, new Date(Date.UTC(2031, 0, 15, 8)));
    expect(sent).toBeGreaterThanOrEqual(2);
    const managerMail = await waitForMail(env.config.outboxDir, person('manager').email);
    for (const kind of ['Running low', 'Time to reorder', 'Possible leak', 'Not read lately', 'Culture too cold', 'Frost risk', 'Above the fill line']) expect(managerMail.text).toContain(`[${kind}]`);
    expect(managerMail.text).toMatch(/residual-current/);
    expect(managerMail.text).toMatch(/backflow/);
    const buyerMail = await waitForMail(env.config.outboxDir, person('buyer').email);
    expect(buyerMail.text).toContain('[Time to reorder]');
    expect(buyerMail.text).not.toContain('[Frost risk]');
    // The demo worker walks Hollin Ridge and Marrow Flats; the stale gate tank is at Saltmeadow, so no mail.
    const worker = person('worker');
    expect(worker.farms).not.toContain('saltmeadow');
    expect((await readOutbox(env.config.outboxDir)).filter((m) => m.to.includes(worker.email))).toHaveLength(0);

    // The cistern is drawn to 1,700 mm, under its 1,900 mm fill line: the overfill flag clears.
    const cistern = (await env.ctx.db.models.Tank.findOne({ where: { organisationId: org.id, code: 'SO-W1' } }))!;
    await call(manager, 'post', '/api/rounds', { farmId: cistern.farmId, entries: [{ tankId: cistern.id, readingMm: 1700, idempotencyKey: randomUUID().replace(/-/g, '') }] }).expect(201);
    await evaluateTankFlags(env.ctx, org.id, [cistern.farmId]);
    const after = (await manager.get('/api/flags').expect(200)).body as { kind: string; subjectName: string }[];
    expect(after.filter((f) => f.kind === 'overfill')).toEqual([]);
    const cleared = (await manager.get('/api/flags?status=cleared').expect(200)).body as { kind: string; subjectName: string }[];
    expect(cleared.map((f) => `${f.kind} ${f.subjectName}`)).toContain('overfill Orchard cistern (SO-W1)');
  });
});
