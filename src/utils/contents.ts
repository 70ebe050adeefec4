import type { TankContents } from '@shared/schemas';
import { TANK_CONTENTS } from '@shared/schemas';
import { i18n } from '@/i18n';
import { loch, moss, tide, umber } from '@/theme/preset';

const CONTENTS_KEYS: Readonly<Record<TankContents, string>> = {
  water: 'water',
  fertilizer: 'fertilizer',
  'pest-solution': 'pestSolution',
  culture: 'culture',
};

/** What each kind of contents is called on screen, in the screens' language (each entry read when shown). */
export const CONTENTS_LABELS: Readonly<Record<TankContents, string>> = Object.defineProperties(
  {} as Record<TankContents, string>,
  Object.fromEntries(TANK_CONTENTS.map((c) => [c, { enumerable: true, get: () => i18n.global.t(`words.contents.${CONTENTS_KEYS[c]}`) }])),
);

/** How one kind of contents is drawn: a hue for fills and lines, ink on ground for its label, and a pattern. */
export interface ContentsLook {
  fill: string;
  stroke: string;
  /** Text of its label, on `ground`. */
  ink: string;
  ground: string;
  /** Its line in charts. */
  line: 'solid' | 'dashed';
  /** Its label carries diagonal stripes as well as its glyph, so no colour alone tells it apart. */
  hatched: boolean;
}

/**
 * One look per contents for fills, chart lines and labels, from the theme's own scales (see
 * src/theme/preset.ts). Amber is left out on purpose: it means "low" everywhere. Red too: it means
 * "act now" only, so pest solution takes a neutral umber of its own, dashed and striped.
 */
export const CONTENTS_COLOURS: Readonly<Record<TankContents, ContentsLook>> = {
  water: { fill: loch[400], stroke: loch[600], ink: loch[700], ground: loch[50], line: 'solid', hatched: false },
  fertilizer: { fill: moss[400], stroke: moss[600], ink: moss[700], ground: moss[50], line: 'solid', hatched: false },
  'pest-solution': { fill: umber[400], stroke: umber[700], ink: umber[800], ground: umber[50], line: 'dashed', hatched: true },
  culture: { fill: tide[400], stroke: tide[700], ink: '#5e3f7a', ground: '#f4eff8', line: 'solid', hatched: false },
};
