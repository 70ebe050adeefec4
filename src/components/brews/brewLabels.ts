// Words the Brews screen shows for kinds, statuses and readiness, in the screen's language. Functions,
// not constants: each call reads the language in use, so a change of language redraws them.
import type { TopUpPlanRefused } from '@shared/mixing';
import type { BrewKind, BrewStatus } from '@shared/schemas';
import { i18n } from '@/i18n';

const t = (key: string, named: Record<string, unknown> = {}, plural?: number) => (plural === undefined ? i18n.global.t(key, named) : i18n.global.t(key, named, plural));

const KIND_KEYS: Record<BrewKind, string> = { culture: 'culture', fertilizer: 'fertilizer', 'pest-solution': 'pestSolution' };
const STATUS_KEYS: Record<BrewStatus, string> = { brewing: 'brewing', ready: 'ready', 'used-up': 'usedUp', discarded: 'discarded' };
const STATUS_SEVERITIES: Record<BrewStatus, 'info' | 'success' | 'secondary' | 'danger'> = {
  brewing: 'info',
  ready: 'success',
  'used-up': 'secondary',
  discarded: 'danger',
};

/** What a brew kind is called on screen. */
export function brewKindLabel(kind: BrewKind): string {
  return t(`brews.kinds.${KIND_KEYS[kind]}`);
}

/** What a brew status is called on screen, and its tag colour. */
export function brewStatusTag(status: BrewStatus): { label: string; severity: 'info' | 'success' | 'secondary' | 'danger' } {
  return { label: t(`brews.statuses.${STATUS_KEYS[status]}`), severity: STATUS_SEVERITIES[status] };
}

/** The button that moves a brew to `status` ("Mark ready"…). */
export function brewActionLabel(status: BrewStatus): string {
  return t(`brews.actions.${STATUS_KEYS[status]}`);
}

/** The toast after a status change: "Compost tea: ready". */
export function brewStatusChanged(name: string, status: BrewStatus): string {
  return t(`brews.toast.statusNow.${STATUS_KEYS[status]}`, { name });
}

/** "parts water" or "parts total", the way a recorded ratio was meant. */
export function conventionWords(convention: 'parts-water' | 'parts-total'): string {
  return t(convention === 'parts-water' ? 'brews.conventions.partsWater' : 'brews.conventions.partsTotal');
}

/** "ready", "ready in 2 days", "ready in 5 h"; null without a date. */
export function readyText(readyAt: string | null, now: Date = new Date()): string | null {
  if (!readyAt) return null;
  const ms = new Date(readyAt).getTime() - now.getTime();
  if (Number.isNaN(ms)) return null;
  if (ms <= 0) return t('brews.readyIn.now');
  const hours = Math.ceil(ms / 3_600_000);
  if (hours < 24) return t('brews.readyIn.hours', { n: hours });
  const days = Math.ceil(ms / 86_400_000);
  return t('brews.readyIn.days', { n: days }, days);
}

/** Why topUpPlan refuses, in the screen's language, from the refusal's code and the figures it quotes (volumes in L, strengths in the person's strength unit), shown with `volume` and `strength`. */
export function topUpRefusalText(plan: TopUpPlanRefused, volume: (litres: number) => string, strength: (value: number) => string): string {
  switch (plan.code) {
    case 'target-below-current':
      return t('brews.mix.refusals.targetBelowCurrent', { held: volume(plan.heldL), target: volume(plan.targetL) });
    case 'exceeds-ullage':
      return t('brews.mix.refusals.exceedsUllage', { target: volume(plan.targetL), add: volume(plan.addL), room: volume(plan.roomL) });
    case 'already-too-strong': {
      const hint = plan.dilutedL === null ? t('brews.mix.refusals.useOrDrain') : t('brews.mix.refusals.waterAloneReaches', { volume: volume(plan.dilutedL) });
      return `${t('brews.mix.refusals.alreadyTooStrong', { target: volume(plan.targetL), strength: strength(plan.targetStrength) })} ${hint}`;
    }
    case 'stock-too-weak':
      return t('brews.mix.refusals.stockTooWeak', { target: volume(plan.targetL), best: strength(plan.bestStrength), strength: strength(plan.targetStrength) });
  }
}
