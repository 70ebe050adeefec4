// The cautions of the flag kinds in every language: the topics' own sentences (shared/cautions) and
// the few a flag adds, said sentence for sentence in Spanish and French.
import type { FlagKind } from '../schemas/index';
import { cautionSentences, everyCautionLanguage, type CautionTopic } from '../cautions/index';
import { DEFAULT_LANGUAGE, LANGUAGES, type Language } from '../i18n/languages';

type Part = { topic: CautionTopic } | { own: Readonly<Record<Language, string>> };

const own = (en: string, es: string, fr: string): Part => ({ own: { en, es, fr } });

/** What each kind's caution is made of, in the order it is read (empty: none applies). */
const PARTS: Readonly<Record<FlagKind, readonly Part[]>> = {
  'low-stock': [],
  'reorder-due': [],
  'suspected-leak': [
    own('Look for the leak from outside the tank.', 'Busque la fuga desde fuera del tanque.', 'Cherchez la fuite depuis l’extérieur de la cuve.'),
    own('Never climb in.', 'Nunca se meta dentro.', 'Ne descendez jamais dedans.'),
    own('A tank is a confined space.', 'Un tanque es un espacio confinado.', 'Une cuve est un espace confiné.'),
    own(
      'If the tank feeds fertilizer or pest solution into a line, check its backflow preventer.',
      'Si el tanque envía fertilizante o solución fitosanitaria a una línea, revise su dispositivo antirretorno.',
      'Si la cuve alimente une conduite en engrais ou en solution phytosanitaire, vérifiez son dispositif anti-retour.',
    ),
    own('Follow your local plumbing code.', 'Siga la normativa local de fontanería.', 'Suivez les règles locales de plomberie.'),
  ],
  'stale-tank': [],
  'cold-culture': [own('Check the heater.', 'Revise el calentador.', 'Vérifiez le réchauffeur.'), { topic: 'electrical' }],
  'frost-risk': [
    own(
      'Drain or cover exposed lines, pumps and small tanks before the frost.',
      'Vacíe o cubra las líneas, bombas y tanques pequeños expuestos antes de la helada.',
      'Vidangez ou couvrez les conduites, pompes et petites cuves exposées avant le gel.',
    ),
    own(
      'Switch pumps off at their residual-current protected supply before you drain them.',
      'Apague las bombas en su alimentación con protección diferencial antes de vaciarlas.',
      'Coupez les pompes à leur alimentation protégée par un différentiel avant de les vidanger.',
    ),
    own('Follow your local codes.', 'Siga la normativa local.', 'Suivez les règles locales.'),
  ],
  'frost-ahead': [{ topic: 'frost' }],
  overfill: [
    own('Stop filling.', 'Deje de llenar.', 'Arrêtez le remplissage.'),
    own(
      'If the tank holds fertilizer or pest solution, nothing may flow back into the water supply.',
      'Si el tanque contiene fertilizante o solución fitosanitaria, nada puede volver a la red de agua.',
      'Si la cuve contient de l’engrais ou une solution phytosanitaire, rien ne doit refluer dans le réseau d’eau.',
    ),
    own(
      'Your local plumbing code says which backflow prevention it needs.',
      'La normativa local de fontanería indica qué protección antirretorno necesita.',
      'Les règles locales de plomberie disent quelle protection anti-retour il faut.',
    ),
    own(
      'Wear the protective equipment the product label lists to clean up a spill.',
      'Para limpiar un derrame, use el equipo de protección que indica la etiqueta del producto.',
      'Pour nettoyer un déversement, portez l’équipement de protection indiqué sur l’étiquette du produit.',
    ),
  ],
};

/** The caution of a flag kind as sentences in `language` (English by default; empty: none applies). */
export function flagCautionSentences(kind: FlagKind, language: Language = DEFAULT_LANGUAGE): readonly string[] {
  return PARTS[kind].flatMap((part) => ('topic' in part ? cautionSentences(part.topic, language) : [part.own[language]]));
}

/** The caution of a flag kind as one paragraph in `language`, or null when none applies. */
export function flagCautionText(kind: FlagKind, language: Language = DEFAULT_LANGUAGE): string | null {
  const sentences = flagCautionSentences(kind, language);
  return sentences.length ? sentences.join(' ') : null;
}

let byEnglish: Map<string, Readonly<Record<Language, string>>> | null = null;

/** Every caution sentence Brimstock writes, by its English words. */
function sentencesByEnglish(): Map<string, Readonly<Record<Language, string>>> {
  if (byEnglish) return byEnglish;
  byEnglish = new Map();
  const all = everyCautionLanguage();
  for (const topic of Object.keys(all.en) as CautionTopic[]) {
    all.en[topic].forEach((sentence, i) => byEnglish!.set(sentence, Object.fromEntries(LANGUAGES.map((l) => [l, all[l][topic][i]])) as Record<Language, string>));
  }
  for (const parts of Object.values(PARTS)) for (const part of parts) if ('own' in part) byEnglish.set(part.own.en, part.own);
  return byEnglish;
}

/** English caution sentences (a topic's or a flag kind's) said in `language`; a sentence not among them stays as given. */
export function cautionSentencesIn(sentences: readonly string[], language: Language): string[] {
  if (language === DEFAULT_LANGUAGE) return [...sentences];
  const known = sentencesByEnglish();
  return sentences.map((s) => known.get(s)?.[language] ?? s);
}

/** The caution of every flag kind as sentences in `language` (English by default). */
export function everyFlagCaution(language: Language = DEFAULT_LANGUAGE): Record<FlagKind, readonly string[]> {
  return Object.fromEntries((Object.keys(PARTS) as FlagKind[]).map((kind) => [kind, flagCautionSentences(kind, language)])) as Record<FlagKind, readonly string[]>;
}
