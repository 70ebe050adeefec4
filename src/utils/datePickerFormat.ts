// PrimeVue DatePicker settings that write a date and time the way formatDateTime (./format) shows
// them everywhere else: the language's order of day, short month name and year, and its clock.
import { currentLocale } from '@/i18n';

/** A DatePicker `dateFormat` pattern and `hourFormat`. */
export interface DatePickerFormat {
  dateFormat: string;
  hourFormat: '12' | '24';
}

const SAMPLE = new Date(2026, 2, 3, 14, 5);

/** Text that DatePicker copies as written: letters and quotes go inside quotes. */
function literal(text: string): string {
  return /[A-Za-z']/.test(text) ? `'${text.replace(/'/g, "''")}'` : text;
}

/**
 * The DatePicker settings matching formatDateTime in `locale` (the screens' language's by default), e.g. en-GB →
 * "d M yy," and 24 h ("3 Mar 2026, 14:05"), en-US → "M d, yy," and 12 h ("Mar 3, 2026, 02:05 PM").
 */
export function datePickerFormat(locale: string = currentLocale()): DatePickerFormat {
  const formatter = new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeStyle: 'short' });
  const parts = formatter.formatToParts(SAMPLE);
  const firstTime = parts.findIndex((p) => p.type === 'hour' || p.type === 'minute' || p.type === 'dayPeriod');
  const dateParts = parts.slice(0, firstTime < 0 ? parts.length : firstTime);
  let pattern = '';
  for (const part of dateParts) {
    if (part.type === 'day') pattern += part.value.length === 2 ? 'dd' : 'd';
    else if (part.type === 'month') pattern += /^\d+$/.test(part.value) ? (part.value.length === 2 ? 'mm' : 'm') : 'M';
    else if (part.type === 'year') pattern += 'yy';
    else if (part.type === 'literal') pattern += literal(part.value);
  }
  // DatePicker puts one space between the date and the time itself.
  const dateFormat = pattern.replace(/\s+$/, '').replace(/\s*'\s*at\s*'$/, ',');
  const hourCycle = formatter.resolvedOptions().hourCycle;
  return { dateFormat, hourFormat: hourCycle === 'h11' || hourCycle === 'h12' ? '12' : '24' };
}
