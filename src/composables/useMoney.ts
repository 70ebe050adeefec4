import { computed, type ComputedRef } from 'vue';
import { formatMoney } from '@/components/inputs/inputsFormat';
import { useSessionStore } from '@/stores/session';

/** The organisation's currency (ISO 4217, from the session) and a formatter for money figures in it. */
export function useMoney(): { currency: ComputedRef<string>; money: (value: number) => string } {
  const session = useSessionStore();
  const currency = computed(() => session.user?.currency || 'EUR');
  return { currency, money: (value: number) => formatMoney(value, currency.value) };
}
