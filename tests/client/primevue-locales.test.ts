// PrimeVue's own words follow the screens' language: a ConfirmDialog's Yes and No, a DatePicker's month and day
// names, buttons and aria labels. Month and day names are the platform's Intl.DateTimeFormat (ECMA-402) ones in
// es-ES and fr-FR; "X" for miércoles is Spanish calendars' usual letter (common practice, no published source).
import { afterEach, describe, expect, it } from 'vitest';
import { defineComponent, h, nextTick } from 'vue';
import { flushPromises, mount } from '@vue/test-utils';
import PrimeVue, { defaultOptions } from 'primevue/config';
import ConfirmDialog from 'primevue/confirmdialog';
import ConfirmationService from 'primevue/confirmationservice';
import DatePicker from 'primevue/datepicker';
import { useConfirm } from 'primevue/useconfirm';
import { setLanguage } from '@/i18n';
import { primeVueLanguage, primeVueLocaleOf } from '@/i18n/primevue-locales';
import { datePickerFormat } from '@/utils/datePickerFormat';
import { formatDateTime } from '@/utils/format';
import type { Language } from '@shared/i18n/languages';


afterEach(() => {
  setLanguage('en');
  document.body.innerHTML = '';
});

/** A button that asks through the ConfirmDialog with no labels of its own, so PrimeVue's words show. */
const Asker = defineComponent({
  setup() {
    const confirm = useConfirm();
    return () => h('div', [h(ConfirmDialog), h('button', { id: 'ask', onClick: () => confirm.require({ header: 'Archive', message: 'Archive this tank?' }) })]);
  },
});

const buttonTexts = () => [...document.body.querySelectorAll('[role="alertdialog"] button')].map((b) => b.textContent?.trim()).filter(Boolean);

describe('PrimeVue in the screens’ language', () => {
  it('answers a ConfirmDialog with Sí and No in Spanish, and Oui and Non once the language changes to French', async () => {
    setLanguage('es');
    const wrapper = mount(Asker, { attachTo: document.body, global: { plugins: [[PrimeVue, { unstyled: true }], ConfirmationService, primeVueLanguage] } });
    await wrapper.get('#ask').trigger('click');
    await flushPromises();
    expect(buttonTexts()).toEqual(expect.arrayContaining(['Sí', 'No']));
    expect(buttonTexts()).not.toContain('Yes');

    setLanguage('fr');
    await nextTick();
    expect(buttonTexts()).toEqual(expect.arrayContaining(['Oui', 'Non']));
    setLanguage('en');
    await nextTick();
    expect(buttonTexts()).toEqual(expect.arrayContaining(['Yes', 'No']));
    wrapper.unmount();
  });

  it('names the months and days of a DatePicker in Spanish, Monday first, with Hoy and Borrar', async () => {
    setLanguage('es');
    const wrapper = mount(DatePicker, { attachTo: document.body, props: { modelValue: new Date(2026, 11, 4), inline: true, showButtonBar: true }, global: { plugins: [[PrimeVue, { unstyled: true }], ConfirmationService, primeVueLanguage] } });
    await flushPromises();
    const text = wrapper.text();
    expect(text).toContain('diciembre');
    expect(text).not.toContain('December');
    const heads = wrapper.findAll('th').map((th) => th.text());
    expect(heads).toEqual(['L', 'M', 'X', 'J', 'V', 'S', 'D']);
    const buttons = wrapper.findAll('button').map((b) => b.text());
    expect(buttons).toEqual(expect.arrayContaining(['Hoy', 'Borrar']));
    expect(wrapper.find('button[aria-label="Mes siguiente"]').exists()).toBe(true);

    setLanguage('fr');
    await nextTick();
    expect(wrapper.text()).toContain('décembre');
    expect(wrapper.findAll('th').map((th) => th.text())[0]).toBe('lu');
    expect(wrapper.findAll('button').map((b) => b.text())).toEqual(expect.arrayContaining(['Aujourd’hui', 'Effacer']));
    wrapper.unmount();
  });

  it.each(['es', 'fr'] as const)('makes a DatePicker write every month as formatDateTime does in %s', async (language: Language) => {
    setLanguage(language);
    const { dateFormat, hourFormat } = datePickerFormat();
    for (let month = 0; month < 12; month++) {
      const at = new Date(2026, month, 3, 14, 5);
      const wrapper = mount(DatePicker, { props: { modelValue: at, showTime: true, dateFormat, hourFormat, inputId: 'when' }, global: { plugins: [[PrimeVue, { unstyled: true }], ConfirmationService, primeVueLanguage] } });
      await nextTick();
      expect((wrapper.get('input#when').element as HTMLInputElement).value, `month ${month + 1}`).toBe(formatDateTime(at.toISOString()));
      wrapper.unmount();
    }
  });

  it('keeps PrimeVue’s own English for English', () => {
    expect(primeVueLocaleOf('en')).toEqual(defaultOptions.locale);
  });

  // Words that are the same in the language as in PrimeVue's English (unit symbols, "No", "Navigation"…).
  const SAME_AS_ENGLISH: Record<'es' | 'fr', string[]> = {
    es: ['No', 'B', 'KB', 'MB', 'GB', 'TB', 'PB', 'EB', 'ZB', 'YB', '{slideNumber}'],
    fr: ['Navigation', 'Page {page}', '{slideNumber}'],
  };

  it.each(['es', 'fr'] as const)('gives every word PrimeVue 4.5 looks up in %s, translated, with its placeholders', (language) => {
    const english = defaultOptions.locale as unknown as Record<string, unknown>;
    const words = primeVueLocaleOf(language) as unknown as Record<string, unknown>;
    const walk = (en: Record<string, unknown>, ours: Record<string, unknown>, path: string) => {
      expect(Object.keys(ours).sort(), path || 'locale').toEqual(Object.keys(en).sort());
      for (const [key, value] of Object.entries(en)) {
        const mine = ours[key];
        const at = `${path}${key}`;
        if (Array.isArray(value)) {
          expect(mine, at).toHaveLength(value.length);
          for (const [i, v] of value.entries()) if (!SAME_AS_ENGLISH[language].includes(String(v))) expect((mine as unknown[])[i], `${at}[${i}]`).not.toBe(v);
        } else if (value && typeof value === 'object') {
          walk(value as Record<string, unknown>, mine as Record<string, unknown>, `${at}.`);
        } else {
          expect(typeof mine, at).toBe(typeof value);
          if (typeof value === 'string') {
            for (const placeholder of value.match(/\{\w+\}/g) ?? []) expect(mine, at).toContain(placeholder);
            if (!SAME_AS_ENGLISH[language].includes(value)) expect(mine, at).not.toBe(value);
          }
        }
      }
    };
    walk(english, words, '');
  });
});
