import { createI18n } from 'vue-i18n';
import { DEFAULT_LANGUAGE, LANGUAGES, LANGUAGE_LOCALES, type Language } from '@shared/i18n/languages';

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

export const i18n = createI18n({
  legacy: false,
  locale: DEFAULT_LANGUAGE,
  fallbackLocale: DEFAULT_LANGUAGE,
  messages: messagesByLanguage(),
  // Numbers and dates through Intl in the language's own locale (see LANGUAGE_LOCALES).
  missingWarn: import.meta.env.DEV,
  fallbackWarn: false,
});

/** Switches every screen to `language` (a person's choice, or the browser's before they sign in). */
export function setLanguage(language: Language): void {
  i18n.global.locale.value = language;
  if (typeof document !== 'undefined') document.documentElement.lang = LANGUAGE_LOCALES[language].split('-')[0];
}
