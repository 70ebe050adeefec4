// Numbers as loggers write them: a decimal point or a decimal comma, never grouping separators
// (1.234,5 or 1,234.5 would be read wrongly one way or the other, so they are refused). The reading
// itself is the one shared parser's (shared/units/decimal.ts); the reasons here speak of the mapping.
import { parseDecimal } from '../units/index';
import { refusal, type Refusal } from './timestamps';

/** A parsed number, or why the text is not one (in English, and as a code of message area `checks`). */
export type NumberResult = { ok: true; value: number } | ({ ok: false } & Refusal);

const DECIMAL_CODES = { empty: 'empty', 'too-large': 'tooLarge', 'not-a-number': 'notNumber' } as const;

/** The number in a logger file's cell `raw` (surrounding spaces ignored) with a decimal point, or a decimal comma when `decimalComma`. */
export function parseLoggerNumber(raw: string, decimalComma: boolean, what: 'Value' | 'Temperature' = 'Value'): NumberResult {
  const parsed = parseDecimal(raw, { decimalMark: decimalComma ? ',' : '.', grouping: false, exponent: true, field: what });
  if (parsed.ok) return { ok: true, value: parsed.value };
  const text = raw.trim();
  // parseDecimal shortens a long cell to 40 characters in its reason; the code's text does the same.
  const shown = text.length > 40 ? `${text.slice(0, 40)}…` : text;
  // The field is part of the code: Spanish agrees the words with it (el valor vacío, la temperatura vacía).
  const field = what === 'Value' ? 'value' : 'temperature';
  if (parsed.problem !== 'other-mark') return { ok: false, ...refusal(parsed.reason, `number.${field}.${DECIMAL_CODES[parsed.problem]}`, { text: shown }) };
  return {
    ok: false,
    ...(decimalComma
      ? refusal(`${what} "${text}" has a decimal point, but the mapping says numbers use a decimal comma`, `number.${field}.hasPoint`, { text })
      : refusal(`${what} "${text}" has a decimal comma: turn on "decimal comma" in the mapping`, `number.${field}.hasComma`, { text })),
  };
}
