// Browser test of the round in Spanish: Chromium speaking es-ES signs the demo worker in (the first
// sign-in takes the browser's language; a worker whose language an earlier English sign-in already set
// is switched to Spanish on the Profile API, and set back afterwards), walks every tank of Hollin Ridge
// typing numbers with a decimal comma ("600,5", "24,5"), answers any question the round asks and sends.
// On Home, and on the round before and after sending (navigation included, at 1280 px and with the
// phone's menu open at 360 px), the page holds no English word: none of the English messages of the
// areas and cautions on the page that the Spanish ones do not also use, nor a short list of common ones.
import { afterEach, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { CAUTION_TOPICS, CAUTION_WORD, cautionText, cautionTitle } from '@shared/cautions';
import { readScenario } from '../../server/services/demo';
import { launch, pickOption, screenshot, signInAs, type Browser } from '../support/browser';
import { englishWordsIn, flatten, readArea, sessionLanguage, setLanguage, wordsOf } from '../support/page-language';

const { baseUrl } = inject('app');
const worker = readScenario().people.find((p) => p.role === 'worker')!;
const DESK = { width: 1280, height: 860 };
const PHONE = { width: 360, height: 740 };

/** The message areas the round page shows: its own, the frame and navigation, shared words, and the other areas' pieces it embeds. */
const AREAS = ['app', 'round', 'home', 'common', 'words', 'tank', 'errors'];
/** Common English words a screen in Spanish should never show (the brief's list, and the round's own nouns). */
const COMMON_ENGLISH = ['the', 'and', 'of', 'tank', 'tanks', 'reading', 'readings', 'send', 'sent', 'litres', 'liters', 'ready', 'round', 'stored', 'usable', 'last', 'yet', 'waiting', 'water', 'culture', 'with', 'your', 'this', 'is', 'are', 'not', 'sign', 'out', 'home', 'farm', 'farms', 'flags', 'inputs', 'brews'];

/** The cautions as the page may show them (shared/cautions keeps their words), in `language`. */
function cautionTexts(language: 'en' | 'es'): string[] {
  return [CAUTION_WORD[language], ...CAUTION_TOPICS.flatMap((topic) => [cautionTitle(topic, language), cautionText(topic, language)])];
}

/** English words of the areas' messages and the cautions whose Spanish differs, less every word Spanish itself uses (no, a, de, use…). */
function englishOnlyWords(): Set<string> {
  const english = new Set<string>([...COMMON_ENGLISH, ...cautionTexts('en').flatMap(wordsOf)]);
  const spanish = new Set<string>(cautionTexts('es').flatMap(wordsOf));
  for (const area of AREAS) {
    const es = flatten(readArea('es', area));
    for (const [key, text] of flatten(readArea('en', area))) {
      const translated = es.get(key);
      if (translated !== undefined && translated !== text) for (const w of wordsOf(text)) english.add(w);
    }
    for (const text of es.values()) for (const w of wordsOf(text)) spanish.add(w);
  }
  for (const w of spanish) english.delete(w);
  return english;
}

/** The organisation's own data the pages show (names of the farms, their tanks, the person; places and notes), which are not the app's words. */
async function dataTexts(page: Page): Promise<string[]> {
  const texts = await page.evaluate(async () => {
    const get = async (path: string) => (await fetch(path, { credentials: 'same-origin' })).json();
    const session = await get('/api/auth/session');
    const farms = await get('/api/farms');
    const tanks = await get('/api/tanks');
    const list = (value: unknown, key: string): Record<string, unknown>[] => (Array.isArray(value) ? value : ((value as Record<string, unknown[]>)[key] ?? [])) as Record<string, unknown>[];
    const out: unknown[] = [session.user?.name, session.user?.email, session.user?.organisationName];
    for (const f of list(farms, 'farms')) out.push(f.name, f.location);
    for (const t of list(tanks, 'tanks')) out.push(t.name, t.code, t.contentsNote);
    return out.filter((v): v is string => typeof v === 'string' && v.trim() !== '');
  });
  // Longest first, so a name inside another is not cut out of it first.
  return texts.sort((a, b) => b.length - a.length);
}

/** The English words the page shows now, the organisation's own data taken out of its text first. */
async function englishOnPage(page: Page, english: Set<string>, data: string[]): Promise<string[]> {
  const text = await page.evaluate(() => document.body.innerText);
  return englishWordsIn(text, english, data);
}

const opened: Browser[] = [];
afterEach(async () => {
  while (opened.length) await opened.pop()!.close();
});

describe('the round in Spanish', () => {
  it('lets a Spanish-speaking worker walk and send a whole round with decimal commas, with no English word on the page', async () => {
    const browser = await launch({ viewport: DESK, locale: 'es-ES' });
    opened.push(browser);
    const page = browser.page;
    const english = englishOnlyWords();
    // The words the test looks for are real ones of the catalogues.
    expect(english.has('stored')).toBe(true);
    expect(english.has('sight')).toBe(true);

    // Before signing in the screens already follow the browser.
    await page.goto(`${baseUrl}/sign-in`);
    await expect.poll(() => page.locator('html').getAttribute('lang')).toBe('es');
    expect(await page.getByTestId('signin-submit').innerText()).toBe('Iniciar sesión');

    await signInAs(page, baseUrl, worker);
    const before = await sessionLanguage(page);
    // Null until chosen: this sign-in took the browser's language unless an earlier (English) one did. The
    // other browser tests sign this worker in from an English Chromium, so English is what it goes back to.
    const restore = before && before !== 'es' ? before : 'en';
    if (before !== 'es') await setLanguage(page, 'es');
    try {
      // Home first: the worker's start page, with the way to the round.
      await page.goto(`${baseUrl}/`);
      await page.getByTestId('home-round').waitFor();
      await page.getByTestId('home-farm-count').waitFor();
      const data = await dataTexts(page);
      expect(await page.getByTestId('home-round').innerText()).toMatch(/^Empiece su ronda de lecturas/);
      expect(await englishOnPage(page, english, data)).toEqual([]);
      await screenshot(page, 'round-spanish-home');

      await page.goto(`${baseUrl}/round`);
      await pickOption(page, 'round-farm', 'Hollin Ridge');
      const cards = page.locator('[data-testid^="round-tank-"]');
      await cards.first().waitFor();
      expect(await page.locator('h1').innerText()).toBe('Ronda');
      // The worker's links fit one row of the bar in Spanish too.
      const rows = await page.evaluate(() => document.querySelector('.navbar__links')!.getBoundingClientRect().height / document.querySelector('.navbar__link')!.getBoundingClientRect().height);
      expect(Math.round(rows)).toBe(1);

      await page.evaluate(() => window.scrollTo(0, 0));
      await screenshot(page, 'round-spanish-desktop-before');
      expect(await englishOnPage(page, english, data)).toEqual([]);

      // Every tank: the culture cones with a temperature in their safe range, each with a decimal comma.
      const codes = await cards.evaluateAll((els) => els.map((el) => el.getAttribute('data-testid')!.replace('round-tank-', '')));
      expect(codes).toEqual(expect.arrayContaining(['HR-W1', 'HR-C1', 'HR-C2', 'HR-P1']));
      const readings: Record<string, string> = { 'HR-W1': '1140,5', 'HR-C1': '800,5', 'HR-C2': '700,5', 'HR-P1': '600,5' };
      for (const code of codes) {
        await page.getByTestId(`round-input-${code}`).fill(readings[code] ?? '500,5');
        const temperature = page.getByTestId(`round-temperature-${code}`);
        if (await temperature.count()) await temperature.fill('24,5');
      }
      // 600,5 mm in the 950 mm drum is read as six hundred millimetres and a half, not refused nor grouped.
      await expect.poll(() => page.getByTestId('round-stock-HR-P1-usable').innerText()).toMatch(/^[\d.]+ L$/);
      expect(await page.getByTestId('round-read-as-HR-P1').count()).toBe(0);
      expect(await page.locator('[data-testid^="round-error-"]').count()).toBe(0);
      // A stock far from the last reading (left by the browser tests before) is asked about: answered "Sí".
      for (const code of codes) {
        const confirm = page.getByTestId(`round-tank-${code}`).getByText('Sí, es correcta');
        if (await confirm.count()) await confirm.click();
      }
      await expect.poll(() => page.getByTestId('round-progress').innerText()).toBe(`${codes.length} de ${codes.length} tanques listos`);
      expect(await page.getByTestId('round-submit').innerText()).toBe(`Enviar ${codes.length} lecturas`);
      expect(await englishOnPage(page, english, data)).toEqual([]);
      await screenshot(page, 'round-spanish-desktop-typed');

      await page.getByTestId('round-submit').click();
      await expect.poll(() => page.getByTestId('round-summary').innerText(), { timeout: 8000 }).toContain(`${codes.length} registradas`);
      for (const code of codes) expect(await page.getByTestId(`round-result-${code}`).innerText()).toBe('Registrada');
      // The live region is emptied and then filled a tick after the summary shows, so it is polled.
      await expect.poll(() => page.getByTestId('round-announcement').innerText()).toBe(`Ronda enviada: ${codes.length} registradas. Ronda registrada.`);
      await page.waitForTimeout(400);
      expect(await englishOnPage(page, english, data)).toEqual([]);
      await page.evaluate(() => window.scrollTo(0, 0));
      await screenshot(page, 'round-spanish-desktop-sent');

      // On a phone: the page and its menu, in Spanish too.
      await page.setViewportSize(PHONE);
      await page.getByTestId('nav-menu').click();
      await page.locator('.nav-drawer').waitFor();
      await page.waitForTimeout(400);
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width);
      expect(await englishOnPage(page, english, data)).toEqual([]);
      await screenshot(page, 'round-spanish-phone-menu');
      await page.keyboard.press('Escape');
      await page.locator('.nav-drawer').waitFor({ state: 'hidden' });
      await page.evaluate(() => window.scrollTo(0, 0));
      await screenshot(page, 'round-spanish-phone-sent');
    } finally {
      await setLanguage(page, restore);
    }
  });
});
