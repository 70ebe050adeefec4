// Reading printed PDFs the way a person would: render a page with Debian's poppler-utils (pdftoppm,
// pdftotext) and decode the QR codes in the picture with jsQR.
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import jsQR from 'jsqr';
import { PNG } from 'pngjs';

/** Whether poppler-utils' pdftoppm is on this machine (scripts/bootstrap.mjs installs it for tests). */
export const hasPdftoppm = spawnSync('sh', ['-c', 'command -v pdftoppm'], { stdio: 'ignore' }).status === 0;

/** A rendered page: RGBA pixels at `dpi` dots per inch. */
export interface RenderedPage {
  width: number;
  height: number;
  data: Uint8Array;
  dpi: number;
}

/** Renders page `page` (1-based) of a PDF to pixels with pdftoppm; optionally saves the PNG at `saveAs`. */
export function renderPdfPage(pdf: Uint8Array, page: number, dpi = 150, saveAs?: string): RenderedPage {
  const dir = mkdtempSync(join(tmpdir(), 'brimstock-pdf-'));
  try {
    const input = join(dir, 'in.pdf');
    writeFileSync(input, pdf);
    execFileSync('pdftoppm', ['-png', '-r', String(dpi), '-f', String(page), '-l', String(page), '-singlefile', input, join(dir, 'out')]);
    const bytes = readFileSync(join(dir, 'out.png'));
    if (saveAs) writeFileSync(saveAs, bytes);
    const png = PNG.sync.read(bytes);
    return { width: png.width, height: png.height, data: new Uint8Array(png.data), dpi };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** The text of a PDF as pdftotext lays it out. */
export function pdfText(pdf: Uint8Array): string {
  const dir = mkdtempSync(join(tmpdir(), 'brimstock-pdf-'));
  try {
    const input = join(dir, 'in.pdf');
    writeFileSync(input, pdf);
    return execFileSync('pdftotext', ['-layout', input, '-'], { encoding: 'utf8' });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * The text of the QR code inside a box of the page (mm from the page's bottom-left corner, as PDF
 * places things), or of the whole page; null when none is found.
 */
export function decodeQr(page: RenderedPage, boxMm?: { xMm: number; yMm: number; widthMm: number; heightMm: number }): string | null {
  const px = (mm: number) => Math.round((mm / 25.4) * page.dpi);
  const x0 = boxMm ? Math.max(0, px(boxMm.xMm)) : 0;
  const width = boxMm ? Math.min(page.width - x0, px(boxMm.widthMm)) : page.width;
  // Pixel rows run from the top of the page down.
  const y0 = boxMm ? Math.max(0, page.height - px(boxMm.yMm + boxMm.heightMm)) : 0;
  const height = boxMm ? Math.min(page.height - y0, px(boxMm.heightMm)) : page.height;
  const crop = new Uint8ClampedArray(width * height * 4);
  for (let row = 0; row < height; row++) {
    const from = ((y0 + row) * page.width + x0) * 4;
    crop.set(page.data.subarray(from, from + width * 4), row * width * 4);
  }
  return jsQR(crop, width, height)?.data ?? null;
}
