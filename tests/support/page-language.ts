// What the browser tests in Spanish and French share: the message catalogues read straight from
// shared/i18n/messages, the words of a text, the English words a page still shows once the
// organisation's own data (names, notes) is taken out, and the signed-in person's language.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { expect } from 'vitest';
import type { Page } from 'playwright-core';

type Messages = { [key: string]: string | Messages };
export const messagesDir = join(process.cwd(), 'shared', 'i18n', 'messages');

/** One area's messages in `language` (none when the file is absent). */
export function readArea(language: string, area: string): Messages {
  try {
    return JSON.parse(readFileSync(join(messagesDir, language, `${area}.json`), 'utf8')) as Messages;
  } catch {
    return {};
  }
}

/** Every message of an area, by its dotted key. */
export function flatten(messages: Messages, prefix = ''): Map<string, string> {
  const out = new Map<string, string>();
  for (const [key, value] of Object.entries(messages)) {
    if (typeof value === 'string') out.set(`${prefix}${key}`, value);
    else for (const [k, v] of flatten(value, `${prefix}${key}.`)) out.set(k, v);
  }
  return out;
}

/** The lower-case words of a text: letters only, placeholders and literals such as {'%'} left out. */
export function wordsOf(text: string): string[] {
  return text
    .replace(/\{[^}]*\}/g, ' ')
    .toLowerCase()
    .split(/[^\p{L}]+/u)
    .filter((w) => w.length > 1);
}

/** The words of `text` found in `english`, each once, after the organisation's own `data` (longest first) is cut out of it. */
export function englishWordsIn(text: string, english: Set<string>, data: readonly string[]): string[] {
  let rest = text;
  for (const value of data) rest = rest.split(value).join(' ');
  return [...new Set(wordsOf(rest).filter((w) => english.has(w)))];
}

/** The signed-in person's language as the session answers it. */
export async function sessionLanguage(page: Page): Promise<string | null> {
  return page.evaluate(async () => ((await (await fetch('/api/auth/session')).json()) as { user: { language: string | null } }).user.language);
}

/** Sets the signed-in person's language through their own profile (with the CSRF token). */
export async function setLanguage(page: Page, language: string): Promise<void> {
  const status = await page.evaluate(async (lang) => {
    const { csrfToken } = (await (await fetch('/api/auth/session')).json()) as { csrfToken: string };
    const res = await fetch('/api/auth/me', { method: 'PATCH', headers: { 'Content-Type': 'application/json', 'X-CSRF-Token': csrfToken }, body: JSON.stringify({ language: lang }) });
    return res.status;
  }, language);
  expect(status).toBe(200);
}
