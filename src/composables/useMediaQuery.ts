import { onScopeDispose, ref, type Ref } from 'vue';

export interface UseMediaQueryOptions {
  query: string;
  /** Value to use where matchMedia does not exist (tests, server rendering). */
  fallback?: boolean;
}

/** Whether a CSS media query matches, kept up to date; the listener is removed with the scope. */
export function useMediaQuery(options: UseMediaQueryOptions): { matches: Ref<boolean> } {
  const matches = ref(options.fallback ?? false);
  if (typeof window === 'undefined' || typeof window.matchMedia !== 'function') return { matches };
  const list = window.matchMedia(options.query);
  matches.value = list.matches;
  const onChange = (event: MediaQueryListEvent) => {
    matches.value = event.matches;
  };
  list.addEventListener('change', onChange);
  onScopeDispose(() => list.removeEventListener('change', onChange));
  return { matches };
}
