// Every language says everything English says: the same keys in each area file, the same
// placeholders, the same number of plural forms; and every key the screens ask for exists.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { DEFAULT_LANGUAGE, LANGUAGES } from '@shared/i18n/languages';

const ROOT = resolve(import.meta.dirname, '../..');
const MESSAGES = join(ROOT, 'shared/i18n/messages');

type Tree = { [key: string]: string | Tree };

/** Every message of a tree as dotted key → text. */
function flatten(tree: Tree, prefix = ''): Map<string, string> {
  const out = new Map<string, string>();
  for (const [key, value] of Object.entries(tree)) {
    const path = prefix ? `${prefix}.${key}` : key;
    if (typeof value === 'string') out.set(path, value);
    else for (const [k, v] of flatten(value, path)) out.set(k, v);
  }
  return out;
}

function areasOf(language: string): string[] {
  return readdirSync(join(MESSAGES, language))
    .filter((f) => f.endsWith('.json'))
    .map((f) => f.slice(0, -'.json'.length))
    .sort();
}

function messagesOf(language: string, area: string): Map<string, string> {
  const file = join(MESSAGES, language, `${area}.json`);
  try {
    return flatten(JSON.parse(readFileSync(file, 'utf8')) as Tree, area);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return new Map();
    throw new Error(`${relative(ROOT, file)} is not valid JSON: ${(error as Error).message}`);
  }
}

// Literal text ({'@'}, {'|'}) is no placeholder and no plural bar.
const withoutLiterals = (text: string) => text.replace(/\{\s*'[^']*'\s*\}/g, '');
/** The named placeholders of a message, sorted and deduplicated ("{tank} at {time}" → tank, time). */
export function placeholdersOf(text: string): string[] {
  return [...new Set([...withoutLiterals(text).matchAll(/\{\s*([A-Za-z_][\w]*)\s*\}/g)].map((m) => m[1]))].sort();
}
/** How many plural forms a message has ("a | b | c" → 3; no bar → 1). */
export function pluralFormsOf(text: string): number {
  return withoutLiterals(text).split('|').length;
}

/** Per language, what is wrong against English: missing keys, extra keys, placeholders, plural forms. */
function problemsOf(language: string): string[] {
  const problems: string[] = [];
  const areas = [...new Set([...areasOf(DEFAULT_LANGUAGE), ...areasOf(language)])].sort();
  for (const area of areas) {
    const english = messagesOf(DEFAULT_LANGUAGE, area);
    const other = messagesOf(language, area);
    for (const [key, text] of english) {
      const translated = other.get(key);
      if (translated === undefined) {
        problems.push(`${language}: missing ${key}`);
        continue;
      }
      const want = placeholdersOf(text);
      const missing = want.filter((p) => !placeholdersOf(translated).includes(p));
      if (missing.length) problems.push(`${language}: ${key} lacks {${missing.join('}, {')}}`);
      if (pluralFormsOf(text) !== pluralFormsOf(translated)) problems.push(`${language}: ${key} has ${pluralFormsOf(translated)} plural forms, English ${pluralFormsOf(text)}`);
    }
    for (const key of other.keys()) if (!english.has(key)) problems.push(`${language}: ${key} is not in English`);
  }
  return problems;
}

/** Every file under `dir` ending in one of `exts`. */
function filesUnder(dir: string, exts: string[]): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) out.push(...filesUnder(path, exts));
    else if (exts.some((e) => name.endsWith(e))) out.push(path);
  }
  return out;
}

/** The literal keys a source file asks for: t('…'), $t('…'), i18n.global.t('…'), keypath="…". */
export function literalKeysIn(source: string): string[] {
  const calls = [...source.matchAll(/(?<![\w$])\$?t[ec]?\(\s*(['"])([A-Za-z][\w-]*(?:\.[\w-]+)+)\1/g)].map((m) => m[2]);
  const keypaths = [...source.matchAll(/\bkeypath="([A-Za-z][\w-]*(?:\.[\w-]+)+)"/g)].map((m) => m[1]);
  return [...calls, ...keypaths];
}

describe('message catalogues', () => {
  it('finds placeholders, plural forms and literal keys as vue-i18n reads them', () => {
    expect(placeholdersOf("{n} at {time}{'@'}{n}")).toEqual(['n', 'time']);
    expect(pluralFormsOf("no readings | {n} reading | {n} readings")).toBe(3);
    expect(pluralFormsOf("A {'|'} B")).toBe(1);
    expect(literalKeysIn(`t('round.send') $t("app.title") i18n.global.t('words.age.never', { n }) format('x.y') keypath="round.card.check"`)).toEqual([
      'round.send',
      'app.title',
      'words.age.never',
      'round.card.check',
    ]);
  });

  it.each(LANGUAGES.filter((l) => l !== DEFAULT_LANGUAGE))('has every English key in %s, with its placeholders and plural forms, and no other', (language) => {
    expect(problemsOf(language)).toEqual([]);
  });

  it('has every key the client asks for by name in English', () => {
    const english = new Set(areasOf(DEFAULT_LANGUAGE).flatMap((area) => [...messagesOf(DEFAULT_LANGUAGE, area).keys()]));
    const missing: string[] = [];
    for (const file of filesUnder(join(ROOT, 'src'), ['.vue', '.ts'])) {
      for (const key of literalKeysIn(readFileSync(file, 'utf8'))) if (!english.has(key)) missing.push(`${relative(ROOT, file)}: ${key}`);
    }
    expect(missing).toEqual([]);
  });
});
