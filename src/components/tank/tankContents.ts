import { TANK_CONTENTS, type TankContents } from '@shared/schemas';
import { currentLocale } from '@/i18n';
import { tankText } from './tankWords';

const CONTENTS_KEYS: Readonly<Record<TankContents, string>> = { water: 'water', fertilizer: 'fertilizer', 'pest-solution': 'pestSolution', culture: 'culture' };

/** Display name of each kind of contents, in the current language (read when shown). */
export const CONTENTS_LABELS: Readonly<Record<TankContents, string>> = Object.defineProperties(
  {} as Record<TankContents, string>,
  Object.fromEntries(TANK_CONTENTS.map((value) => [value, { enumerable: true, get: () => tankText(`contents.${CONTENTS_KEYS[value]}`) }])),
);

/** The contents choices of the editor; their labels follow the language. */
export const CONTENTS_OPTIONS: { value: TankContents; readonly label: string }[] = TANK_CONTENTS.map((value) => ({
  value,
  get label() {
    return CONTENTS_LABELS[value];
  },
}));

/** A date and time as the farm's clock showed it, in the language's locale, e.g. "Mar 3, 2026, 2:05 PM"; "—" for null or a bad date. */
export function formatInZone(iso: string | null | undefined, timeZone: string | undefined): string {
  if (!iso) return '—';
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return '—';
  const locale = currentLocale();
  try {
    return new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeStyle: 'short', timeZone }).format(date);
  } catch {
    // An unknown zone name: fall back to the reader's own clock rather than show nothing.
    return new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeStyle: 'short' }).format(date);
  }
}
