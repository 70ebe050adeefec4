import { createI18n, type I18nOptions } from 'vue-i18n';
import { setNumberLocale } from '@shared/units';
import { DEFAULT_LANGUAGE, LANGUAGES, LANGUAGE_LOCALES, languageFrom, type Language } from '@shared/i18n/languages';
import { PLURAL_RULES } from '@shared/i18n/plural';
import { knownMessages, sayKnown } from '@shared/i18n/known-messages';
import { useCatalogueZodMessages } from '@shared/i18n/zod-messages';

type Messages = Record<string, unknown>;

// Every area file of every language, bundled: shared/i18n/messages/<language>/<area>.json → messages[language][area].
const files = import.meta.glob<Messages>('../../shared/i18n/messages/*/*.json', { eager: true, import: 'default' });

function messagesByLanguage(): Record<Language, Messages> {
  const out = Object.fromEntries(LANGUAGES.map((language) => [language, {} as Messages])) as Record<Language, Messages>;
  for (const [path, messages] of Object.entries(files)) {
    const match = /messages\/([a-z]+)\/([\w-]+)\.json$/.exec(path);
    if (!match) continue;
    const [, language, area] = match;
    if (language in out) out[language as Language][area] = messages;
  }
  return out;
}

/** The language the browser asks for first among the ones Brimstock speaks (English otherwise). */
export function browserLanguage(): Language {
  return languageFrom(typeof navigator === 'undefined' ? undefined : navigator.languages);
}

// Numbers and dates through vue-i18n's n() and d() use the same locale as the shared formatters.
const numberFormats = Object.fromEntries(
  LANGUAGES.map((language) => [language, { decimal: { style: 'decimal' }, integer: { style: 'decimal', maximumFractionDigits: 0 } }]),
) as unknown as Record<Language, Record<string, Intl.NumberFormatOptions>>;
const datetimeFormats = Object.fromEntries(
  LANGUAGES.map((language) => [
    language,
    {
      date: { dateStyle: 'medium' },
      dateTime: { dateStyle: 'medium', timeStyle: 'short' },
      time: { hour: '2-digit', minute: '2-digit' },
    },
  ]),
) as unknown as Record<Language, Record<string, Intl.DateTimeFormatOptions>>;

const messages = messagesByLanguage();

export const i18n = createI18n({
  legacy: false,
  locale: DEFAULT_LANGUAGE,
  fallbackLocale: DEFAULT_LANGUAGE,
  // Loosely typed on purpose: the areas are read from files, and a typed schema would make every t() call deep.
  messages: messages as NonNullable<I18nOptions['messages']>,
  pluralRules: PLURAL_RULES,
  numberFormats,
  datetimeFormats,
  missingWarn: import.meta.env.DEV,
  fallbackWarn: false,
});

/** The language every screen speaks now. */
export function currentLanguage(): Language {
  return i18n.global.locale.value as Language;
}

/** The BCP 47 locale (for Intl) of the language every screen speaks now: "en-US", "es-ES", "fr-FR". */
export function currentLocale(): string {
  return LANGUAGE_LOCALES[currentLanguage()];
}

// zod's own messages (where a schema gives none) are the English of area `errors`; sayError says them, and the
// schemas' own English messages the catalogue knows, in the screens' language.
const englishErrors = (messages[DEFAULT_LANGUAGE].errors ?? {}) as Record<string, unknown>;
useCatalogueZodMessages(englishErrors);
const knownErrors = knownMessages('errors', englishErrors);

/** A check's message (English, from a shared schema, maybe "field: …") in the screens' language when the catalogue knows it. */
export function sayError(message: string): string {
  if (currentLanguage() === DEFAULT_LANGUAGE) return message;
  return sayKnown(message, knownErrors, (key, named) => i18n.global.t(key, named));
}

type LanguageListener = (language: Language) => void;
const listeners = new Set<LanguageListener>();

/** Calls `listener` after every language change (for settings outside vue-i18n); returns the function that stops it. */
export function onLanguageChange(listener: LanguageListener): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

/** Switches every screen to `language` (a person's choice, or the browser's before they sign in), numbers and dates too. */
export function setLanguage(language: Language): void {
  i18n.global.locale.value = language;
  if (typeof document !== 'undefined') document.documentElement.lang = language;
  for (const listener of listeners) listener(language);
}

// The shared number formatters read the language each time, so a computed figure follows a change of language.
setNumberLocale(currentLocale);

// Before anyone signs in the screens follow the browser; the session store switches to the person's choice.
setLanguage(browserLanguage());
