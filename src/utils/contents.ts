import type { TankContents } from '@shared/schemas';

/** What each kind of contents is called on screen. */
export const CONTENTS_LABELS: Readonly<Record<TankContents, string>> = {
  water: 'Water',
  fertilizer: 'Fertilizer',
  'pest-solution': 'Pest solution',
  culture: 'Culture',
};

/**
 * One colour per contents for fills, chart lines and chips, from the theme's own scales (see
 * src/theme/preset.ts). Amber is left out on purpose: it means "low" everywhere.
 */
export const CONTENTS_COLOURS: Readonly<Record<TankContents, { fill: string; stroke: string }>> = {
  water: { fill: '#5a8cc9', stroke: '#305894' },
  fertilizer: { fill: '#6ea357', stroke: '#3f6c2e' },
  'pest-solution': { fill: '#d6604d', stroke: '#a23424' },
  culture: { fill: '#45979d', stroke: '#175158' },
};
