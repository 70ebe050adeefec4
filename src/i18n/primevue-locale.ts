// PrimeVue's own words (the date picker's months and days, empty lists, its buttons and aria labels) in
// the screens' language: names of days and months from Intl in the language's locale, the rest from area
// `primevue`. PrimeVue fills `{count}` itself, so those messages keep it as written.
import type { App } from 'vue';
import type { Composer } from 'vue-i18n';
import { LANGUAGE_LOCALES, type Language } from '@shared/i18n/languages';

const WORDS = [
  'accept', 'reject', 'choose', 'upload', 'cancel', 'clear', 'apply', 'today', 'weekHeader', 'chooseYear', 'chooseMonth', 'chooseDate',
  'prevYear', 'nextYear', 'prevMonth', 'nextMonth', 'prevDecade', 'nextDecade', 'prevHour', 'nextHour', 'prevMinute', 'nextMinute',
  'emptyMessage', 'emptyFilterMessage', 'emptySearchMessage', 'emptySelectionMessage', 'searchMessage', 'selectionMessage',
  'noFileChosenMessage', 'fileChosenMessage',
] as const;
const ARIA = ['close', 'previous', 'next', 'navigation'] as const;

/** Names of the week's days (Sunday first) and the year's months in `locale`, in the widths PrimeVue asks for. */
export function calendarNames(locale: string) {
  // 2026-03-01 is a Sunday (ISO 8601 calendar, checked with any calendar of 2026).
  const days = Array.from({ length: 7 }, (_, i) => new Date(Date.UTC(2026, 2, 1 + i, 12)));
  const months = Array.from({ length: 12 }, (_, i) => new Date(Date.UTC(2026, i, 15, 12)));
  const fmt = (options: Intl.DateTimeFormatOptions) => new Intl.DateTimeFormat(locale, { ...options, timeZone: 'UTC' });
  const firstDay = (new Intl.Locale(locale) as Intl.Locale & { weekInfo?: { firstDay: number }; getWeekInfo?: () => { firstDay: number } });
  const weekInfo = firstDay.getWeekInfo?.() ?? firstDay.weekInfo;
  return {
    dayNames: days.map((d) => fmt({ weekday: 'long' }).format(d)),
    dayNamesShort: days.map((d) => fmt({ weekday: 'short' }).format(d)),
    dayNamesMin: days.map((d) => fmt({ weekday: 'narrow' }).format(d)),
    monthNames: months.map((d) => fmt({ month: 'long' }).format(d)),
    monthNamesShort: months.map((d) => fmt({ month: 'short' }).format(d)),
    // Intl counts Monday 1 … Sunday 7; PrimeVue Sunday 0 … Saturday 6.
    firstDayOfWeek: weekInfo ? weekInfo.firstDay % 7 : locale.startsWith('en-US') ? 0 : 1,
  };
}

/** Sets PrimeVue's locale of `app` (once PrimeVue is installed) to `language`'s words. */
export function applyPrimeVueLocale(app: App | null, language: Language, composer: Composer): void {
  const config = (app?.config.globalProperties as { $primevue?: { config: { locale?: Record<string, unknown> } } } | undefined)?.$primevue?.config;
  if (!config) return;
  const raw = (key: string) => composer.t(`primevue.${key}`, { count: '{count}' });
  const words = Object.fromEntries(WORDS.map((key) => [key, raw(key)]));
  const aria = { ...((config.locale?.aria as Record<string, string> | undefined) ?? {}), ...Object.fromEntries(ARIA.map((key) => [key, raw(key)])) };
  config.locale = { ...(config.locale ?? {}), ...calendarNames(LANGUAGE_LOCALES[language]), ...words, aria };
}
