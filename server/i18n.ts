// The server's translator: mails, texts, PDFs and API error messages in the language of the person
// who gets them, from the same catalogues as the screens (shared/i18n/messages/<language>/<area>.json),
// through vue-i18n's core (no Vue on the server).
import { readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import type { Request } from 'express';
import {
  compile,
  createCoreContext,
  fallbackWithLocaleChain,
  registerLocaleFallbacker,
  registerMessageCompiler,
  registerMessageResolver,
  resolveValue,
  translate,
  type CoreContext,
  type LocaleMessage,
  type NamedValue,
} from '@intlify/core-base';
import { DEFAULT_LANGUAGE, LANGUAGES, LANGUAGE_LOCALES, isLanguage, type Language } from '@shared/i18n/languages';
import { PLURAL_RULES } from '@shared/i18n/plural';
import { knownMessages, localiseDayTime, localiseFigures, sayKnown } from '@shared/i18n/known-messages';
import { useCatalogueZodMessages } from '@shared/i18n/zod-messages';

const MESSAGES_DIR = resolve(import.meta.dirname, '../shared/i18n/messages');

type Messages = LocaleMessage<string>;

/** Every area file of every language, read once: messages[language][area]. */
function readMessages(dir = MESSAGES_DIR): Record<Language, Messages> {
  const out = Object.fromEntries(LANGUAGES.map((language) => [language, {} as Messages])) as Record<Language, Messages>;
  for (const language of LANGUAGES) {
    for (const file of readdirSync(join(dir, language)).filter((f) => f.endsWith('.json'))) {
      out[language][file.slice(0, -'.json'.length)] = JSON.parse(readFileSync(join(dir, language, file), 'utf8')) as Messages;
    }
  }
  return out;
}

let context: CoreContext<string> | null = null;
let catalogue: Record<Language, Messages> | null = null;

function messages(): Record<Language, Messages> {
  catalogue ??= readMessages();
  return catalogue;
}

function core(): CoreContext<string> {
  if (context) return context;
  registerMessageCompiler(compile);
  registerMessageResolver(resolveValue);
  registerLocaleFallbacker(fallbackWithLocaleChain);
  context = createCoreContext({
    locale: DEFAULT_LANGUAGE,
    fallbackLocale: DEFAULT_LANGUAGE,
    messages: messages(),
    pluralRules: PLURAL_RULES,
    missingWarn: false,
    fallbackWarn: false,
  }) as CoreContext<string>;
  return context;
}

function englishArea(area: string): Messages {
  return (messages()[DEFAULT_LANGUAGE][area] ?? {}) as Messages;
}

/** Makes zod's own messages the English of area `errors`, which errorIn then says in the asker's language (createApp calls it). */
export function applyCatalogueMessages(): void {
  useCatalogueZodMessages(englishArea('errors'));
}

let knownErrors: ReturnType<typeof knownMessages> | null = null;

/** An API error message (English, from a service or a schema, maybe "field: …") in `language` when the catalogue knows it. */
export function errorIn(message: string, language: Language): string {
  if (language === DEFAULT_LANGUAGE) return message;
  knownErrors ??= knownMessages('errors', englishArea('errors'));
  return sayKnown(message, knownErrors, (key, named) => tr(language, key, named));
}

/** A translating function bound to one language: `t('mail.flag.subject', { count })`, `t('texts.digest', { n }, n)` for plurals. */
export type Translate = (key: string, named?: NamedValue, plural?: number) => string;

/** The message `key` ("<area>.<key>") in `language` (English when that language lacks it), with `{placeholders}` filled. */
export function tr(language: Language, key: string, named: NamedValue = {}, plural?: number): string {
  const ctx = core();
  const options = plural === undefined ? { locale: language } : { locale: language, plural };
  const out = translate(ctx, key, named, options);
  return typeof out === 'string' ? out : key;
}

/** The translating function of one language. */
export function translatorFor(language: Language): Translate {
  return (key, named, plural) => tr(language, key, named, plural);
}

/** A stored language, or English when none was chosen or it is not one Brimstock speaks. */
export function languageOr(value: unknown, fallback: Language = DEFAULT_LANGUAGE): Language {
  return isLanguage(value) ? value : fallback;
}

/** The language a request's Accept-Language asks for first among Brimstock's (English when none matches or it names none). */
export function acceptedLanguage(req: Pick<Request, 'acceptsLanguages'>): Language {
  const match = req.acceptsLanguages(...LANGUAGES);
  return isLanguage(match) ? match : DEFAULT_LANGUAGE;
}

/** The language the request's Accept-Language names, or null when it sends none (a script, not a browser). */
export function browserLanguageOf(req: Pick<Request, 'acceptsLanguages' | 'get'>): Language | null {
  return req.get('accept-language') ? acceptedLanguage(req) : null;
}

/** The language to answer a request in: the signed-in person's choice, else what the browser asks for. */
export function requestLanguage(req: Request): Language {
  return isLanguage(req.actor?.language) ? req.actor.language : acceptedLanguage(req);
}

/** A flag kind's key in area `flagKinds` ("low-stock" → "lowStock"). */
export function flagKindKey(kind: string): string {
  return kind.replace(/-(\w)/g, (_m, c: string) => c.toUpperCase());
}

/** A flag kind's name in `language` ("Running low", "Queda poco"). */
export function flagLabelIn(kind: string, language: Language): string {
  return tr(language, `flagKinds.label.${flagKindKey(kind)}`);
}

let knownFlagMessages: ReturnType<typeof knownMessages> | null = null;

/** A stored flag sentence (English) in `language`, its names and figures kept (figures written as the language writes them). */
export function flagMessageIn(message: string, language: Language): string {
  if (language === DEFAULT_LANGUAGE) return message;
  knownFlagMessages ??= knownMessages('flagKinds.message', (englishArea('flagKinds').message ?? {}) as Messages);
  const locale = LANGUAGE_LOCALES[language];
  return sayKnown(message, knownFlagMessages, (key, named) => {
    const values = localiseFigures(named, locale);
    if (values.when) values.when = localiseDayTime(values.when, locale);
    return tr(language, key, values);
  });
}
