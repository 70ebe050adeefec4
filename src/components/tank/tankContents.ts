import { TANK_CONTENTS, type TankContents } from '@shared/schemas';

/** Display name of each kind of contents. */
export const CONTENTS_LABELS: Readonly<Record<TankContents, string>> = {
  water: 'Water',
  fertilizer: 'Fertilizer',
  'pest-solution': 'Pest solution',
  culture: 'Culture',
};

export const CONTENTS_OPTIONS = TANK_CONTENTS.map((value) => ({ value, label: CONTENTS_LABELS[value] }));

/** A date and time as the farm's clock showed it, e.g. "3 Mar 2026, 14:05"; "—" for null or a bad date. */
export function formatInZone(iso: string | null | undefined, timeZone: string | undefined): string {
  if (!iso) return '—';
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return '—';
  try {
    return new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short', timeZone }).format(date);
  } catch {
    // An unknown zone name: fall back to the reader's own clock rather than show nothing.
    return new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' }).format(date);
  }
}
