// Drawing helpers shared by the printed PDFs (gauge strip, tank labels): lengths in mm, text in
// Helvetica embedded by pdf-lib (no network).
//
// PDF user space is 1/72 inch per unit (ISO 32000-1:2008, §8.3.2.3, default user space), and
// 1 in = 25.4 mm exactly, so 1 mm = 72/25.4 pt ≈ 2.834646 pt. Every length goes through `pt()` once;
// the origin is the bottom-left corner of the page, y upward.
import { degrees, LineCapStyle, rgb, StandardFonts, type Color, type PDFDocument, type PDFFont, type PDFPage } from 'pdf-lib';
import { INCH_MM } from '@shared/units';

/** Points per millimetre: 72 pt per inch over 25.4 mm per inch. */
export const PT_PER_MM = 72 / INCH_MM;
/** A length in mm as PDF points. */
export const pt = (mm: number) => mm * PT_PER_MM;

export const INK = rgb(0, 0, 0);
export const GREY = rgb(0.45, 0.45, 0.45);

export interface Fonts {
  regular: PDFFont;
  bold: PDFFont;
  /** Code points Helvetica can encode (WinAnsi); anything else prints as "?". */
  charset: Set<number>;
}

/** Embeds Helvetica and Helvetica Bold in `doc`. */
export async function embedFonts(doc: PDFDocument): Promise<Fonts> {
  const regular = await doc.embedFont(StandardFonts.Helvetica);
  const bold = await doc.embedFont(StandardFonts.HelveticaBold);
  return { regular, bold, charset: new Set(regular.getCharacterSet()) };
}

/** A straight line from (x1, y1) to (x2, y2), all in mm, with butt ends. */
export function line(page: PDFPage, x1: number, y1: number, x2: number, y2: number, thicknessMm: number, color: Color = INK, dashArray?: number[]) {
  page.drawLine({ start: { x: pt(x1), y: pt(y1) }, end: { x: pt(x2), y: pt(y2) }, thickness: pt(thicknessMm), color, lineCap: LineCapStyle.Butt, dashArray });
}

export interface TextOptions {
  x: number;
  y: number;
  size: number;
  bold?: boolean;
  align?: 'left' | 'right';
  rotate?: number;
  maxWidthPt?: number;
  color?: Color;
}

/** Draws text at (x, y) mm; too wide for `maxWidthPt`, it shrinks to 6 pt, then is cut short with "…". */
export function text(page: PDFPage, fonts: Fonts, raw: string, o: TextOptions) {
  const font = o.bold ? fonts.bold : fonts.regular;
  let value = printable(fonts, raw);
  let size = o.size;
  if (o.maxWidthPt !== undefined) {
    while (size > 6 && font.widthOfTextAtSize(value, size) > o.maxWidthPt) size -= 0.25;
    while (value.length > 1 && font.widthOfTextAtSize(value, size) > o.maxWidthPt) value = `${value.slice(0, -2).trimEnd()}…`;
  }
  const width = font.widthOfTextAtSize(value, size);
  const x = o.align === 'right' ? pt(o.x) - width : pt(o.x);
  page.drawText(value, { x, y: pt(o.y), size, font, color: o.color ?? INK, ...(o.rotate ? { rotate: degrees(o.rotate) } : {}) });
}

/**
 * `raw` broken at spaces into lines no wider than `widthMm` at `size` pt; past `maxLines` the last
 * line is cut short with "…". A word longer than the width is left for `text` to shorten.
 */
export function wrapLines(fonts: Fonts, raw: string, o: { widthMm: number; size: number; bold?: boolean; maxLines: number }): string[] {
  const font = o.bold ? fonts.bold : fonts.regular;
  const fits = (s: string) => font.widthOfTextAtSize(s, o.size) <= pt(o.widthMm);
  const lines: string[] = [];
  let current = '';
  for (const word of printable(fonts, raw).split(' ').filter(Boolean)) {
    const next = current ? `${current} ${word}` : word;
    if (fits(next) || !current) current = next;
    else {
      lines.push(current);
      current = word;
    }
  }
  if (current) lines.push(current);
  if (lines.length <= o.maxLines) return lines;
  const kept = lines.slice(0, o.maxLines);
  let last = `${kept[o.maxLines - 1]}…`;
  while (last.length > 1 && !fits(last)) last = `${last.slice(0, -2).trimEnd()}…`;
  kept[o.maxLines - 1] = last;
  return kept;
}

/** `s` with line breaks flattened and characters Helvetica cannot encode replaced by "?". */
export function printable(fonts: Fonts, s: string): string {
  let out = '';
  for (const ch of s.replace(/\s+/g, ' ')) out += fonts.charset.has(ch.codePointAt(0) ?? 0) ? ch : '?';
  return out;
}

/** A length in points rounded to 2 decimals (< 0.002 mm), as page sizes are written. */
export const round2 = (v: number) => Math.round(v * 100) / 100;
