// Paper for the printed gauge strip, and the fixed bands every page keeps for print and header.
import { INCH_MM } from '../units/index';

/** The paper a gauge strip prints on. */
export const GAUGE_PAPERS = ['a4', 'letter'] as const;
/** A paper name. */
export type GaugePaper = (typeof GAUGE_PAPERS)[number];

/** A portrait page and its blank margin on every side, all in mm. */
export interface GaugePage {
  widthMm: number;
  heightMm: number;
  marginMm: number;
}

/** Portrait sheet sizes in mm: A4 210 × 297 (ISO 216), US Letter 8.5 × 11 in = 215.9 × 279.4. */
export const PAPER_SIZES_MM: Readonly<Record<GaugePaper, { widthMm: number; heightMm: number }>> = {
  a4: { widthMm: 210, heightMm: 297 },
  letter: { widthMm: 8.5 * INCH_MM, heightMm: 11 * INCH_MM },
};

/** Blank margin in mm kept on every side: most office printers cannot print the outer 4–6 mm. */
export const GAUGE_MARGIN_MM = 10;

/** Height in mm of the band at the top of each page that holds the title, notices and check bar. */
export const GAUGE_HEADER_MM = 48;

/** Least width in mm left inside the margins: the strip column plus room for the join notes. */
export const MIN_GAUGE_CONTENT_WIDTH_MM = 120;

/** Least strip height in mm per page: the 100 mm (4 in) upright check bar must fit beside it. */
export const MIN_GAUGE_STRIP_HEIGHT_MM = 110;

/** The portrait page for `paper` with the standard margin, in mm. */
export function gaugePage(paper: GaugePaper): GaugePage {
  const size = PAPER_SIZES_MM[paper];
  if (!size) throw new RangeError(`paper: must be one of ${GAUGE_PAPERS.join(', ')} (got ${String(paper)})`);
  return { ...size, marginMm: GAUGE_MARGIN_MM };
}
