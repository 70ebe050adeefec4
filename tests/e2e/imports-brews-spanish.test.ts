// Browser test of the Logger files and Brews screens in Spanish: Chromium speaking es-ES signs the demo
// manager in (switched to Spanish on the Profile API when an earlier sign-in set another language, and set
// back afterwards), previews the MF-F1 two-column sample with the server's dry run (nothing is imported),
// then opens Brews and works a ratio in the new-brew form's mixing calculator. At 1280 px and at 360 px the
// pages show no English word of these screens' own messages, and nothing is wider than a phone.
// Left out of the comparison: the organisation's own names, the file's cells, and the words the server and
// the shared row reader write about single lines (their catalogue is not these screens').
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { readScenario } from '../../server/services/demo';
import { launch, pickOption, screenshot, signInAs, type Browser } from '../support/browser';
import { englishWordsIn, flatten, messagesDir, readArea, sessionLanguage, setLanguage, wordsOf } from '../support/page-language';

const { baseUrl } = inject('app');
const manager = readScenario().people.find((p) => p.role === 'manager')!;
const root = join(import.meta.dirname, '../..');
const SAMPLE = join(root, 'samples/loggers/mf-f1-date-time-2026-03-26.csv');
const DESK = { width: 1280, height: 900 };
const PHONE = { width: 360, height: 740 };

/** English words of the imports and brews messages whose Spanish differs, less every word any Spanish catalogue uses. */
function englishOnlyWords(): Set<string> {
  const english = new Set<string>();
  for (const area of ['imports', 'brews']) {
    const es = flatten(readArea('es', area));
    for (const [key, text] of flatten(readArea('en', area))) if (es.get(key) !== text) for (const w of wordsOf(text)) english.add(w);
  }
  // A word Spanish uses anywhere (no, a, de…) never counts as English.
  for (const file of readdirSync(join(messagesDir, 'es')).filter((f) => f.endsWith('.json'))) {
    for (const text of flatten(readArea('es', file.slice(0, -'.json'.length))).values()) for (const w of wordsOf(text)) english.delete(w);
  }
  return english;
}

/** The organisation's own data these pages show (farms, tanks, people, brews, inputs, file names), not the app's words. */
async function dataTexts(page: Page): Promise<string[]> {
  const texts = await page.evaluate(async () => {
    const get = async (path: string) => (await fetch(path, { credentials: 'same-origin' })).json();
    const list = (value: unknown, key: string): Record<string, unknown>[] => (Array.isArray(value) ? value : ((value as Record<string, unknown[]>)[key] ?? [])) as Record<string, unknown>[];
    const session = await get('/api/auth/session');
    const out: unknown[] = [session.user?.name, session.user?.email, session.user?.organisationName];
    for (const f of list(await get('/api/farms'), 'farms')) out.push(f.name);
    for (const t of list(await get('/api/tanks'), 'tanks')) out.push(t.name, t.code, t.contentsNote);
    for (const b of list(await get('/api/brews'), 'brews')) {
      out.push(b.name, b.notes, b.tankName, b.tankCode, b.farmName, b.createdBy);
      for (const i of (b.inputs as Record<string, unknown>[]) ?? []) out.push(i.inputName, i.unit);
    }
    for (const i of list(await get('/api/imports'), 'imports')) out.push(i.originalName, i.uploadedBy, i.tankName);
    return out.filter((v): v is string => typeof v === 'string' && v.trim() !== '');
  });
  const cells = readFileSync(SAMPLE, 'utf8').split(/[\r\n,]+/);
  return [...texts, ...cells, 'mf-f1-date-time-2026-03-26.csv'].sort((a, b) => b.length - a.length);
}

/** The English words the page shows now, without the organisation's data and the line words of the server and the row reader. */
async function englishOnPage(page: Page, english: Set<string>, data: string[]): Promise<string[]> {
  const text = await page.evaluate(() => {
    const skip = document.querySelectorAll('.preview__verdict, .lines td:nth-child(4), [data-testid="imports-dry-run-message"], [data-testid="imports-result-error"], .p-toast');
    const hidden = [...skip].map((el) => (el as HTMLElement).innerText);
    let body = document.body.innerText;
    for (const piece of hidden) body = body.split(piece).join(' ');
    return body;
  });
  return englishWordsIn(text, english, data);
}

async function pick(page: Page, testId: string, option: string) {
  await pickOption(page, testId, option);
  await expect.poll(() => page.getByTestId(testId).innerText()).toContain(option);
  await expect.poll(() => page.locator('.p-select-overlay').count()).toBe(0);
}

/** The page at a phone's width: nothing wider than the screen, still no English word. */
async function onPhone(page: Page, english: Set<string>, data: string[], name: string) {
  await page.setViewportSize(PHONE);
  await page.waitForTimeout(400);
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width);
  expect(await englishOnPage(page, english, data)).toEqual([]);
  await page.evaluate(() => window.scrollTo(0, 0));
  await screenshot(page, name);
  await page.setViewportSize(DESK);
}

const opened: Browser[] = [];
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

describe('Logger files and Brews in Spanish', () => {
  it('preview a logger file with its dry run and work a mix, with no English word of these screens', async () => {
    const browser = await launch({ viewport: DESK, locale: 'es-ES' });
    opened.push(browser);
    const page = browser.page;
    const english = englishOnlyWords();
    // The words looked for are real ones of these screens.
    expect(english.has('refused')).toBe(true);
    expect(english.has('concentrate')).toBe(true);

    await signInAs(page, baseUrl, manager);
    const before = await sessionLanguage(page);
    const restore = before && before !== 'es' ? before : 'en';
    if (before !== 'es') await setLanguage(page, 'es');
    try {
      await page.goto(`${baseUrl}/imports`);
      await expect.poll(() => page.locator('h1').innerText()).toBe('Archivos de registradores');
      await page.getByTestId('imports-farm').waitFor();
      if (!(await page.getByTestId('imports-farm').innerText()).includes('Marrow Flats')) await pick(page, 'imports-farm', 'Marrow Flats');
      await expect.poll(async () => (await page.getByTestId('imports-tank').getAttribute('data-p')) ?? '').not.toContain('disabled');
      if (!(await page.getByTestId('imports-tank').innerText()).includes('MF-F1')) await pick(page, 'imports-tank', 'Fertigation tote (MF-F1)');
      await page.getByTestId('imports-tank-facts').waitFor();
      await page.getByTestId('imports-file-input').setInputFiles(SAMPLE);
      await page.getByTestId('imports-preview').waitFor();
      await expect.poll(() => page.getByTestId('map-ts-format').innerText()).toContain('Día/mes/año, hora en su propia columna');
      await expect.poll(() => page.getByTestId('imports-dry-run').getAttribute('data-state'), { timeout: 30_000 }).toBe('ready');
      expect(await page.getByTestId('imports-dry-run-verdict').innerText()).toMatch(/^Importarlo ahora registra [\d.]+ lecturas nuevas\.$/);
      expect(await page.getByTestId('imports-preview-good').innerText()).toMatch(/^\d+ buenas$/);
      const data = await dataTexts(page);
      expect(await englishOnPage(page, english, data)).toEqual([]);
      await page.evaluate(() => window.scrollTo(0, 0));
      await screenshot(page, 'imports-spanish-desktop');
      await onPhone(page, english, data, 'imports-spanish-phone');

      await page.goto(`${baseUrl}/brews`);
      await expect.poll(() => page.locator('h1').innerText()).toBe('Preparaciones');
      // The list, or the empty state when no brew is logged yet: the skeleton gone either way.
      await expect.poll(() => page.locator('.brews [aria-busy="true"]').count()).toBe(0);
      expect(await englishOnPage(page, english, data)).toEqual([]);
      await screenshot(page, 'brews-spanish-desktop');
      await onPhone(page, english, data, 'brews-spanish-phone');

      await page.getByTestId('brew-new').click();
      await page.getByTestId('brew-dialog').waitFor();
      await page.getByTestId('mix-n').fill('100');
      await page.getByTestId('mix-total').fill('200');
      await page.getByTestId('mix-conv-water').click();
      await expect.poll(() => page.getByTestId('mix-reading-water').innerText()).toBe('1 parte por 100 partes de agua = 1 en 101 en total');
      await expect.poll(() => page.getByTestId('mix-result').innerText()).toMatch(/^Concentrado 1,98 L \+ agua 198,02 L/);
      expect(await englishOnPage(page, english, data)).toEqual([]);
      await screenshot(page, 'brews-spanish-new-brew');
      await page.setViewportSize(PHONE);
      await page.waitForTimeout(400);
      expect(await englishOnPage(page, english, data)).toEqual([]);
      await screenshot(page, 'brews-spanish-new-brew-phone');
    } finally {
      await setLanguage(page, restore);
    }
  });
});
