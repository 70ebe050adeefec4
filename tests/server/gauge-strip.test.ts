// GET /api/tanks/:id/gauge-strip.pdf: the PDF itself is read back and its tick lines measured.
//
// PDF user space is 1/72 in per unit (ISO 32000-1:2008, §8.3.2.3; also stated by PDF library
// references such as the PDF XChange SDK's "UserUnit": "default user space units … 1/72 inch") and
// 1 in = 25.4 mm exactly (NIST Handbook 44, Appendix C), so 1 mm = 72/25.4 pt. A4 is 210 × 297 mm
// (ISO 216; recalled from memory of the standard) = 595.28 × 841.89 pt to 2 decimals (hand derivation);
// US Letter is 8.5 × 11 in (ANSI/ASME Y14.1, recalled from memory) = 612 × 792 pt exactly.
//
// pdf-lib 1.17.1 Flate-compresses page content by default (PDFContentStream's `encode` defaults to
// true), so the test decodes each content stream with pdf-lib's own decoder before reading it.
import { describe, expect, it } from 'vitest';
import { decodePDFRawStream, PDFArray, PDFDocument, PDFRawStream, type PDFPage } from 'pdf-lib';
import { gaugePage, gaugeStripLayout, suggestGaugeStep, type GaugeStripLayout } from '@shared/gauge';
import type { TankGeometry } from '@shared/calibration';
import { CAUTION_SENTENCES } from '@shared/cautions';
import { GAUGE_DRAWING } from '../../server/services/gauge-strip';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn, type Agent } from '../support/fixtures';

const env = useTestApp();
const PT_PER_MM = 72 / 25.4;
const HORIZONTAL: TankGeometry = { shape: 'horizontal-cylinder', diameterMm: 1200, lengthMm: 2000, ends: 'ellipsoidal-2to1' };

interface Segment {
  x1: number;
  y1: number;
  x2: number;
  y2: number;
  widthPt: number;
}

/** The decoded content of a page: every stroked m/l segment with its line width, and every shown string. */
function readPage(doc: PDFDocument, page: PDFPage): { segments: Segment[]; text: string[] } {
  const contents = page.node.Contents();
  const streams = contents instanceof PDFArray ? contents.asArray().map((ref) => doc.context.lookup(ref)) : [contents];
  let source = '';
  for (const s of streams) {
    if (!(s instanceof PDFRawStream)) throw new Error('expected a raw content stream');
    source += Buffer.from(decodePDFRawStream(s).decode()).toString('latin1') + '\n';
  }
  const tokens = source.match(/<[0-9A-Fa-f]*>|\/[^\s/<>[\]()]+|\[|\]|[-+]?(?:\d+\.?\d*|\.\d+)|[A-Za-z*'"]+/g) ?? [];
  const segments: Segment[] = [];
  const text: string[] = [];
  const widths: number[] = [];
  let width = 1;
  let at: [number, number] | null = null;
  let operands: string[] = [];
  for (const tok of tokens) {
    if (/^[-+.\d]/.test(tok) || tok.startsWith('<') || tok.startsWith('/') || tok === '[' || tok === ']') {
      operands.push(tok);
      continue;
    }
    const n = operands.map(Number);
    if (tok === 'q') widths.push(width);
    else if (tok === 'Q') width = widths.pop() ?? 1;
    else if (tok === 'w') width = n[0];
    else if (tok === 'm') at = [n[0], n[1]];
    else if (tok === 'l' && at) {
      segments.push({ x1: at[0], y1: at[1], x2: n[0], y2: n[1], widthPt: width });
      at = [n[0], n[1]];
    } else if (tok === 'Tj') text.push(winAnsi(Buffer.from(operands[0].slice(1, -1), 'hex')));
    operands = [];
  }
  return { segments, text };
}

// Helvetica's strings are WinAnsi (Windows-1252) codes: Latin-1 but for 0x80–0x9F, of which the strip
// prints the en and em dash, the bullet and the ellipsis (PDF 32000-1:2008, Annex D.2; Node's
// TextDecoder maps these bytes to C1 controls instead).
const WIN_ANSI_C1: Record<number, string> = { 0x85: '…', 0x95: '•', 0x96: '–', 0x97: '—' };
function winAnsi(bytes: Buffer): string {
  return [...bytes].map((b) => WIN_ANSI_C1[b] ?? String.fromCharCode(b)).join('');
}

async function fetchPdf(agent: Agent, url: string) {
  const res = await agent
    .get(url)
    .buffer(true)
    .parse((r, done) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => done(null, Buffer.concat(chunks)));
    });
  return res;
}

async function tankOnNewOrg(overrides: Record<string, unknown> = {}) {
  const org = await makeOrganisation(env);
  const manager = await signedIn(env, org.users.manager.email);
  const created = await call(manager, 'post', '/api/tanks', {
    farmId: org.farmIds[0],
    name: 'North paddock side tank',
    code: 'SF3',
    contents: 'fertilizer',
    contentsNote: 'Seaweed brew',
    geometry: HORIZONTAL,
    datumOffsetMm: 35,
    ...overrides,
  }).expect(201);
  return { org, manager, tankId: created.body.id as number };
}

/** The volume ticks the PDF draws on a page: horizontal segments from the strip's left edge, major or minor length. */
function ticksOf(segments: Segment[], layout: GaugeStripLayout) {
  const x0 = layout.page.marginMm * PT_PER_MM;
  const out: { yPt: number; major: boolean }[] = [];
  for (const s of segments) {
    if (Math.abs(s.x1 - x0) > 1e-6 || s.y1 !== s.y2) continue;
    const lengthMm = (s.x2 - s.x1) / PT_PER_MM;
    if (Math.abs(lengthMm - GAUGE_DRAWING.majorTickMm) < 1e-6 && Math.abs(s.widthPt - GAUGE_DRAWING.majorTickThicknessMm * PT_PER_MM) < 1e-6) out.push({ yPt: s.y1, major: true });
    else if (Math.abs(lengthMm - GAUGE_DRAWING.minorTickMm) < 1e-6 && Math.abs(s.widthPt - GAUGE_DRAWING.minorTickThicknessMm * PT_PER_MM) < 1e-6) out.push({ yPt: s.y1, major: false });
  }
  return out.sort((a, b) => a.yPt - b.yPt);
}

/** Checks every page of the PDF against the layout: tick tube positions to 0.01 mm, major flags, page labels. */
async function expectPdfMatchesLayout(body: Buffer, layout: GaugeStripLayout, sizePt: [number, number], checkBarMm: number) {
  const doc = await PDFDocument.load(body);
  const pages = doc.getPages();
  expect(pages).toHaveLength(layout.totalPages);
  let ticksSeen = 0;
  pages.forEach((page, i) => {
    expect(page.getSize()).toEqual({ width: sizePt[0], height: sizePt[1] });
    const { segments, text } = readPage(doc, page);
    const lp = layout.pages[i];
    const drawn = ticksOf(segments, layout);
    expect(drawn).toHaveLength(lp.ticks.length);
    drawn.forEach((d, k) => {
      // Tube position 0 of page i sits at the lowest point of its strip area, stripBottomMm above the paper's edge.
      const positionMm = d.yPt / PT_PER_MM - layout.stripBottomMm + lp.fromMm;
      expect(Math.abs(positionMm - lp.ticks[k].positionMm), `page ${i + 1} tick ${k}`).toBeLessThan(0.01);
      expect(d.major).toBe(lp.ticks[k].major);
    });
    ticksSeen += drawn.length;

    const bars = segments.filter((s) => Math.abs(s.widthPt - GAUGE_DRAWING.checkBarThicknessMm * PT_PER_MM) < 1e-9);
    expect(bars).toHaveLength(2);
    for (const b of bars) expect(Math.abs(Math.hypot(b.x2 - b.x1, b.y2 - b.y1) / PT_PER_MM - checkBarMm)).toBeLessThan(0.01);
    expect(bars.filter((b) => b.y1 === b.y2)).toHaveLength(1);
    expect(bars.filter((b) => b.x1 === b.x2)).toHaveLength(1);

    const all = text.join('\n');
    expect(all).toContain(`Page ${i + 1} of ${layout.totalPages}`);
    expect(all).toContain('Print at 100 % / actual size — do not scale to fit.');
    // The caution in the words of shared/cautions: three sentences in the header, two along the strip.
    expect(all).toContain(CAUTION_SENTENCES['confined-space'].slice(0, 3).join(' '));
    for (const t of lp.ticks.filter((x) => x.labelShown)) expect(text).toContain(t.label);
    if (i < layout.totalPages - 1) expect(all).toContain(`cut here — page ${i + 2} continues here`);
    if (i > 0) expect(all).toContain(`lay the cut top edge of page ${i} on this line`);
  });
  expect(ticksSeen).toBe(layout.tickCount);
  return doc;
}

describe('GET /api/tanks/:id/gauge-strip.pdf', () => {
  it('draws every tick at its computed tube position on true-size A4 pages when asked for 50 L marks', async () => {
    const { manager, tankId } = await tankOnNewOrg();
    const res = await fetchPdf(manager, `/api/tanks/${tankId}/gauge-strip.pdf?every=50&unit=metric&paper=a4`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['content-disposition']).toBe('attachment; filename="SF3-gauge-strip.pdf"');
    const layout = gaugeStripLayout({ geometry: HORIZONTAL, datumOffsetMm: 35, everyVolume: { value: 50, unit: 'L' }, unitSystem: 'metric', page: gaugePage('a4') });
    expect(layout.totalPages).toBeGreaterThan(2);
    const doc = await expectPdfMatchesLayout(res.body as Buffer, layout, [595.28, 841.89], 100);
    expect(doc.getTitle()).toBe('North paddock side tank (SF3) — gauge strip');
  });

  it('draws gallon marks on US Letter with a 4 in check bar when asked for unit=us', async () => {
    const { manager, tankId } = await tankOnNewOrg();
    const res = await fetchPdf(manager, `/api/tanks/${tankId}/gauge-strip.pdf?every=10&unit=us&paper=letter`);
    expect(res.status).toBe(200);
    const layout = gaugeStripLayout({ geometry: HORIZONTAL, datumOffsetMm: 35, everyVolume: { value: 10, unit: 'usgal' }, unitSystem: 'us', page: gaugePage('letter') });
    // The volume below a zero mark 35 mm up is under 10 gal, so the first mark is 10 gal.
    expect(layout.pages[0].ticks.slice(0, 2).map((t) => t.label)).toEqual(['10 gal', '20 gal']);
    await expectPdfMatchesLayout(res.body as Buffer, layout, [612, 792], 101.6);
  });

  it('uses the suggested step, the user’s units and A4 when the query is empty', async () => {
    const { manager, tankId } = await tankOnNewOrg();
    const res = await fetchPdf(manager, `/api/tanks/${tankId}/gauge-strip.pdf`);
    expect(res.status).toBe(200);
    const layout = gaugeStripLayout({ geometry: HORIZONTAL, datumOffsetMm: 35, everyVolume: suggestGaugeStep(HORIZONTAL, 35, 'metric'), unitSystem: 'metric', page: gaugePage('a4') });
    await expectPdfMatchesLayout(res.body as Buffer, layout, [595.28, 841.89], 100);
  });

  it('gives a worker the strip of a tank on their own farm', async () => {
    const { org, tankId } = await tankOnNewOrg({ geometry: { shape: 'box', lengthMm: 1200, widthMm: 1000, heightMm: 1000 }, datumOffsetMm: 0 });
    const worker = await signedIn(env, org.users.worker.email);
    const res = await fetchPdf(worker, `/api/tanks/${tankId}/gauge-strip.pdf?every=25`);
    expect(res.status).toBe(200);
    const layout = gaugeStripLayout({ geometry: { shape: 'box', lengthMm: 1200, widthMm: 1000, heightMm: 1000 }, datumOffsetMm: 0, everyL: 25, unitSystem: 'metric', page: gaugePage('a4') });
    await expectPdfMatchesLayout(res.body as Buffer, layout, [595.28, 841.89], 100);
  });

  it('prints a name Helvetica cannot encode with question marks instead of failing', async () => {
    const { manager, tankId } = await tankOnNewOrg({ name: 'Бак ☃ north', geometry: { shape: 'box', lengthMm: 1000, widthMm: 1000, heightMm: 400 }, datumOffsetMm: 0 });
    const res = await fetchPdf(manager, `/api/tanks/${tankId}/gauge-strip.pdf?every=10`);
    expect(res.status).toBe(200);
    const doc = await PDFDocument.load(res.body as Buffer);
    expect(readPage(doc, doc.getPages()[0]).text).toContain('??? ? north (SF3) — gauge strip');
  });

  it.each([
    ['every=0', 'every'],
    ['every=-5', 'every'],
    ['every=abc', 'every'],
    ['every=', 'every'],
    ['unit=imperial', 'unit'],
    ['paper=a3', 'paper'],
  ])('answers 400 naming the field for %s', async (query, field) => {
    const { manager, tankId } = await tankOnNewOrg();
    const res = await call(manager, 'get', `/api/tanks/${tankId}/gauge-strip.pdf?${query}`).expect(400);
    expect(res.body.error.field).toBe(field);
    expect(res.body.error.message).toMatch(new RegExp(`^${field}: `));
  });

  it('answers 400 on every, saying how close the marks would be, when the step is too small to read', async () => {
    const { manager, tankId } = await tankOnNewOrg();
    const res = await call(manager, 'get', `/api/tanks/${tankId}/gauge-strip.pdf?every=1`).expect(400);
    expect(res.body.error.field).toBe('every');
    expect(res.body.error.message).toMatch(/^every: a mark every 1 L puts .* mm apart.*at least 2 mm apart/);
  });

  it('answers 422 on paper when the strip would need more than 100 pages', async () => {
    const { manager, tankId } = await tankOnNewOrg({ geometry: { shape: 'vertical-cylinder', diameterMm: 3000, heightMm: 30_000 }, datumOffsetMm: 0 });
    const res = await call(manager, 'get', `/api/tanks/${tankId}/gauge-strip.pdf?every=1000`).expect(422);
    expect(res.body.error).toMatchObject({ code: 'too_tall', field: 'paper' });
    expect(res.body.error.message).toMatch(/at most 100 pages/);
  });

  it('answers 422 on datumOffsetMm when the tube’s zero mark is above the tank', async () => {
    const { manager, tankId } = await tankOnNewOrg({ geometry: { shape: 'box', lengthMm: 1000, widthMm: 1000, heightMm: 400 }, datumOffsetMm: 500 });
    const res = await call(manager, 'get', `/api/tanks/${tankId}/gauge-strip.pdf?every=10`).expect(422);
    expect(res.body.error.field).toBe('datumOffsetMm');
  });

  it('answers 404 for a tank of another organisation', async () => {
    const { tankId } = await tankOnNewOrg();
    const other = await makeOrganisation(env);
    const stranger = await signedIn(env, other.users.owner.email);
    await call(stranger, 'get', `/api/tanks/${tankId}/gauge-strip.pdf?every=50`).expect(404);
  });
});
