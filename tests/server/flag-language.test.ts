// Flag texts and mails in the language of the person who gets them (issue #13: "in the person's
// language"), the link to the tank kept whole; PDFs in the language of the person who prints them.
import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { cautionSentences } from '@shared/cautions';
import { flagCautionText } from '@shared/flags';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn, type Agent, type OrgFixture } from '../support/fixtures';
import { waitForMail } from '../support/mail';
import { hasPdftoppm, pdfText } from '../support/pdf-qr';
import { makeTank } from '../support/tanks';
import { evaluateTankFlags } from '../../server/services/flags';
import { drainTextQueue } from '../../server/services/flag-texts';
import { readFakeTexts } from '../../server/sms/outbox';

const env = useTestApp();
let next = 300;
// Invented mobile numbers from the Australian range kept for drama (ACMA, recalled from memory).
const newMobile = () => `+61491570${String(next++).padStart(3, '0')}`;
const flat = (s: string) => s.replace(/\s+/g, ' ');

async function coldCulture(org: OrgFixture) {
  const cone = await makeTank(env, org, org.farmIds[0], { code: `L${next++}`, contents: 'culture', lowStockL: 0 });
  const worker = await signedIn(env, org.users.worker.email);
  await call(worker, 'post', '/api/rounds', { farmId: org.farmIds[0], entries: [{ tankId: cone.id, readingMm: 800, temperatureC: 12, idempotencyKey: randomUUID().replace(/-/g, '') }] }).expect(201);
  await evaluateTankFlags(env.ctx, org.organisationId, [org.farmIds[0]]);
  return cone;
}

async function fetchPdf(agent: Agent, url: string) {
  const res = await agent
    .get(url)
    .buffer(true)
    .parse((r, done) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => done(null, Buffer.concat(chunks)));
    })
    .expect(200);
  return res.body as Buffer;
}

describe('flags in the language of the person who hears of them', () => {
  it('texts and mails a Spanish-speaking manager in Spanish, the link to the tank kept, and an English one in English', async () => {
    const org = await makeOrganisation(env);
    const [spanishPhone, englishPhone] = [newMobile(), newMobile()];
    const manager = await signedIn(env, org.users.manager.email);
    await call(manager, 'patch', '/api/auth/me', { language: 'es', phone: spanishPhone, flagTexts: 'immediate', flagMail: 'immediate' }).expect(200);
    const owner = await signedIn(env, org.users.owner.email);
    await call(owner, 'patch', '/api/auth/me', { language: 'en', phone: englishPhone, flagTexts: 'immediate' }).expect(200);

    const cone = await coldCulture(org);
    await drainTextQueue(env.ctx);

    const texts = readFakeTexts(env.config.outboxDir);
    const [spanish] = texts.filter((t) => t.to === spanishPhone);
    // Accents the GSM alphabet lacks are dropped (frío → frio) so the text stays one segment.
    expect(spanish.body).toMatch(new RegExp(`^Brimstock Cultivo demasiado frio, Farm 1 \\S+: Tank ${cone.code} esta a 12 °C, por debajo de 18 °C`));
    expect(spanish.body.endsWith(` ${env.config.publicUrl}/tanks/${cone.id}`)).toBe(true);
    expect(spanish.body.length).toBeLessThanOrEqual(160);
    const [english] = texts.filter((t) => t.to === englishPhone);
    expect(english.body).toMatch(/^Brimstock Culture too cold, Farm 1 /);
    expect(english.body).toContain('is at 12 °C, under 18 °C');

    const mail = await waitForMail(env.config.outboxDir, org.users.manager.email);
    expect(mail.subject).toBe(`Brimstock: Cultivo demasiado frío — Tank ${cone.code} está a 12 °C, por debajo de 18 °C: el cultivo se frena o se detiene`);
    expect(mail.text).toContain(`Precaución: ${flagCautionText('cold-culture', 'es')}`);
    expect(mail.text).toContain(`Véalos y confírmelos: ${env.config.publicUrl}/flags`);
    expect(mail.text).toContain('Las precauciones remiten a la normativa local');
    expect(mail.text).not.toMatch(/\b(Caution|See and acknowledge|under)\b/);
  });
});

describe.skipIf(!hasPdftoppm)('printed PDFs in the language of the person who prints them', () => {
  it('prints the tank label in French with the French confined-space caution, accents and French figures', async () => {
    const org = await makeOrganisation(env);
    const tank = await makeTank(env, org, org.farmIds[0], { code: 'FR1', contents: 'water' });
    const worker = await signedIn(env, org.users.worker.email);
    await call(worker, 'patch', '/api/auth/me', { language: 'fr' }).expect(200);

    const words = flat(pdfText(await fetchPdf(worker, `/api/tanks/${tank.id}/label.pdf?unit=metric`)));
    expect(words).toContain('Contient : Eau');
    // 1,178 L and 1,021 L as tests/server/tank-labels.test.ts works them out; French groups thousands with a space.
    expect(words).toContain('Capacité : 1 178 L');
    expect(words).toContain('Utile : 1 021 L (de la sortie au niveau de remplissage maximal)');
    expect(words).toContain('Attention — espace confiné');
    for (const sentence of cautionSentences('confined-space', 'fr')) expect(words).toContain(sentence);
    // Every accented letter printed (Helvetica's WinAnsi has them); an unprintable one would show as "?".
    expect(words.replace(/\S+\/round\?tank=\d+/, '')).not.toContain('?');
    expect(words).not.toMatch(/\b(Holds|Capacity|Caution|confined)\b/);
  });

  it('prints the gauge strip and the farm sheet in Spanish', async () => {
    const org = await makeOrganisation(env);
    const tank = await makeTank(env, org, org.farmIds[0], { code: 'ES1', contents: 'fertilizer' });
    const manager = await signedIn(env, org.users.manager.email);
    await call(manager, 'patch', '/api/auth/me', { language: 'es' }).expect(200);

    const strip = flat(pdfText(await fetchPdf(manager, `/api/tanks/${tank.id}/gauge-strip.pdf?unit=metric&label=true`)));
    expect(strip).toContain('Imprima al 100 % / tamaño real');
    expect(strip).toContain('Contenido: Fertilizante.');
    expect(strip).toContain(cautionSentences('confined-space', 'es').slice(0, 3).join(' '));
    expect(strip).toContain('Contiene: Fertilizante');
    // The 1,500 mm tank takes several A4 pages, joined where the strip says.
    expect(strip).toContain('Unión 1: corte aquí — la página 2 sigue desde aquí');
    expect(strip).toContain('Unión 1: ponga aquí el borde superior recortado de la página 1');
    const sheet = flat(pdfText(await fetchPdf(manager, `/api/farms/${org.farmIds[0]}/labels.pdf?unit=metric`)));
    expect(sheet).toContain('etiquetas de tanques · hoja 1 de 1 · recorte por las líneas discontinuas');
    expect(sheet).toContain('Un tanque es un espacio confinado.');
  });
});
