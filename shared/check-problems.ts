// A refusal that a screen words: the English sentence stays for the API, the logs and the server, and
// beside it a code names the sentence (a key of message area `checks`) with its figures, so the client
// says it in the person's language and writes the figures their way.

/** A figure of a refusal and the most decimals it is written with (trailing zeros dropped, as formatNumberTrimmed). */
export interface CheckFigure {
  value: number;
  digits: number;
}

/** A moment of a refusal (epoch ms) written as a date, or a date and time, in `timeZone` the language's way ("29 Mar 2026, 02:00"). */
export interface CheckMoment {
  atMs: number;
  timeZone: string;
  dateOnly: boolean;
}

/** One value in a refusal's sentence: a figure, a moment, text written as it is (a unit symbol, a typed value), or a refusal inside it. */
export type CheckParam = CheckFigure | CheckMoment | string | CheckProblem;

/** Why a shared check refused: `code` is a key of area `checks` ("reading.belowZero"), `params` the values its sentence names. */
export interface CheckProblem {
  code: string;
  params: Record<string, CheckParam>;
}

/** A figure of `value` written with at most `digits` decimals. */
export function figure(value: number, digits: number): CheckFigure {
  return { value, digits };
}

/** The moment `atMs` (epoch ms) in `timeZone`, as a date and time or a date only. */
export function moment(atMs: number, timeZone: string, dateOnly = false): CheckMoment {
  return { atMs, timeZone, dateOnly };
}

/** True when `param` is a moment. */
export function isCheckMoment(param: CheckParam): param is CheckMoment {
  return typeof param === 'object' && 'atMs' in param;
}

/** The refusal `code` with its values. */
export function checkProblem(code: string, params: Record<string, CheckParam> = {}): CheckProblem {
  return { code, params };
}

/** True when `param` is a refusal inside another one's sentence. */
export function isCheckProblem(param: CheckParam): param is CheckProblem {
  return typeof param === 'object' && 'code' in param;
}
