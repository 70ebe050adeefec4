// A farm's labels on sheets of paper: every active tank in walking order, two across and four
// down, with dashed cut lines between them.
import { PDFDocument } from 'pdf-lib';
import { PAPER_SIZES_MM, type GaugePaper } from '@shared/gauge';
import type { FarmLabelsQuery, SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { languageOr, translatorFor } from '../i18n';
import { AppError } from '../errors';
import { getFarm } from './farms';
import { embedFonts, GREY, line, pt, round2, text } from './pdf-text';
import { describeLabelDocument, drawTankLabel, LABEL_MM, tankLabelOf } from './tank-labels';
import { listTanks } from './tanks';

/** Labels per sheet: columns across and rows down. */
export const LABEL_SHEET = { columns: 2, rows: 4 } as const;
const DASH = [pt(2), pt(1.5)];
/** How far the cut lines run past the grid, mm. */
const CUT_OVERRUN_MM = 4;

/** Where the grid of labels sits on the paper: centred, in mm from the bottom-left corner. */
export function labelSheetGrid(paper: GaugePaper) {
  const { widthMm, heightMm } = PAPER_SIZES_MM[paper];
  const gridWidthMm = LABEL_SHEET.columns * LABEL_MM.widthMm;
  const gridHeightMm = LABEL_SHEET.rows * LABEL_MM.heightMm;
  return { widthMm, heightMm, leftMm: (widthMm - gridWidthMm) / 2, bottomMm: (heightMm - gridHeightMm) / 2, gridWidthMm, gridHeightMm };
}

/** The sheet of labels of a farm the actor may see; 422 when it has no active tank. */
export async function farmLabelsPdf(ctx: AppContext, actor: SessionUser, farmId: number, query: FarmLabelsQuery): Promise<{ filename: string; pdf: Uint8Array }> {
  const farm = await getFarm(ctx, actor, farmId);
  const tanks = await listTanks(ctx, actor, { farmId });
  const language = languageOr(actor.language);
  const t = translatorFor(language);
  if (tanks.length === 0) throw new AppError(422, 'no_tanks', `${farm.name} has no active tanks to print labels for`);
  const unitSystem = query.unit ?? actor.unitSystem;
  const paper: GaugePaper = query.paper ?? (unitSystem === 'us' ? 'letter' : 'a4');
  const grid = labelSheetGrid(paper);
  const perSheet = LABEL_SHEET.columns * LABEL_SHEET.rows;
  const sheets = Math.ceil(tanks.length / perSheet);

  const doc = await PDFDocument.create();
  describeLabelDocument(doc, t('pdf.sheet.title', { farm: farm.name }), language);
  const fonts = await embedFonts(doc);
  for (let s = 0; s < sheets; s++) {
    const page = doc.addPage([round2(pt(grid.widthMm)), round2(pt(grid.heightMm))]);
    const onSheet = tanks.slice(s * perSheet, (s + 1) * perSheet);
    const rowsUsed = Math.ceil(onSheet.length / LABEL_SHEET.columns);
    const gridTop = grid.bottomMm + grid.gridHeightMm;
    text(page, fonts, t('pdf.sheet.heading', { farm: farm.name, sheet: s + 1, sheets }), {
      x: grid.leftMm,
      y: gridTop + CUT_OVERRUN_MM + 2,
      size: 8,
      maxWidthPt: pt(grid.gridWidthMm),
      color: GREY,
    });
    onSheet.forEach((tank, i) => {
      const col = i % LABEL_SHEET.columns;
      const row = Math.floor(i / LABEL_SHEET.columns);
      drawTankLabel(page, fonts, tankLabelOf(ctx, tank, unitSystem, language), grid.leftMm + col * LABEL_MM.widthMm, gridTop - (row + 1) * LABEL_MM.heightMm);
    });
    const usedBottom = gridTop - rowsUsed * LABEL_MM.heightMm;
    for (let r = 0; r <= rowsUsed; r++) {
      const y = gridTop - r * LABEL_MM.heightMm;
      line(page, grid.leftMm - CUT_OVERRUN_MM, y, grid.leftMm + grid.gridWidthMm + CUT_OVERRUN_MM, y, 0.2, GREY, DASH);
    }
    for (let c = 0; c <= LABEL_SHEET.columns; c++) {
      const x = grid.leftMm + c * LABEL_MM.widthMm;
      line(page, x, usedBottom - CUT_OVERRUN_MM, x, gridTop + CUT_OVERRUN_MM, 0.2, GREY, DASH);
    }
  }
  return { filename: `${slug(farm.name)}-tank-labels.pdf`, pdf: await doc.save({ useObjectStreams: false }) };
}

/** A farm name as a file name: letters and digits, the rest as single "-". */
function slug(name: string): string {
  return (
    name
      .normalize('NFKD')
      .replace(/[^A-Za-z0-9]+/g, '-')
      .replace(/^-|-$/g, '')
      .toLowerCase() || 'farm'
  );
}
