// The shared checks' refusals (a reading outside the tank, a gauge strip that cannot be printed, a fill-and-mark
// row out of order) said in the screens' language from their code, with the figures written the language's way.
import { isCheckProblem, type CheckParam, type CheckProblem } from '@shared/check-problems';
import { formatNumberTrimmed } from '@shared/units';
import { i18n } from '@/i18n';

function say(param: CheckParam, name: string): string {
  if (typeof param === 'string') {
    // A field the catalogue names (outletHeightMm → "altura de la salida"); any other text as it is.
    const key = `checks.field.${param}`;
    return name === 'field' && i18n.global.te(key) ? i18n.global.t(key) : param;
  }
  if (isCheckProblem(param)) return checkMessage(param);
  return formatNumberTrimmed(param.value, param.digits);
}

/** A shared check's refusal (its code in area `checks` and its values) as a sentence in the screens' language. */
export function checkMessage(problem: CheckProblem): string {
  const named = Object.fromEntries(Object.entries(problem.params).map(([name, param]) => [name, say(param, name)]));
  return i18n.global.t(`checks.${problem.code}`, named);
}
