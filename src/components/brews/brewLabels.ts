import type { BrewKind, BrewStatus } from '@shared/schemas';

/** What each brew kind is called on screen. */
export const BREW_KIND_LABELS: Record<BrewKind, string> = { culture: 'Culture', fertilizer: 'Fertilizer', 'pest-solution': 'Pest solution' };

/** What each brew status is called on screen, and its tag colour. */
export const BREW_STATUS_TAGS: Record<BrewStatus, { label: string; severity: 'info' | 'success' | 'secondary' | 'danger' }> = {
  brewing: { label: 'Brewing', severity: 'info' },
  ready: { label: 'Ready', severity: 'success' },
  'used-up': { label: 'Used up', severity: 'secondary' },
  discarded: { label: 'Discarded', severity: 'danger' },
};

/** "ready", "ready in 2 days", "ready in 5 h", "ready since 3 days"; null without a date. */
export function readyText(readyAt: string | null, now: Date = new Date()): string | null {
  if (!readyAt) return null;
  const ms = new Date(readyAt).getTime() - now.getTime();
  if (Number.isNaN(ms)) return null;
  if (ms <= 0) return 'ready';
  const hours = Math.ceil(ms / 3_600_000);
  if (hours < 24) return `ready in ${hours} h`;
  const days = Math.ceil(ms / 86_400_000);
  return `ready in ${days} ${days === 1 ? 'day' : 'days'}`;
}
