import { onScopeDispose, shallowRef, type Ref } from 'vue';

export interface UseNowOptions {
  /** How often `now` moves on, ms (default 30 s: ages are shown in minutes). */
  intervalMs?: number;
}

/** The current time as a ref that moves on every `intervalMs`; the timer stops with the scope. */
export function useNow(options: UseNowOptions = {}): { now: Ref<Date> } {
  const now = shallowRef(new Date());
  const timer = setInterval(() => {
    now.value = new Date();
  }, options.intervalMs ?? 30_000);
  onScopeDispose(() => clearInterval(timer));
  return { now };
}
