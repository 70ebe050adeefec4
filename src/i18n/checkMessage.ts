// The shared checks' refusals (a reading outside the tank, a gauge strip that cannot be printed, a fill-and-mark
// row out of order) said in the screens' language from their code, with the figures written the language's way.
import { isCheckMoment, isCheckProblem, type CheckMoment, type CheckParam, type CheckProblem } from '@shared/check-problems';
import { LANGUAGE_LOCALES, type Language } from '@shared/i18n/languages';
import { formatNumberTrimmed } from '@shared/units';
import { i18n } from '@/i18n';

const momentStyles = new Map<string, Intl.DateTimeFormat>();

/** A moment the way the shared English writes it (day month year, 24-hour clock: en-GB), in the language's locale elsewhere. */
function sayMoment({ atMs, timeZone, dateOnly }: CheckMoment): string {
  const language = i18n.global.locale.value as Language;
  const locale = language === 'en' ? 'en-GB' : (LANGUAGE_LOCALES[language] ?? 'en-GB');
  const key = `${locale}|${timeZone}|${dateOnly}`;
  let style = momentStyles.get(key);
  if (!style) {
    style = new Intl.DateTimeFormat(locale, { timeZone, dateStyle: 'medium', ...(dateOnly ? {} : { timeStyle: 'short', hourCycle: 'h23' as const }) });
    momentStyles.set(key, style);
  }
  return style.format(atMs);
}

function say(param: CheckParam, name: string): string {
  if (typeof param === 'string') {
    // A field the catalogue names (outletHeightMm → "altura de la salida"); any other text as it is.
    const key = `checks.field.${param}`;
    return name === 'field' && i18n.global.te(key) ? i18n.global.t(key) : param;
  }
  if (isCheckProblem(param)) return checkMessage(param);
  if (isCheckMoment(param)) return sayMoment(param);
  return formatNumberTrimmed(param.value, param.digits);
}

/** A shared check's refusal (its code in area `checks` and its values) as a sentence in the screens' language. */
export function checkMessage(problem: CheckProblem): string {
  const named = Object.fromEntries(Object.entries(problem.params).map(([name, param]) => [name, say(param, name)]));
  return i18n.global.t(`checks.${problem.code}`, named);
}
