import { computed, type ComputedRef } from 'vue';
import { currentLocale } from '@/i18n';
import { useSessionStore } from '@/stores/session';

/** `value` in `currency` (ISO 4217) as the screens' language writes money: "€1,234.50" (en), "1234,50 €" (es). */
export function formatMoneyIn(value: number, currency: string, locale: string = currentLocale()): string {
  return new Intl.NumberFormat(locale, { style: 'currency', currency }).format(value);
}

/** The organisation's currency (ISO 4217, from the session) and a formatter for money figures in it. */
export function useMoney(): { currency: ComputedRef<string>; money: (value: number) => string } {
  const session = useSessionStore();
  const currency = computed(() => session.user?.currency || 'EUR');
  return { currency, money: (value: number) => formatMoneyIn(value, currency.value) };
}
