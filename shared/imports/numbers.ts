// Numbers as loggers write them: a decimal point or a decimal comma, never grouping separators
// (1.234,5 or 1,234.5 would be read wrongly one way or the other, so they are refused). The reading
// itself is the one shared parser's (shared/units/decimal.ts); the reasons here speak of the mapping.
import { parseDecimal } from '../units/index';

/** A parsed number, or why the text is not one. */
export type NumberResult = { ok: true; value: number } | { ok: false; reason: string };

/** The number in a logger file's cell `raw` (surrounding spaces ignored) with a decimal point, or a decimal comma when `decimalComma`. */
export function parseLoggerNumber(raw: string, decimalComma: boolean, what = 'Value'): NumberResult {
  const parsed = parseDecimal(raw, { decimalMark: decimalComma ? ',' : '.', grouping: false, exponent: true, field: what });
  if (parsed.ok) return { ok: true, value: parsed.value };
  if (parsed.problem !== 'other-mark') return { ok: false, reason: parsed.reason };
  const text = raw.trim();
  return {
    ok: false,
    reason: decimalComma
      ? `${what} "${text}" has a decimal point, but the mapping says numbers use a decimal comma`
      : `${what} "${text}" has a decimal comma: turn on "decimal comma" in the mapping`,
  };
}
