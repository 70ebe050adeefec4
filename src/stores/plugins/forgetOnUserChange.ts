import { watch } from 'vue';
import { createPinia, type Pinia, type PiniaPluginContext } from 'pinia';
import { useSessionStore } from '../session';

/**
 * The stores holding what one person may see (their farms, tanks, stock, board, flags…): each is
 * emptied by its own `reset()` the moment the signed-in person changes, so the next person on the
 * device never sees the last one's lists, nor an answer to a request the last one made.
 */
export const PERSONAL_STORES: readonly string[] = ['farms', 'people', 'tanks', 'inventory', 'imports', 'board', 'flags', 'brews'];

/** Pinia plugin: resets a personal store whenever the signed-in person changes (another sign-in, or a sign-out). */
export function forgetOnUserChange({ store, pinia }: PiniaPluginContext): void {
  if (!PERSONAL_STORES.includes(store.$id)) return;
  const reset: unknown = (store as { reset?: unknown }).reset;
  if (typeof reset !== 'function') throw new Error(`The ${store.$id} store keeps a person's data but has no reset()`);
  const session = useSessionStore(pinia);
  watch(
    () => session.user?.id ?? null,
    (id, before) => {
      if (id !== before) (reset as () => void)();
    },
    // At once, before anything loaded for the new person can land in the old lists.
    { flush: 'sync' },
  );
}

/** The app's Pinia, with its plugins. */
export function createAppPinia(): Pinia {
  const pinia = createPinia();
  pinia.use(forgetOnUserChange);
  return pinia;
}
