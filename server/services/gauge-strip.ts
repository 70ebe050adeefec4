// The printable gauge strip: the shared layout drawn with pdf-lib at true 1:1 scale.
//
// PDF user space is 1/72 inch per unit (ISO 32000-1:2008, §8.3.2.3, default user space), and
// 1 in = 25.4 mm exactly, so 1 mm = 72/25.4 pt ≈ 2.834646 pt. Every length below is in mm and goes
// through `pt()` once; the origin is the bottom-left corner of the page, y upward.
import { PDFDocument, closePath, fill, lineTo, moveTo, popGraphicsState, pushGraphicsState, setFillingColor, type PDFPage } from 'pdf-lib';
import { GAUGE_HEADER_MM, GaugeStripError, gaugePage, gaugeStripLayout, suggestGaugeStep, type GaugePaper, type GaugeStripLayout, type GaugeStripPage } from '@shared/gauge';
import type { GaugeStripQuery, SessionUser, TankContents } from '@shared/schemas';
import { formatLength, formatNumberTrimmed, INCH_MM, UNIT_SYMBOLS, type UnitSystem } from '@shared/units';
import { cautionSentences } from '@shared/cautions';
import { DEFAULT_LANGUAGE, LANGUAGE_LOCALES, type Language } from '@shared/i18n/languages';
import { languageOr, translatorFor, type Translate } from '../i18n';
import type { AppContext } from '../context';
import { AppError } from '../errors';
import { embedFonts, GREY, INK, line, printable, PT_PER_MM, pt, round2, text, type Fonts } from './pdf-text';
import { drawLabelCutLines, drawTankLabel, LABEL_MM, printedContents, tankLabelOf, type TankLabel } from './tank-labels';
import { tankFor, toTankDto } from './tanks';

export { PT_PER_MM } from './pdf-text';

/** Where the drawing puts things, in mm (the strip's left edge is the page margin). */
export const GAUGE_DRAWING = {
  stripWidthMm: 62,
  majorTickMm: 14,
  minorTickMm: 8,
  majorTickThicknessMm: 0.35,
  minorTickThicknessMm: 0.2,
  scaleTickMm: { small: 2, medium: 3.5, large: 5.5 },
  scaleThicknessMm: 0.15,
  checkBarThicknessMm: 0.6,
  /** 100 mm for metric users, 4 in (101.6 mm) for US users. */
  checkBarMm: { metric: 100, us: 4 * INCH_MM },
} as const;

// The confined-space caution in the shared words, in the reader's language: the header carries its first
// three sentences, the text along a cut strip (narrow) the first and the third.
const cautionAlong = (language: Language) => {
  const confined = cautionSentences('confined-space', language);
  return `${confined[0]} ${confined[2]}`;
};

/** What the strip prints about its tank. */
export interface GaugeStripTank {
  name: string;
  code: string;
  contents: TankContents;
  contentsNote: string;
}

/** The gauge strip PDF of a tank the actor may see, with its download file name and the layout it draws. */
export async function gaugeStripPdf(ctx: AppContext, actor: SessionUser, id: number, query: GaugeStripQuery): Promise<{ filename: string; pdf: Uint8Array; layout: GaugeStripLayout }> {
  const tank = await tankFor(ctx, actor, id);
  const unitSystem = query.unit ?? actor.unitSystem;
  const paper: GaugePaper = query.paper ?? (unitSystem === 'us' ? 'letter' : 'a4');
  const layout = withFieldErrors(() => {
    const every = query.every === undefined ? suggestGaugeStep(tank.geometry, tank.datumOffsetMm, unitSystem) : { value: query.every, unit: unitSystem === 'us' ? ('usgal' as const) : ('L' as const) };
    return gaugeStripLayout({ geometry: tank.geometry, datumOffsetMm: tank.datumOffsetMm, everyVolume: every, unitSystem, page: gaugePage(paper) });
  });
  const language = languageOr(actor.language);
  const label = query.label === 'true' ? tankLabelOf(ctx, toTankDto(tank), unitSystem, language) : undefined;
  const pdf = await renderGaugeStrip({ name: tank.name, code: tank.code, contents: tank.contents, contentsNote: tank.contentsNote }, layout, label, language);
  return { filename: `${tank.code}-gauge-strip${label ? '-and-label' : ''}.pdf`, pdf, layout };
}

/** Layout refusals as API errors: a bad step is the query's fault (400 every); a tank that cannot be printed is 422. */
function withFieldErrors<T>(work: () => T): T {
  try {
    return work();
  } catch (err) {
    if (!(err instanceof GaugeStripError)) throw err;
    const reason = err.message.slice(err.field.length + 2);
    if (err.field.startsWith('every')) throw new AppError(400, 'invalid_input', `every: ${reason}`, 'every');
    if (err.field === 'page') throw new AppError(422, 'too_tall', `paper: ${reason}`, 'paper');
    if (err.field === 'datumOffsetMm') throw new AppError(422, 'unprintable', `datumOffsetMm: ${reason}`, 'datumOffsetMm');
    throw err;
  }
}

/**
 * Draws a layout as a PDF at 1:1 (one page per layout page, Helvetica embedded by pdf-lib, no
 * network). Saved without object streams so each page's content is a plain stream object.
 */
export async function renderGaugeStrip(tank: GaugeStripTank, layout: GaugeStripLayout, label?: TankLabel, language: Language = DEFAULT_LANGUAGE): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  const fonts = await embedFonts(doc);
  const words: Words = { t: translatorFor(language), locale: LANGUAGE_LOCALES[language], language };
  doc.setTitle(words.t('pdf.strip.title', { name: tank.name, code: tank.code }));
  doc.setSubject(words.t('pdf.strip.subject'));
  doc.setLanguage(words.locale);
  doc.setCreator('Brimstock');
  doc.setProducer('Brimstock');
  // Readers print at the sheet size in the file; 2 decimals of a point (< 0.002 mm) match the
  // usual A4 size in points (595.28 × 841.89) and leave Letter at exactly 612 × 792.
  const size: [number, number] = [round2(pt(layout.page.widthMm)), round2(pt(layout.page.heightMm))];
  const pages = layout.pages.map((p) => {
    const page = doc.addPage(size);
    drawPage(page, fonts, tank, layout, p, words);
    return page;
  });
  if (label) {
    const spot = labelSpot(layout);
    const at = spot ?? { xMm: layout.page.marginMm, yMm: layout.page.heightMm - layout.page.marginMm - LABEL_MM.heightMm };
    const page = spot ? pages[0] : doc.addPage(size);
    drawTankLabel(page, fonts, label, at.xMm, at.yMm);
    drawLabelCutLines(page, at.xMm, at.yMm);
  }
  return doc.save({ useObjectStreams: false });
}

/**
 * Where the label fits on the first page, right of the strip and below the header, clear of the
 * notes the strip writes there (zero line, floor, top, joins); null when it does not fit.
 */
function labelSpot(layout: GaugeStripLayout): { xMm: number; yMm: number } | null {
  const { widthMm, heightMm, marginMm } = layout.page;
  const p = layout.pages[0];
  const xMm = marginMm + GAUGE_DRAWING.stripWidthMm + 6;
  // The upright check bar and its words take the last 9 mm inside the right margin.
  if (xMm + LABEL_MM.widthMm > widthMm - marginMm - 9) return null;
  const y = (positionMm: number) => layout.stripBottomMm + (positionMm - p.fromMm);
  const notes: number[] = p.joins.map((j) => y(j.positionMm));
  if (p.index === 0) notes.push(y(0));
  if (p.index === layout.totalPages - 1) notes.push(y(p.toMm));
  if (layout.floorPositionMm !== null && layout.floorPositionMm >= p.fromMm && layout.floorPositionMm <= p.toMm) notes.push(y(layout.floorPositionMm));
  // Each note's words sit within 5 mm below to 6 mm above its line.
  const taken = notes.map((n) => [n - 6, n + 7] as const).sort((a, b) => a[0] - b[0]);
  let from = marginMm;
  const top = heightMm - marginMm - GAUGE_HEADER_MM;
  for (const [low, high] of [...taken, [top, Infinity] as const]) {
    const gapTop = Math.min(low, top);
    if (gapTop - from >= LABEL_MM.heightMm) return { xMm, yMm: gapTop - LABEL_MM.heightMm };
    from = Math.max(from, high);
  }
  return null;
}

/** How a strip's words are said: the translator, the locale of its figures and the language of its caution. */
interface Words {
  t: Translate;
  locale: string;
  language: Language;
}

function drawPage(page: PDFPage, fonts: Fonts, tank: GaugeStripTank, layout: GaugeStripLayout, p: GaugeStripPage, words: Words) {
  const unitSystem: UnitSystem = layout.scaleUnit === 'in' ? 'us' : 'metric';
  drawHeader(page, fonts, tank, layout, p, unitSystem, words);
  drawStrip(page, fonts, tank, layout, p, words);
  drawUprightCheckBar(page, fonts, layout, unitSystem, words);
}

function drawHeader(page: PDFPage, fonts: Fonts, tank: GaugeStripTank, layout: GaugeStripLayout, p: GaugeStripPage, unitSystem: UnitSystem, words: Words) {
  const { t, locale } = words;
  const { widthMm, heightMm, marginMm } = layout.page;
  const left = marginMm;
  const right = widthMm - marginMm;
  const top = heightMm - marginMm;
  const pageText = t('pdf.strip.page', { page: p.label });
  const pageWidth = pt(right - left) - fonts.bold.widthOfTextAtSize(pageText, 11);
  text(page, fonts, pageText, { x: right, y: top - 5, size: 11, bold: true, align: 'right' });
  text(page, fonts, t('pdf.strip.title', { name: tank.name, code: tank.code }), { x: left, y: top - 5, size: 13, bold: true, maxWidthPt: pageWidth - pt(6) });

  const contents = printedContents(tank.contents, words.language) + (tank.contentsNote ? ` (${tank.contentsNote})` : '');
  const volumeWords = t(layout.volumeUnit === 'L' ? 'pdf.strip.litres' : 'pdf.strip.gallons');
  const stepText = volumeText(layout.step.value, layout, locale);
  const edge = {
    unit: t(layout.scaleUnit === 'mm' ? 'pdf.strip.millimetres' : 'pdf.strip.inches'),
    offset: formatLength(Math.abs(layout.datumOffsetMm), unitSystem, undefined, locale),
    top: formatLength(layout.topPositionMm, unitSystem, undefined, locale),
  };
  const lines = [
    t('pdf.strip.marks', { contents, step: stepText, major: volumeText(layout.step.value * layout.majorEvery, layout, locale), unit: volumeWords }),
    t(layout.datumOffsetMm < 0 ? 'pdf.strip.edgeBelow' : 'pdf.strip.edgeAbove', edge),
  ];
  lines.forEach((line, i) => text(page, fonts, line, { x: left, y: top - 11 - 4.5 * i, size: 8, maxWidthPt: pt(right - left) }));
  text(page, fonts, t('pdf.strip.printActual'), { x: left, y: top - 22.5, size: 10.5, bold: true });

  const barMm = GAUGE_DRAWING.checkBarMm[unitSystem];
  const barY = top - 28;
  line(page, left, barY, left + barMm, barY, GAUGE_DRAWING.checkBarThicknessMm);
  for (const x of [left, left + barMm]) line(page, x, barY - 1.8, x, barY + 1.8, 0.2);
  const barWords = unitSystem === 'us' ? '4 in' : '100 mm';
  text(page, fonts, t('pdf.strip.checkRuler', { bar: barWords }), { x: left, y: barY - 5, size: 7.5, maxWidthPt: pt(right - left) });
  text(page, fonts, cautionSentences('confined-space', words.language).slice(0, 3).join(' '), { x: left, y: top - 39, size: 9.5, bold: true, maxWidthPt: pt(right - left) });
  text(page, fonts, t('pdf.strip.cutAndTape'), {
    x: left,
    y: top - 44,
    size: 7,
    maxWidthPt: pt(right - left),
  });
}

function drawStrip(page: PDFPage, fonts: Fonts, tank: GaugeStripTank, layout: GaugeStripLayout, p: GaugeStripPage, words: Words) {
  const { t, locale } = words;
  const D = GAUGE_DRAWING;
  const x0 = layout.page.marginMm;
  const xr = x0 + D.stripWidthMm;
  const y = (positionMm: number) => layout.stripBottomMm + (positionMm - p.fromMm);
  const yLow = y(p.fromMm);
  const yHigh = y(p.toMm);
  const first = p.index === 0;
  const last = p.index === layout.totalPages - 1;
  // Text beside a mark near a join would be cut in half: keep it inside this page's part of the strip.
  const clampBaseline = (baseline: number, sizePt: number) => {
    const capMm = (0.72 * sizePt) / PT_PER_MM;
    let b = baseline;
    if (!last) b = Math.min(b, yHigh - capMm - 0.3);
    if (!first) b = Math.max(b, yLow + 0.3);
    return b;
  };

  line(page, x0, yLow, x0, yHigh, 0.2, GREY);
  line(page, xr, yLow, xr, yHigh, 0.2, GREY);

  for (const t of p.ticks) {
    const ty = y(t.positionMm);
    const len = t.major ? D.majorTickMm : D.minorTickMm;
    line(page, x0, ty, x0 + len, ty, t.major ? D.majorTickThicknessMm : D.minorTickThicknessMm);
    if (!t.labelShown) continue;
    const size = t.major ? 8 : 6.5;
    text(page, fonts, t.label, { x: x0 + len + 1.5, y: clampBaseline(ty - (0.36 * size) / PT_PER_MM, size), size, bold: t.major });
  }

  for (const s of p.scale) {
    const sy = y(s.positionMm);
    line(page, xr - D.scaleTickMm[s.size], sy, xr, sy, D.scaleThicknessMm);
    if (s.label) text(page, fonts, s.label, { x: xr - D.scaleTickMm.large - 1, y: clampBaseline(sy - (0.36 * 6) / PT_PER_MM, 6), size: 6, align: 'right' });
  }

  // Along the strip, so a strip cut from its page still carries the caution and says what it is;
  // a short last piece that cannot hold them leaves them to the pages below and the header.
  const scaleWords = t(layout.scaleUnit === 'mm' ? 'pdf.strip.scaleMm' : 'pdf.strip.scaleIn');
  const along: [string, number, number, boolean][] = [
    [cautionAlong(words.language), 38, 6.5, true],
    [t('pdf.strip.along', { code: tank.code, page: p.label, step: volumeText(layout.step.value, layout, locale), scale: scaleWords }), 44, 6, false],
  ];
  for (const [said, dx, size, isBold] of along) {
    const lengthMm = (isBold ? fonts.bold : fonts.regular).widthOfTextAtSize(printable(fonts, said), size) / PT_PER_MM;
    if (lengthMm + 9 <= yHigh - yLow) text(page, fonts, said, { x: x0 + dx, y: yLow + 6, size, bold: isBold, rotate: 90 });
  }

  const noteX = xr + 6;
  if (first) {
    line(page, x0 - 3, y(0), xr + 3, y(0), 0.45);
    text(page, fonts, t('pdf.strip.zero'), { x: noteX, y: y(0) - 1, size: 8, bold: true });
  }
  if (layout.floorPositionMm !== null && layout.floorPositionMm >= p.fromMm && layout.floorPositionMm <= p.toMm) {
    // Outside the strip, pointing at the edge scale: the "0 L" mark already shows the floor on the volume side.
    line(page, xr, y(layout.floorPositionMm), xr + 5, y(layout.floorPositionMm), 0.25, GREY);
    text(page, fonts, t('pdf.strip.floor'), { x: noteX, y: y(layout.floorPositionMm) + 1, size: 7 });
  }
  if (last) {
    line(page, x0 - 3, yHigh, xr + 3, yHigh, 0.45);
    text(page, fonts, t('pdf.strip.top'), { x: noteX, y: yHigh + 1, size: 8, bold: true });
  }
  for (const j of p.joins) {
    const jy = y(j.positionMm);
    if (j.role === 'cut') {
      line(page, x0 - 4, jy, layout.page.widthMm - layout.page.marginMm - 14, jy, 0.3, INK, [pt(2), pt(1.5)]);
      text(page, fonts, t('pdf.strip.joinCut', { join: j.join, page: j.otherPage }), { x: noteX, y: jy - 4, size: 8, bold: true });
    } else {
      line(page, x0 - 4, jy, layout.page.widthMm - layout.page.marginMm - 14, jy, 0.3);
      text(page, fonts, t('pdf.strip.joinMatch', { join: j.join, page: j.otherPage }), { x: noteX, y: jy + 1.5, size: 8, bold: true });
    }
    // Half a diamond on each side of the join: the two halves meet when the pages line up.
    const dir = j.role === 'cut' ? -1 : 1;
    for (const cx of [x0 - 2, xr + 2]) triangle(page, cx, jy, dir);
  }
}

function drawUprightCheckBar(page: PDFPage, fonts: Fonts, layout: GaugeStripLayout, unitSystem: UnitSystem, words: Words) {
  const barMm = GAUGE_DRAWING.checkBarMm[unitSystem];
  const x = layout.page.widthMm - layout.page.marginMm - 6;
  const y0 = layout.stripBottomMm;
  // Printers can scale height and width differently; the marks run upright, so check upright too.
  line(page, x, y0, x, y0 + barMm, GAUGE_DRAWING.checkBarThicknessMm);
  for (const y of [y0, y0 + barMm]) line(page, x - 1.8, y, x + 1.8, y, 0.2);
  text(page, fonts, words.t('pdf.strip.check', { bar: unitSystem === 'us' ? '4 in' : '100 mm' }), { x: x - 2.5, y: y0 + barMm / 2 - 10, size: 7, bold: true, rotate: 90 });
}

/** A filled 4 mm wide, 2.5 mm tall triangle with its apex on (x, y), pointing up (dir −1, below) or down (dir 1, above). */
function triangle(page: PDFPage, xMm: number, yMm: number, dir: number) {
  page.pushOperators(
    pushGraphicsState(),
    setFillingColor(INK),
    moveTo(pt(xMm), pt(yMm)),
    lineTo(pt(xMm - 2), pt(yMm + dir * 2.5)),
    lineTo(pt(xMm + 2), pt(yMm + dir * 2.5)),
    closePath(),
    fill(),
    popGraphicsState(),
  );
}

const volumeText = (value: number, layout: GaugeStripLayout, locale = 'en-US') => `${formatNumberTrimmed(value, 6, locale)} ${UNIT_SYMBOLS[layout.step.unit]}`;
