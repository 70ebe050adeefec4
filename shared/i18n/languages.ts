/**
 * The languages Brimstock speaks. Every message lives in shared/i18n/messages/<language>/<area>.json,
 * one file per area of the app (named after its folder: round, tank, board…), so translators of
 * different areas never edit the same file. The key of a message is `<area>.<key inside the file>`.
 */
export const LANGUAGES = ['en', 'es', 'fr'] as const;
export type Language = (typeof LANGUAGES)[number];
export const DEFAULT_LANGUAGE: Language = 'en';

/** Each language's name in its own words, as a person looking for it will recognise it. */
export const LANGUAGE_NAMES: Record<Language, string> = { en: 'English', es: 'Español', fr: 'Français' };

/** The locale numbers and dates are written in for each language (BCP 47, for Intl). */
export const LANGUAGE_LOCALES: Record<Language, string> = { en: 'en-US', es: 'es-ES', fr: 'fr-FR' };

export function isLanguage(value: unknown): value is Language {
  return typeof value === 'string' && (LANGUAGES as readonly string[]).includes(value);
}

/**
 * The first of the given BCP 47 tags (a browser's navigator.languages, or an Accept-Language list
 * already split) that Brimstock speaks, by its primary subtag ("es-MX" → "es"); English otherwise.
 */
export function languageFrom(tags: string | readonly string[] | undefined | null): Language {
  const list = typeof tags === 'string' ? [tags] : (tags ?? []);
  for (const tag of list) {
    const primary = tag.trim().toLowerCase().split(/[-_;]/)[0];
    if (isLanguage(primary)) return primary;
  }
  return DEFAULT_LANGUAGE;
}
