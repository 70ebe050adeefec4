// How each flag kind and status looks on screen: an icon and words of its own, so that no colour
// has to carry the meaning. The one map of them; the board, its flag panel and the Flags screen use it.
// The words come from area `flagKinds` in the screens' language, read each time they are shown.
import type { FlagKind, FlagStatus } from '@shared/schemas';
import { i18n } from '@/i18n';
import { knownMessages, localiseDayTime, localiseFigures, sayKnown } from '@shared/i18n/known-messages';
import { DEFAULT_LANGUAGE, LANGUAGE_LOCALES, type Language } from '@shared/i18n/languages';

/** What marks a flag kind on screen. */
export interface FlagKindLook {
  /** PrimeIcons class. */
  icon: string;
  /** The kind's name. */
  label: string;
  /** What it means, in a few words. */
  meaning: string;
}

/** Each kind's key in area `flagKinds`. */
export const FLAG_KIND_KEYS: Readonly<Record<FlagKind, string>> = {
  'low-stock': 'lowStock',
  'reorder-due': 'reorderDue',
  'suspected-leak': 'suspectedLeak',
  'stale-tank': 'staleTank',
  'cold-culture': 'coldCulture',
  'frost-risk': 'frostRisk',
  'frost-ahead': 'frostAhead',
  overfill: 'overfill',
};

const ICONS: Readonly<Record<FlagKind, string>> = {
  'low-stock': 'pi pi-sort-amount-down',
  'reorder-due': 'pi pi-shopping-cart',
  'suspected-leak': 'pi pi-arrow-circle-down',
  'stale-tank': 'pi pi-clock',
  'cold-culture': 'pi pi-moon',
  'frost-risk': 'pi pi-asterisk',
  'frost-ahead': 'pi pi-cloud',
  overfill: 'pi pi-arrow-circle-up',
};

function lookOf(kind: FlagKind): FlagKindLook {
  const key = FLAG_KIND_KEYS[kind];
  return {
    icon: ICONS[kind],
    get label() {
      return i18n.global.t(`flagKinds.label.${key}`);
    },
    get meaning() {
      return i18n.global.t(`flagKinds.meaning.${key}`);
    },
  };
}

/** The icon, name and meaning of every flag kind. */
export const FLAG_KIND_LOOKS: Readonly<Record<FlagKind, FlagKindLook>> = Object.fromEntries(
  (Object.keys(FLAG_KIND_KEYS) as FlagKind[]).map((kind) => [kind, lookOf(kind)]),
) as Record<FlagKind, FlagKindLook>;

const STATUS_ICONS: Readonly<Record<FlagStatus, string>> = { open: 'pi pi-bell', acknowledged: 'pi pi-eye', cleared: 'pi pi-check-circle' };

/** The icon and words of each flag status. */
export const FLAG_STATUS_LOOKS: Readonly<Record<FlagStatus, { icon: string; label: string }>> = Object.fromEntries(
  (Object.keys(STATUS_ICONS) as FlagStatus[]).map((status) => [
    status,
    {
      icon: STATUS_ICONS[status],
      get label() {
        return i18n.global.t(`flagKinds.status.${status}`);
      },
    },
  ]),
) as Record<FlagStatus, { icon: string; label: string }>;

let knownFlagMessages: ReturnType<typeof knownMessages> | null = null;

/**
 * A flag's sentence (the server stores it in English, e.g. "P1 has 420 L usable, under its 500 L threshold")
 * in the screens' language, its names and figures kept; a sentence the catalogue does not know stays as it is.
 */
export function sayFlagMessage(message: string): string {
  const language = i18n.global.locale.value as Language;
  if (language === DEFAULT_LANGUAGE) return message;
  knownFlagMessages ??= knownMessages('flagKinds.message', (i18n.global.getLocaleMessage(DEFAULT_LANGUAGE) as unknown as { flagKinds: { message: Record<string, unknown> } }).flagKinds.message);
  const locale = LANGUAGE_LOCALES[language];
  return sayKnown(message, knownFlagMessages, (key, named) => {
    const values = localiseFigures(named, locale);
    if (values.when) values.when = localiseDayTime(values.when, locale);
    return i18n.global.t(key, values);
  });
}
