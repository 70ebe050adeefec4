import { describe, expect, it } from 'vitest';
import { CAUTION_TOPICS, cautionSentences, cautionText, cautionTitle, everyCautionLanguage } from '@shared/cautions';
import { cautionSentencesIn, flagCautionSentences, flagCautionText } from '@shared/flags';
import { LANGUAGES } from '@shared/i18n/languages';
import { FLAG_KINDS } from '@shared/schemas';

const OTHERS = LANGUAGES.filter((l) => l !== 'en');
// The word each language defers with ("local codes", "normativa local", "règles locales").
const LOCAL = { en: /\blocal\b/, es: /\blocal(es)?\b/, fr: /\blocales?\b/ } as const;
// The trade's words each caution must carry in each language (shared/i18n/GLOSSARY.md; recalled from
// general usage, no single published source).
const TERMS: [string, Partial<Record<(typeof LANGUAGES)[number], RegExp>>][] = [
  ['confined-space', { en: /confined space/, es: /espacio confinado/, fr: /espace confiné/ }],
  ['electrical', { en: /residual-current protection/, es: /protección diferencial/, fr: /différentiel/ }],
  ['backflow', { en: /backflow preventer/, es: /antirretorno/, fr: /anti-retour/ }],
  ['frost', { en: /residual-current protection/, es: /protección diferencial/, fr: /différentiel/ }],
];

describe('cautions in every language', () => {
  it.each(CAUTION_TOPICS.flatMap((topic) => OTHERS.map((language) => [topic, language] as const)))('says the %s caution sentence for sentence in %s', (topic, language) => {
    const english = cautionSentences(topic);
    const translated = cautionSentences(topic, language);
    expect(translated).toHaveLength(english.length);
    for (const sentence of translated) {
      expect(sentence).toMatch(/^[A-ZÁÉÍÓÚÑÀÂÇÈÊÎÔÙ].*\.$/u);
      expect(sentence).not.toMatch(/[;—–]/);
      expect(sentence).not.toEqual(english[translated.indexOf(sentence)]);
    }
    expect(cautionText(topic, language)).toMatch(LOCAL[language]);
    expect(cautionTitle(topic, language)).not.toBe(cautionTitle(topic));
  });

  it.each(TERMS.flatMap(([topic, terms]) => Object.entries(terms).map(([language, term]) => [topic, language, term] as const)))('writes the %s caution in %s with the trade term %s', (topic, language, term) => {
    expect(cautionText(topic as (typeof CAUTION_TOPICS)[number], language as (typeof LANGUAGES)[number])).toMatch(term);
  });

  it.each(FLAG_KINDS.flatMap((kind) => OTHERS.map((language) => [kind, language] as const)))('says the %s flag caution in %s, and reads its English back into it', (kind, language) => {
    const english = flagCautionSentences(kind);
    const translated = flagCautionSentences(kind, language);
    expect(translated).toHaveLength(english.length);
    expect(cautionSentencesIn(english, language)).toEqual(translated);
    if (english.length) expect(flagCautionText(kind, language)).toMatch(LOCAL[language]);
    else expect(flagCautionText(kind, language)).toBeNull();
  });

  it('leaves a sentence it does not know as given, and English as it is', () => {
    expect(cautionSentencesIn(['Mind the gap.', 'A tank is a confined space.'], 'es')).toEqual(['Mind the gap.', 'Un tanque es un espacio confinado.']);
    expect(cautionSentencesIn(cautionSentences('backflow'), 'en')).toEqual(cautionSentences('backflow'));
    expect(Object.keys(everyCautionLanguage())).toEqual([...LANGUAGES]);
  });
});
