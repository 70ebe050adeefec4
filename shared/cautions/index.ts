// Safety cautions: the one place their words live, for the screens, the mails, the PDFs and the flags,
// in every language Brimstock speaks. Short plain sentences; each caution ends by deferring to local
// codes, the label or licensed practice. The Spanish and French say the same thing sentence for
// sentence, in the words the trade uses (shared/i18n/GLOSSARY.md); translated from the English here,
// not from any published safety text.
import { DEFAULT_LANGUAGE, type Language } from '../i18n/languages';

/** The kinds of caution the product shows. */
export const CAUTION_TOPICS = ['confined-space', 'electrical', 'backflow', 'pest-solution', 'pest-control-storage', 'frost'] as const;
/** A kind of caution. */
export type CautionTopic = (typeof CAUTION_TOPICS)[number];

type Sentences = Readonly<Record<CautionTopic, readonly string[]>>;

const EN: Sentences = {
  'confined-space': [
    'Work from outside the tank.',
    'Never climb in or put your head through the opening.',
    'A tank is a confined space.',
    'Only trained people may go in, under your local confined-space rules.',
  ],
  electrical: [
    'Heaters and pumps need a circuit with residual-current protection (RCD or GFCI).',
    'A licensed electrician should install it to your local electrical code.',
  ],
  backflow: [
    'Fertilizer and pest solution must never flow back into a water supply.',
    'Fit a backflow preventer where a line from this tank meets a water line.',
    'Your local plumbing code says which kind.',
  ],
  'pest-solution': [
    'Wear the protective equipment the product label lists.',
    'Mix it outdoors or where the air moves freely.',
    'Keep the tank labelled with what it holds.',
    'Follow the label and your local rules.',
  ],
  'pest-control-storage': [
    'Store pest-control products locked up and labelled.',
    'Keep them away from food and water.',
    'Wear the protective equipment the product label lists.',
    'Follow the label and your local rules.',
  ],
  frost: [
    'Before the frost, drain exposed lines, hoses and pumps, or cover and lag them.',
    'Cover small tanks, or keep them warm with a heater made for the job.',
    'Heaters must run on a circuit with residual-current protection (RCD or GFCI).',
    'Press its test button to check that it trips.',
    'Follow local practice and your local electrical code.',
  ],
};

const ES: Sentences = {
  'confined-space': [
    'Trabaje desde fuera del tanque.',
    'Nunca se meta dentro ni asome la cabeza por la boca.',
    'Un tanque es un espacio confinado.',
    'Solo puede entrar personal formado, según las normas locales de espacios confinados.',
  ],
  electrical: [
    'Los calentadores y las bombas necesitan un circuito con protección diferencial (interruptor diferencial).',
    'Debe instalarlo un electricista autorizado según la normativa eléctrica local.',
  ],
  backflow: [
    'El fertilizante y la solución fitosanitaria nunca deben volver a la red de agua.',
    'Instale un dispositivo antirretorno donde una línea de este tanque se une a una de agua.',
    'La normativa local de fontanería indica de qué tipo.',
  ],
  'pest-solution': [
    'Use el equipo de protección que indica la etiqueta del producto.',
    'Prepárela al aire libre o donde el aire circule bien.',
    'Mantenga el tanque etiquetado con lo que contiene.',
    'Siga la etiqueta y las normas locales.',
  ],
  'pest-control-storage': [
    'Guarde los productos fitosanitarios bajo llave y etiquetados.',
    'Manténgalos lejos de alimentos y del agua.',
    'Use el equipo de protección que indica la etiqueta del producto.',
    'Siga la etiqueta y las normas locales.',
  ],
  frost: [
    'Antes de la helada, vacíe las líneas, mangueras y bombas expuestas, o cúbralas y aíslelas.',
    'Cubra los tanques pequeños o manténgalos calientes con un calentador adecuado.',
    'Los calentadores deben ir en un circuito con protección diferencial (interruptor diferencial).',
    'Pulse su botón de prueba para comprobar que salta.',
    'Siga la práctica local y la normativa eléctrica local.',
  ],
};

const FR: Sentences = {
  'confined-space': [
    'Travaillez depuis l’extérieur de la cuve.',
    'Ne descendez jamais dedans et ne passez pas la tête par l’ouverture.',
    'Une cuve est un espace confiné.',
    'Seules des personnes formées peuvent y entrer, selon les règles locales sur les espaces confinés.',
  ],
  electrical: [
    'Les réchauffeurs et les pompes demandent un circuit protégé par un dispositif différentiel (disjoncteur différentiel).',
    'Un électricien qualifié doit l’installer selon les normes électriques locales.',
  ],
  backflow: [
    'L’engrais et la solution phytosanitaire ne doivent jamais refluer dans le réseau d’eau.',
    'Posez un dispositif anti-retour là où une conduite de cette cuve rejoint une conduite d’eau.',
    'Les règles locales de plomberie disent lequel.',
  ],
  'pest-solution': [
    'Portez l’équipement de protection indiqué sur l’étiquette du produit.',
    'Préparez-la dehors ou dans un endroit bien aéré.',
    'Gardez la cuve étiquetée avec ce qu’elle contient.',
    'Suivez l’étiquette et les règles locales.',
  ],
  'pest-control-storage': [
    'Rangez les produits phytosanitaires sous clé et étiquetés.',
    'Tenez-les à l’écart des aliments et de l’eau.',
    'Portez l’équipement de protection indiqué sur l’étiquette du produit.',
    'Suivez l’étiquette et les règles locales.',
  ],
  frost: [
    'Avant le gel, vidangez les conduites, tuyaux et pompes exposés, ou couvrez-les et calorifugez-les.',
    'Couvrez les petites cuves, ou gardez-les au chaud avec un réchauffeur prévu pour cela.',
    'Les réchauffeurs doivent être sur un circuit protégé par un dispositif différentiel (disjoncteur différentiel).',
    'Appuyez sur son bouton de test pour vérifier qu’il déclenche.',
    'Suivez les pratiques locales et les normes électriques locales.',
  ],
};

const SENTENCES: Readonly<Record<Language, Sentences>> = { en: EN, es: ES, fr: FR };

/** Each caution as its sentences in English, in the order they are read. */
export const CAUTION_SENTENCES: Sentences = EN;

const TITLES: Readonly<Record<Language, Readonly<Record<CautionTopic, string>>>> = {
  en: {
    'confined-space': 'Confined space',
    electrical: 'Electricity near water',
    backflow: 'Backflow',
    'pest-solution': 'Pest solution',
    'pest-control-storage': 'Pest-control products',
    frost: 'Frost on the way',
  },
  es: {
    'confined-space': 'Espacio confinado',
    electrical: 'Electricidad cerca del agua',
    backflow: 'Reflujo',
    'pest-solution': 'Solución fitosanitaria',
    'pest-control-storage': 'Productos fitosanitarios',
    frost: 'Llega una helada',
  },
  fr: {
    'confined-space': 'Espace confiné',
    electrical: 'Électricité près de l’eau',
    backflow: 'Retour d’eau',
    'pest-solution': 'Solution phytosanitaire',
    'pest-control-storage': 'Produits phytosanitaires',
    frost: 'Gel annoncé',
  },
};

/** A short heading for each caution, in English. */
export const CAUTION_TITLES: Readonly<Record<CautionTopic, string>> = TITLES.en;

/** The sentences of a topic's caution in `language` (English by default). */
export function cautionSentences(topic: CautionTopic, language: Language = DEFAULT_LANGUAGE): readonly string[] {
  return SENTENCES[language][topic];
}

/** The caution of a topic as one paragraph in `language` (English by default). */
export function cautionText(topic: CautionTopic, language: Language = DEFAULT_LANGUAGE): string {
  return cautionSentences(topic, language).join(' ');
}

/** The short heading of a topic's caution in `language` (English by default). */
export function cautionTitle(topic: CautionTopic, language: Language = DEFAULT_LANGUAGE): string {
  return TITLES[language][topic];
}

/** The word that heads a caution on a label or in a mail ("Caution", "Precaución", "Attention"). */
export const CAUTION_WORD: Readonly<Record<Language, string>> = { en: 'Caution', es: 'Precaución', fr: 'Attention' };

/** The line every mail with cautions ends on: they defer to local codes, labels and licensed practice. */
export const CAUTION_DEFERS: Readonly<Record<Language, string>> = {
  en: 'Cautions defer to your local codes, product labels and licensed practice.',
  es: 'Las precauciones remiten a la normativa local, a las etiquetas de los productos y a la práctica de profesionales autorizados.',
  fr: 'Les consignes renvoient aux règles locales, aux étiquettes des produits et à la pratique des professionnels qualifiés.',
};

/** The sentences of every language, for the checks that each says as much as the English. */
export function everyCautionLanguage(): Readonly<Record<Language, Sentences>> {
  return SENTENCES;
}
