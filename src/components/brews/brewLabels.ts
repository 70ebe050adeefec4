// Words the Brews screen shows for kinds, statuses and readiness, in the screen's language. Functions,
// not constants: each call reads the language in use, so a change of language redraws them.
import type { TopUpInput, TopUpPlanRefused } from '@shared/mixing';
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

/**
 * Why topUpPlan refuses, in the screen's language, from the refusal's code. The shared plan words its own
 * reason in English only, so the figures it quotes are taken again here from the same input (volumes in L,
 * strengths in the person's strength unit), shown with `volume` and `strength`.
 */
export function topUpRefusalText(plan: TopUpPlanRefused, input: TopUpInput, volume: (litres: number) => string, strength: (value: number) => string): string {
  const { currentVolume: v0, currentStrength: c0, targetVolume: vt, targetStrength: ct, stockStrength: cs, ullageL } = input;
  const ullage = Math.max(0, ullageL);
  const addL = vt - v0;
  switch (plan.code) {
    case 'target-below-current':
      return t('brews.mix.refusals.targetBelowCurrent', { held: volume(v0), target: volume(vt) });
    case 'exceeds-ullage':
      return t('brews.mix.refusals.exceedsUllage', { target: volume(vt), add: volume(addL), room: volume(ullage) });
    case 'already-too-strong': {
      // As topUpPlan words it: water alone dilutes what the tank holds to the target strength at c0·v0/ct.
      const dilutedL = ct > 0 ? (c0 * v0) / ct : Infinity;
      const hint = ct > 0 && dilutedL - v0 <= ullage + 1e-9 * Math.max(1, vt) ? t('brews.mix.refusals.waterAloneReaches', { volume: volume(dilutedL) }) : t('brews.mix.refusals.useOrDrain');
      return `${t('brews.mix.refusals.alreadyTooStrong', { target: volume(vt), strength: strength(ct) })} ${hint}`;
    }
    case 'stock-too-weak':
      // The strongest mix reachable: all of the room to the target filled with concentrate.
      return t('brews.mix.refusals.stockTooWeak', { target: volume(vt), best: strength((c0 * v0 + cs * addL) / vt), strength: strength(ct) });
  }
}
