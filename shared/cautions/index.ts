// Safety cautions: the one place their words live, for the screens, the flag mail and the flags.
// Short plain sentences; each caution ends by deferring to local codes, the label or licensed practice.

/** The kinds of caution the product shows. */
export const CAUTION_TOPICS = ['confined-space', 'electrical', 'backflow', 'pest-solution', 'pest-control-storage', 'frost'] as const;
/** A kind of caution. */
export type CautionTopic = (typeof CAUTION_TOPICS)[number];

/** Each caution as its sentences, in the order they are read. */
export const CAUTION_SENTENCES: Readonly<Record<CautionTopic, readonly string[]>> = {
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

/** A short heading for each caution. */
export const CAUTION_TITLES: Readonly<Record<CautionTopic, string>> = {
  'confined-space': 'Confined space',
  electrical: 'Electricity near water',
  backflow: 'Backflow',
  'pest-solution': 'Pest solution',
  'pest-control-storage': 'Pest-control products',
  frost: 'Frost on the way',
};

/** The caution of a topic as one paragraph. */
export function cautionText(topic: CautionTopic): string {
  return CAUTION_SENTENCES[topic].join(' ');
}
