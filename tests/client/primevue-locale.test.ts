import { afterEach, describe, expect, it } from 'vitest';
import { mount, flushPromises } from '@vue/test-utils';
import { defineComponent, h } from 'vue';
import PrimeVue, { usePrimeVue } from 'primevue/config';
import { setLanguage } from '@/i18n';
import { calendarNames } from '@/i18n/primevue-locale';

afterEach(() => setLanguage('en'));

describe("PrimeVue's own words", () => {
  // Day and month names and the first day of the week as CLDR gives them for each locale (Unicode CLDR,
  // gregorian calendar data; recalled from memory of the data, and from Intl in the test runtime).
  it.each([
    ['en-US', 'January', 'Sunday', 0],
    ['es-ES', 'enero', 'domingo', 1],
    ['fr-FR', 'janvier', 'dimanche', 1],
  ])('names months and days in %s', (locale, january, sunday, firstDay) => {
    const names = calendarNames(locale);
    expect(names.monthNames[0]).toBe(january);
    expect(names.dayNames[0]).toBe(sunday);
    expect(names.monthNames).toHaveLength(12);
    expect(names.firstDayOfWeek).toBe(firstDay);
  });

  it("follow the screens' language", async () => {
    let primevue: ReturnType<typeof usePrimeVue> | null = null;
    const probe = defineComponent({
      setup() {
        primevue = usePrimeVue();
        return () => h('p');
      },
    });
    mount(probe, { global: { plugins: [[PrimeVue, { unstyled: true }]] } });
    await flushPromises();
    setLanguage('fr');
    expect(primevue!.config.locale?.today).toBe('Aujourd’hui');
    expect(primevue!.config.locale?.monthNames?.[2]).toBe('mars');
    expect(primevue!.config.locale?.searchMessage).toBe('{count} résultats disponibles');
    setLanguage('es');
    expect(primevue!.config.locale?.emptyMessage).toBe('No hay opciones');
  });
});
