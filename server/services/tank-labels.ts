// The label stuck on a tank: its code, name, contents and capacity, the confined-space caution,
// and a QR code that opens the round at that tank. One label on a page of its own size, or a
// sheet of them for a farm (tank-label-sheet.ts), or beside the gauge strip.
import { PDFDocument, rgb, type PDFPage } from 'pdf-lib';
import QRCode from 'qrcode';
import { CAUTION_WORD, cautionText, cautionTitle } from '@shared/cautions';
import { DEFAULT_LANGUAGE, LANGUAGE_LOCALES, type Language } from '@shared/i18n/languages';
import { usableCapacityL } from '@shared/readings';
import type { SessionUser, Tank, TankContents, TankLabelQuery } from '@shared/schemas';
import { formatVolume, type UnitSystem } from '@shared/units';
import type { AppContext } from '../context';
import { languageOr, translatorFor } from '../i18n';
import { embedFonts, GREY, INK, line, pt, round2, text, wrapLines, type Fonts } from './pdf-text';
import { tankFor, toTankDto } from './tanks';

/** A label's outer size in mm: two across and four down fit inside the margins of A4 and of US Letter. */
export const LABEL_MM = { widthMm: 95, heightMm: 66 } as const;
const PAD_MM = 4;
const QR_MM = 32;

const CONTENTS_KEYS: Record<TankContents, string> = { water: 'water', fertilizer: 'fertilizer', 'pest-solution': 'pestSolution', culture: 'culture' };

/** What a tank's contents are called on its printed label and strip, in `language`. */
export function printedContents(contents: TankContents, language: Language): string {
  return translatorFor(language)(`pdf.contents.${CONTENTS_KEYS[contents]}`);
}

/** What a label prints about its tank, in the reader's units. */
export interface TankLabel {
  tankId: number;
  code: string;
  name: string;
  contents: TankContents;
  contentsNote: string;
  capacityL: number;
  usableCapacityL: number;
  unitSystem: UnitSystem;
  /** The language its words and figures are printed in. */
  language: Language;
  /** The address the QR code holds: the round, at this tank. */
  link: string;
}

/** The address that opens the round at a tank: PUBLIC_URL + /round?tank=<id>. */
export function tankRoundLink(publicUrl: string, tankId: number): string {
  return `${publicUrl}/round?${new URLSearchParams({ tank: String(tankId) })}`;
}

/** The label of a tank, its capacities worked out from its shape and levels. */
export function tankLabelOf(ctx: AppContext, tank: Tank, unitSystem: UnitSystem, language: Language = DEFAULT_LANGUAGE): TankLabel {
  return {
    tankId: tank.id,
    code: tank.code,
    name: tank.name,
    contents: tank.contents,
    contentsNote: tank.contentsNote,
    capacityL: tank.capacityL,
    usableCapacityL: usableCapacityL(tank.geometry, tank),
    unitSystem,
    language,
    link: tankRoundLink(ctx.config.publicUrl, tank.id),
  };
}

/** The label PDF of a tank the actor may see: one page the size of the label. */
export async function tankLabelPdf(ctx: AppContext, actor: SessionUser, id: number, query: TankLabelQuery): Promise<{ filename: string; pdf: Uint8Array }> {
  const tank = toTankDto(await tankFor(ctx, actor, id));
  const language = languageOr(actor.language);
  const label = tankLabelOf(ctx, tank, query.unit ?? actor.unitSystem, language);
  const doc = await PDFDocument.create();
  describeLabelDocument(doc, translatorFor(language)('pdf.label.title', { name: tank.name, code: tank.code }), language);
  const fonts = await embedFonts(doc);
  const page = doc.addPage([round2(pt(LABEL_MM.widthMm)), round2(pt(LABEL_MM.heightMm))]);
  drawTankLabel(page, fonts, label, 0, 0);
  return { filename: `${tank.code}-label.pdf`, pdf: await doc.save({ useObjectStreams: false }) };
}

/** Title, subject and makers of a label PDF. */
export function describeLabelDocument(doc: PDFDocument, title: string, language: Language = DEFAULT_LANGUAGE) {
  doc.setTitle(title);
  doc.setSubject(translatorFor(language)('pdf.label.subject'));
  doc.setLanguage(LANGUAGE_LOCALES[language]);
  doc.setCreator('Brimstock');
  doc.setProducer('Brimstock');
}

/**
 * Draws a label with its bottom-left corner at (xMm, yMm): the QR code top left with the link under
 * it, the tank's code, name, contents and capacity beside it, and the confined-space caution across
 * the bottom. The caller draws any cut lines around it.
 */
export function drawTankLabel(page: PDFPage, fonts: Fonts, label: TankLabel, xMm: number, yMm: number) {
  const t = translatorFor(label.language);
  const locale = LANGUAGE_LOCALES[label.language];
  const left = xMm + PAD_MM;
  const right = xMm + LABEL_MM.widthMm - PAD_MM;
  const top = yMm + LABEL_MM.heightMm - PAD_MM;
  drawQr(page, label.link, left, top - QR_MM, QR_MM);
  text(page, fonts, label.link.replace(/^https?:\/\//, ''), { x: left, y: top - QR_MM - 3, size: 5.5, maxWidthPt: pt(QR_MM + 2), color: GREY });

  const colX = left + QR_MM + 4;
  const colWidthMm = right - colX;
  text(page, fonts, label.code, { x: colX, y: top - 6, size: 20, bold: true, maxWidthPt: pt(colWidthMm) });
  let y = top - 12.5;
  for (const l of wrapLines(fonts, label.name, { widthMm: colWidthMm, size: 10, bold: true, maxLines: 2 })) {
    text(page, fonts, l, { x: colX, y, size: 10, bold: true, maxWidthPt: pt(colWidthMm) });
    y -= 4.2;
  }
  y -= 1;
  const contents = printedContents(label.contents, label.language) + (label.contentsNote ? ` (${label.contentsNote})` : '');
  const facts = [
    t('pdf.label.holds', { contents }),
    t('pdf.label.capacity', { volume: formatVolume(label.capacityL, label.unitSystem, 0, locale) }),
    t('pdf.label.usable', { volume: formatVolume(label.usableCapacityL, label.unitSystem, 0, locale) }),
  ];
  for (const fact of facts) {
    for (const l of wrapLines(fonts, fact, { widthMm: colWidthMm, size: 7.5, maxLines: 2 })) {
      if (y < top - QR_MM + 1) break;
      text(page, fonts, l, { x: colX, y, size: 7.5, maxWidthPt: pt(colWidthMm) });
      y -= 3.3;
    }
  }
  text(page, fonts, t('pdf.label.scan'), { x: colX, y: top - QR_MM - 3, size: 6, maxWidthPt: pt(colWidthMm), color: GREY });

  const rule = top - QR_MM - 6;
  line(page, left, rule, right, rule, 0.3);
  const heading = t('pdf.label.cautionHeading', { caution: CAUTION_WORD[label.language], topic: cautionTitle('confined-space', label.language).toLowerCase() });
  text(page, fonts, heading, { x: left, y: rule - 3.8, size: 8, bold: true, maxWidthPt: pt(right - left) });
  let cy = rule - 7.2;
  for (const l of wrapLines(fonts, cautionText('confined-space', label.language), { widthMm: right - left, size: 6.8, maxLines: 4 })) {
    text(page, fonts, l, { x: left, y: cy, size: 6.8, maxWidthPt: pt(right - left) });
    cy -= 2.9;
  }
}

/** A dashed cut line around a label whose bottom-left corner is (xMm, yMm). */
export function drawLabelCutLines(page: PDFPage, xMm: number, yMm: number) {
  const { widthMm, heightMm } = LABEL_MM;
  const dash = [pt(2), pt(1.5)];
  line(page, xMm, yMm, xMm + widthMm, yMm, 0.2, GREY, dash);
  line(page, xMm, yMm + heightMm, xMm + widthMm, yMm + heightMm, 0.2, GREY, dash);
  line(page, xMm, yMm, xMm, yMm + heightMm, 0.2, GREY, dash);
  line(page, xMm + widthMm, yMm, xMm + widthMm, yMm + heightMm, 0.2, GREY, dash);
}

const WHITE = rgb(1, 1, 1);

/**
 * The QR code of `data` (error correction M, ISO/IEC 18004 level for about 15 % damage) drawn as
 * filled squares in a `sizeMm` square whose bottom-left corner is (xMm, yMm), with the standard
 * 4-module quiet zone inside it kept white.
 */
function drawQr(page: PDFPage, data: string, xMm: number, yMm: number, sizeMm: number) {
  const qr = QRCode.create(data, { errorCorrectionLevel: 'M' });
  const n = qr.modules.size;
  const moduleMm = sizeMm / (n + 8);
  page.drawRectangle({ x: pt(xMm), y: pt(yMm), width: pt(sizeMm), height: pt(sizeMm), color: WHITE });
  for (let row = 0; row < n; row++) {
    // One rectangle per run of dark modules in a row: fewer operators, no hairlines between modules.
    let col = 0;
    while (col < n) {
      if (!qr.modules.get(row, col)) {
        col++;
        continue;
      }
      const start = col;
      while (col < n && qr.modules.get(row, col)) col++;
      page.drawRectangle({
        x: pt(xMm + (4 + start) * moduleMm),
        y: pt(yMm + sizeMm - (4 + row + 1) * moduleMm),
        width: pt((col - start) * moduleMm),
        height: pt(moduleMm),
        color: INK,
      });
    }
  }
}
