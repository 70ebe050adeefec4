// Renders the app's PNG icons from its SVG drawings (public/icons) with the machine's Chromium:
// `npx tsx scripts/render-icons.ts`. The PNGs are committed; run this again after changing a drawing.
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { chromium } from 'playwright-core';

const iconsDir = resolve(import.meta.dirname, '..', 'public', 'icons');
/** Each PNG: the drawing it comes from and its width and height in pixels. */
const OUTPUTS: { svg: string; png: string; sizePx: number }[] = [
  { svg: 'brimstock.svg', png: 'brimstock-192.png', sizePx: 192 },
  { svg: 'brimstock.svg', png: 'brimstock-512.png', sizePx: 512 },
  { svg: 'brimstock-maskable.svg', png: 'brimstock-maskable-512.png', sizePx: 512 },
  // iOS puts its own rounded mask over the home-screen icon, so it takes the full-bleed drawing.
  { svg: 'brimstock-maskable.svg', png: 'apple-touch-icon-180.png', sizePx: 180 },
];

const browser = await chromium.launch({ executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium' });
try {
  const page = await browser.newPage();
  for (const { svg, png, sizePx } of OUTPUTS) {
    const drawing = readFileSync(join(iconsDir, svg), 'utf8');
    await page.setViewportSize({ width: sizePx, height: sizePx });
    await page.setContent(`<html><body style="margin:0;background:transparent">${drawing.replace('<svg ', `<svg width="${sizePx}" height="${sizePx}" `)}</body></html>`);
    await page.locator('svg').screenshot({ path: join(iconsDir, png), omitBackground: true });
    console.log(`${png} (${sizePx} px) from ${svg}`);
  }
} finally {
  await browser.close();
}
