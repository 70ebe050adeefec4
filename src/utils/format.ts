/** A date and time in the reader's locale, e.g. "3 Mar 2026, 14:05"; "—" for null. */
export function formatDateTime(iso: string | null | undefined): string {
  if (!iso) return '—';
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return '—';
  return new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' }).format(date);
}

/** The wall-clock time now in an IANA time zone, e.g. "14:05"; empty when the zone is unknown. */
export function localTimeIn(timeZone: string, now: Date = new Date()): string {
  try {
    return new Intl.DateTimeFormat(undefined, { timeZone, hour: '2-digit', minute: '2-digit' }).format(now);
  } catch {
    return '';
  }
}

/** "1 farm", "3 farms". */
export function plural(count: number, one: string, many = `${one}s`): string {
  return `${count} ${count === 1 ? one : many}`;
}
