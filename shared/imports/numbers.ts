// Numbers as loggers write them: a decimal point or a decimal comma, never grouping separators
// (1.234,5 or 1,234.5 would be read wrongly one way or the other, so they are refused).

/** A parsed number, or why the text is not one. */
export type NumberResult = { ok: true; value: number } | { ok: false; reason: string };

const POINT_RE = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;
const COMMA_RE = /^[+-]?(?:\d+(?:,\d*)?|,\d+)(?:[eE][+-]?\d+)?$/;

function finite(value: number, text: string, what: string): NumberResult {
  return Number.isFinite(value) ? { ok: true, value } : { ok: false, reason: `${what} "${text}" is too large to be a reading` };
}

/** The number in `raw` (surrounding spaces ignored) with a decimal point, or a decimal comma when `decimalComma`. */
export function parseDecimal(raw: string, decimalComma: boolean, what = 'Value'): NumberResult {
  const text = raw.trim();
  if (!text) return { ok: false, reason: `${what} is empty` };
  if (decimalComma) {
    if (COMMA_RE.test(text)) return finite(Number(text.replace(',', '.')), text, what);
    if (POINT_RE.test(text) && text.includes('.')) return { ok: false, reason: `${what} "${text}" has a decimal point, but the mapping says numbers use a decimal comma` };
  } else {
    if (POINT_RE.test(text)) return finite(Number(text), text, what);
    if (COMMA_RE.test(text)) return { ok: false, reason: `${what} "${text}" has a decimal comma: turn on "decimal comma" in the mapping` };
  }
  return { ok: false, reason: `${what} "${text.length > 40 ? `${text.slice(0, 40)}…` : text}" is not a number` };
}
