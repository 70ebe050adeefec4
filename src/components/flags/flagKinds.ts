// How each flag kind and status looks on screen: an icon and words of its own, so that no colour
// has to carry the meaning. The one map of them; the board, its flag panel and the Flags screen use it.
import { FLAG_LABELS } from '@shared/flags';
import type { FlagKind, FlagStatus } from '@shared/schemas';

/** What marks a flag kind on screen. */
export interface FlagKindLook {
  /** PrimeIcons class. */
  icon: string;
  /** The kind's name (from shared/flags). */
  label: string;
  /** What it means, in a few words. */
  meaning: string;
}

/** The icon, name and meaning of every flag kind. */
export const FLAG_KIND_LOOKS: Readonly<Record<FlagKind, FlagKindLook>> = {
  'low-stock': { icon: 'pi pi-sort-amount-down', label: FLAG_LABELS['low-stock'], meaning: 'Usable stock is under its low mark.' },
  'reorder-due': { icon: 'pi pi-shopping-cart', label: FLAG_LABELS['reorder-due'], meaning: 'It runs out within the time a delivery takes.' },
  'suspected-leak': { icon: 'pi pi-arrow-circle-down', label: FLAG_LABELS['suspected-leak'], meaning: 'The level fell while nothing should draw.' },
  'stale-tank': { icon: 'pi pi-clock', label: FLAG_LABELS['stale-tank'], meaning: 'No reading for longer than the farm allows.' },
  'cold-culture': { icon: 'pi pi-moon', label: FLAG_LABELS['cold-culture'], meaning: 'Too cold for the culture to stay active.' },
  'frost-risk': { icon: 'pi pi-asterisk', label: FLAG_LABELS['frost-risk'], meaning: 'Cold enough to freeze lines and pumps.' },
  'frost-ahead': { icon: 'pi pi-cloud', label: FLAG_LABELS['frost-ahead'], meaning: 'The weather forecast shows a frost in the next two days.' },
  overfill: { icon: 'pi pi-arrow-circle-up', label: FLAG_LABELS.overfill, meaning: 'Filled above its safe fill line.' },
};

/** The icon and words of each flag status. */
export const FLAG_STATUS_LOOKS: Readonly<Record<FlagStatus, { icon: string; label: string }>> = {
  open: { icon: 'pi pi-bell', label: 'Needs someone' },
  acknowledged: { icon: 'pi pi-eye', label: 'Seen' },
  cleared: { icon: 'pi pi-check-circle', label: 'Over' },
};
