// Tank labels: GET /api/tanks/:id/label.pdf, GET /api/farms/:id/labels.pdf and the label beside the
// gauge strip. Each PDF is rendered with pdftoppm (poppler-utils) and its QR codes decoded with jsQR,
// so the check is what a phone's camera would read; its words are read back with pdftotext.
//
// Expected capacities are worked by hand for the 1,000 mm × 1,500 mm vertical cylinder of
// tests/support/tanks.ts (outlet 100 mm, safe fill line 1,400 mm): V = π r² h (CRC Standard
// Mathematical Tables, 31st ed., §4.6 "Cylinder"), π · 0.5² · 1.5 m³ = 1.178097 m³ = 1,178 L in all and
// π · 0.5² · 1.3 m³ = 1.021018 m³ = 1,021 L between outlet and line. 1 US gallon = 231 in³ = 3.785411784 L
// (NIST Handbook 44, 2024, Appendix C), so 311.22 gal and 269.72 gal, printed as 311 and 270 gal.
// Page sizes: 1 mm = 72/25.4 pt (ISO 32000-1:2008, §8.3.2.3, and 1 in = 25.4 mm); A4 is 210 × 297 mm
// (ISO 216, recalled from memory of the standard).
import { mkdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { PDFDocument } from 'pdf-lib';
import { CAUTION_SENTENCES } from '@shared/cautions';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn, type Agent } from '../support/fixtures';
import { decodeQr, hasPdftoppm, pdfText, renderPdfPage } from '../support/pdf-qr';
import { makeTank } from '../support/tanks';

const env = useTestApp();
const SHOTS = 'test-results/screenshots';
if (!hasPdftoppm) console.warn('tank-labels tests skipped: pdftoppm (Debian package poppler-utils) is missing; `npm test` installs it');

async function fetchPdf(agent: Agent, url: string, status = 200) {
  return agent
    .get(url)
    .buffer(true)
    .parse((r, done) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => done(null, Buffer.concat(chunks)));
    })
    .expect(status);
}

const roundLink = (tankId: number) => `${env.ctx.config.publicUrl}/round?tank=${tankId}`;
/** Words as pdftotext gives them, with runs of spaces and line breaks made single. */
const flat = (s: string) => s.replace(/\s+/g, ' ');

describe.skipIf(!hasPdftoppm)('tank label PDF', () => {
  it('holds a QR code of the round at that tank, with its code, name, contents, capacities and the confined-space caution', async () => {
    const org = await makeOrganisation(env);
    const tank = await makeTank(env, org, org.farmIds[0], { code: 'WT7', contents: 'water' });
    const worker = await signedIn(env, org.users.worker.email);
    const res = await fetchPdf(worker, `/api/tanks/${tank.id}/label.pdf?unit=metric`);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['content-disposition']).toBe('attachment; filename="WT7-label.pdf"');

    const doc = await PDFDocument.load(res.body);
    expect(doc.getPageCount()).toBe(1);
    const size = doc.getPage(0).getSize();
    expect(size.width).toBeCloseTo((95 * 72) / 25.4, 1);
    expect(size.height).toBeCloseTo((66 * 72) / 25.4, 1);

    mkdirSync(SHOTS, { recursive: true });
    const page = renderPdfPage(res.body, 1, 300, `${SHOTS}/tank-label.png`);
    expect(decodeQr(page)).toBe(roundLink(tank.id));

    const words = flat(pdfText(res.body));
    expect(words).toContain('WT7');
    expect(words).toContain('Tank WT7');
    expect(words).toContain('Holds: Water');
    expect(words).toContain('Capacity: 1,178 L');
    expect(words).toContain('Usable: 1,021 L');
    for (const sentence of CAUTION_SENTENCES['confined-space']) expect(words).toContain(sentence);
  });

  it('gives capacities in US gallons when unit=us', async () => {
    const org = await makeOrganisation(env);
    const tank = await makeTank(env, org, org.farmIds[0], { code: 'US1' });
    const manager = await signedIn(env, org.users.manager.email);
    const words = flat(pdfText((await fetchPdf(manager, `/api/tanks/${tank.id}/label.pdf?unit=us`)).body));
    expect(words).toContain('Capacity: 311 gal');
    expect(words).toContain('Usable: 270 gal');
  });

  it('refuses an unknown unit naming the field, and a tank on a farm the worker is not given', async () => {
    const org = await makeOrganisation(env);
    const own = await makeTank(env, org, org.farmIds[0], { code: 'OWN' });
    const other = await makeTank(env, org, org.farmIds[1], { code: 'OTH' });
    const worker = await signedIn(env, org.users.worker.email);
    const bad = await call(worker, 'get', `/api/tanks/${own.id}/label.pdf?unit=imperial`).expect(400);
    expect(bad.body.error.field).toBe('unit');
    await call(worker, 'get', `/api/tanks/${other.id}/label.pdf`).expect(403);
  });
});

describe.skipIf(!hasPdftoppm)('farm label sheet PDF', () => {
  /** Cell (column, row) of the A4 grid, worked by hand: 2 × 95 mm across and 4 × 66 mm down, centred, so 10 mm in from the sides and 16.5 mm from top and bottom. */
  const cell = (i: number) => ({ xMm: 10 + (i % 2) * 95, yMm: 297 - 16.5 - (Math.floor(i / 2) + 1) * 66, widthMm: 95, heightMm: 66 });

  it('puts every active tank of the farm in walking order on A4 sheets of eight, each QR naming its own tank', async () => {
    const org = await makeOrganisation(env);
    const farmId = org.farmIds[0];
    const tanks = [];
    for (let i = 0; i < 9; i++) {
      const t = await makeTank(env, org, farmId, { code: `L${i}` });
      // Walking order the reverse of creation, so the sheet cannot be in id order by chance.
      await t.update({ walkOrder: 9 - i });
      tanks.push(t);
    }
    const archived = await makeTank(env, org, farmId, { code: 'OLD' });
    await archived.update({ archivedAt: new Date() });
    await makeTank(env, org, org.farmIds[1], { code: 'ELSE' });
    const inWalkOrder = [...tanks].reverse();

    const buyer = await signedIn(env, org.users.buyer.email);
    const res = await fetchPdf(buyer, `/api/farms/${farmId}/labels.pdf?paper=a4&unit=metric`);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="farm-1-[0-9a-f]{8}-tank-labels\.pdf"$/);
    const doc = await PDFDocument.load(res.body);
    expect(doc.getPageCount()).toBe(2);
    expect(doc.getPage(0).getSize().width).toBeCloseTo((210 * 72) / 25.4, 1);
    expect(doc.getPage(0).getSize().height).toBeCloseTo((297 * 72) / 25.4, 1);

    mkdirSync(SHOTS, { recursive: true });
    const first = renderPdfPage(res.body, 1, 150, `${SHOTS}/farm-label-sheet.png`);
    const second = renderPdfPage(res.body, 2, 150);
    const found = [...Array.from({ length: 8 }, (_, i) => decodeQr(first, cell(i))), ...Array.from({ length: 8 }, (_, i) => decodeQr(second, cell(i)))];
    expect(found).toEqual([...inWalkOrder.map((t) => roundLink(t.id)), ...Array(7).fill(null)]);

    const words = flat(pdfText(res.body));
    expect(words).not.toContain('OLD');
    expect(words).not.toContain('ELSE');
    expect(words).toContain('sheet 2 of 2');
  });

  it('answers 422 naming the farm when it has no active tank, and 403 for a farm the worker is not given', async () => {
    const org = await makeOrganisation(env);
    const owner = await signedIn(env, org.users.owner.email);
    const empty = await call(owner, 'get', `/api/farms/${org.farmIds[0]}/labels.pdf`).expect(422);
    expect(empty.body.error.code).toBe('no_tanks');
    expect(empty.body.error.message).toContain('Farm 1');
    const worker = await signedIn(env, org.users.worker.email);
    await call(worker, 'get', `/api/farms/${org.farmIds[1]}/labels.pdf`).expect(403);
  });
});

describe.skipIf(!hasPdftoppm)('gauge strip with its label', () => {
  it('draws the label on the strip’s first page when label=true, its QR naming the tank', async () => {
    const org = await makeOrganisation(env);
    const tank = await makeTank(env, org, org.farmIds[0], { code: 'GS2' });
    const manager = await signedIn(env, org.users.manager.email);
    const plain = await fetchPdf(manager, `/api/tanks/${tank.id}/gauge-strip.pdf?every=50&unit=metric&paper=a4`);
    const withLabel = await fetchPdf(manager, `/api/tanks/${tank.id}/gauge-strip.pdf?every=50&unit=metric&paper=a4&label=true`);
    expect(withLabel.headers['content-disposition']).toBe('attachment; filename="GS2-gauge-strip-and-label.pdf"');
    const pages = (await PDFDocument.load(plain.body)).getPageCount();
    expect((await PDFDocument.load(withLabel.body)).getPageCount()).toBe(pages);

    expect(decodeQr(renderPdfPage(plain.body, 1))).toBeNull();
    mkdirSync(SHOTS, { recursive: true });
    expect(decodeQr(renderPdfPage(withLabel.body, 1, 150, `${SHOTS}/gauge-strip-with-label.png`))).toBe(roundLink(tank.id));
  });

  it('refuses label=yes naming the field', async () => {
    const org = await makeOrganisation(env);
    const tank = await makeTank(env, org, org.farmIds[0], { code: 'GS3' });
    const manager = await signedIn(env, org.users.manager.email);
    const res = await call(manager, 'get', `/api/tanks/${tank.id}/gauge-strip.pdf?label=yes`).expect(400);
    expect(res.body.error.field).toBe('label');
  });
});
