import { currentLocale } from '@/i18n';

/** A date and time in the screens' language, e.g. "Mar 3, 2026, 2:05 PM" (en), "3 mar 2026, 14:05" (es); "—" for null. */
export function formatDateTime(iso: string | null | undefined): string {
  if (!iso) return '—';
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return '—';
  return new Intl.DateTimeFormat(currentLocale(), { dateStyle: 'medium', timeStyle: 'short' }).format(date);
}

/** The wall-clock time now in an IANA time zone in the screens' language, e.g. "14:05"; empty when the zone is unknown. */
export function localTimeIn(timeZone: string, now: Date = new Date()): string {
  try {
    return new Intl.DateTimeFormat(currentLocale(), { timeZone, hour: '2-digit', minute: '2-digit' }).format(now);
  } catch {
    return '';
  }
}

/**
 * "1 farm", "3 farms" — English only, for text no person reads in their language (logs, test names).
 * Screens use a plural message instead: `"tanks": "{n} tank | {n} tanks"` read with the count as t's second argument.
 */
export function plural(count: number, one: string, many = `${one}s`): string {
  return `${count} ${count === 1 ? one : many}`;
}
