// How old a reading is, in words a person reads at a glance ("3 h ago") in their language, and when it counts as stale.
import { i18n } from '@/i18n';

const MINUTE_MS = 60_000;
const HOUR_MS = 60 * MINUTE_MS;
const DAY_MS = 24 * HOUR_MS;

/** A latest reading older than this is flagged on the board (two days: a round is missed at least once). */
export const STALE_AFTER_MS = 2 * DAY_MS;

function timeOf(iso: string | null | undefined): number | null {
  if (!iso) return null;
  const t = new Date(iso).getTime();
  return Number.isNaN(t) ? null : t;
}

/** "just now", "12 min ago", "3 h ago", "4 days ago" (in the screens' language); "never" for null. */
export function formatAge(iso: string | null | undefined, now: Date = new Date()): string {
  const { t } = i18n.global;
  const time = timeOf(iso);
  if (time === null) return t('words.age.never');
  const ms = now.getTime() - time;
  // A phone clock a little ahead of the server still reads as "just now", not "in 2 min".
  if (ms < MINUTE_MS) return t('words.age.justNow');
  if (ms < HOUR_MS) return t('words.age.minutesAgo', { n: Math.floor(ms / MINUTE_MS) });
  if (ms < DAY_MS) return t('words.age.hoursAgo', { n: Math.floor(ms / HOUR_MS) });
  const days = Math.floor(ms / DAY_MS);
  return t('words.age.daysAgo', { n: days }, days);
}

/** True when the reading at `iso` is older than STALE_AFTER_MS (false for null: "no reading" is shown apart). */
export function isStale(iso: string | null | undefined, now: Date = new Date()): boolean {
  const t = timeOf(iso);
  return t !== null && now.getTime() - t > STALE_AFTER_MS;
}
