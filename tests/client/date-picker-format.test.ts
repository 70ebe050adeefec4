import { describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import DatePicker from 'primevue/datepicker';
import { datePickerFormat } from '@/utils/datePickerFormat';

// The expected texts are those of the platform's Intl.DateTimeFormat (ECMA-402) with dateStyle
// 'medium' and timeStyle 'short', the options formatDateTime in src/utils/format.ts uses.
const AT = new Date(2026, 2, 3, 14, 5);
const intlText = (locale: string) => new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeStyle: 'short' }).format(AT);

describe('datePickerFormat', () => {
  it.each([
    ['en-GB', 'd M yy,', '24'],
    ['en-IE', 'd M yy,', '24'],
    ['en-US', 'M d, yy,', '12'],
    ['de-DE', 'dd.mm.yy,', '24'],
  ])('gives DatePicker the order and clock of formatDateTime in %s', (locale, dateFormat, hourFormat) => {
    expect(datePickerFormat(locale)).toEqual({ dateFormat, hourFormat });
  });

  it.each(['en-GB', 'en-IE', 'de-DE'])('makes a DatePicker with the time write the same text as formatDateTime in %s', (locale) => {
    const { dateFormat, hourFormat } = datePickerFormat(locale);
    const wrapper = mount(DatePicker, {
      props: { modelValue: AT, showTime: true, dateFormat, hourFormat, inputId: 'when' },
      global: { plugins: [[PrimeVue, { unstyled: true }]] },
    });
    expect((wrapper.get('input#when').element as HTMLInputElement).value).toBe(intlText(locale));
  });
});
