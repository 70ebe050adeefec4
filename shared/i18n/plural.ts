// Which plural form of a message ("zero | one | many" or "one | many") a count takes, per language.
import type { Language } from './languages';

/** vue-i18n plural rule: the index of the form for `choice` among `choicesLength` forms. */
export type PluralRule = (choice: number, choicesLength: number) => number;

// English and Spanish: 1 is singular, 0 and the rest plural. French: 0 and 1 are singular (CLDR plural
// rules, "one" category for i = 0,1 in French; unicode.org/cldr/charts/latest/supplemental/language_plural_rules.html).
const oneIsSingular: PluralRule = (choice, choicesLength) => {
  const n = Math.abs(choice);
  if (choicesLength === 3) return n === 0 ? 0 : n === 1 ? 1 : 2;
  return n === 1 ? 0 : 1;
};
const zeroAndOneSingular: PluralRule = (choice, choicesLength) => {
  const n = Math.abs(choice);
  if (choicesLength === 3) return n === 0 ? 0 : n < 2 ? 1 : 2;
  return n < 2 ? 0 : 1;
};

/** The plural rule of each language, for vue-i18n's `pluralRules` on the client and the server. */
export const PLURAL_RULES: Record<Language, PluralRule> = { en: oneIsSingular, es: oneIsSingular, fr: zeroAndOneSingular };
