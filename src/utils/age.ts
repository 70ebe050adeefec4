// How old a reading is, in words a person reads at a glance ("3 h ago"), and when it counts as stale.

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

/** "just now", "12 min ago", "3 h ago", "4 days ago"; "never" for null. */
export function formatAge(iso: string | null | undefined, now: Date = new Date()): string {
  const t = timeOf(iso);
  if (t === null) return 'never';
  const ms = now.getTime() - t;
  // A phone clock a little ahead of the server still reads as "just now", not "in 2 min".
  if (ms < MINUTE_MS) return 'just now';
  if (ms < HOUR_MS) return `${Math.floor(ms / MINUTE_MS)} min ago`;
  if (ms < DAY_MS) return `${Math.floor(ms / HOUR_MS)} h ago`;
  const days = Math.floor(ms / DAY_MS);
  return `${days} ${days === 1 ? 'day' : 'days'} ago`;
}

/** True when the reading at `iso` is older than STALE_AFTER_MS (false for null: "no reading" is shown apart). */
export function isStale(iso: string | null | undefined, now: Date = new Date()): boolean {
  const t = timeOf(iso);
  return t !== null && now.getTime() - t > STALE_AFTER_MS;
}
