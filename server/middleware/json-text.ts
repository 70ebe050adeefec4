// JSON bodies whose text could not be stored as sent are refused, in one place for every route: a
// NUL character, bytes that are not UTF-8 (the body parser would quietly read each as U+FFFD) and
// lone surrogates (the database connector would write each as U+FFFD). The answer is a 422 naming
// the field, as an upload with such bytes is refused; a U+FFFD the client really sent is kept.
import { isUtf8 } from 'node:buffer';
import type { IncomingMessage } from 'node:http';
import type { RequestHandler } from 'express';
import { AppError } from '../errors';

/** Raw bodies (after any gzip) that are not UTF-8, kept only until the check below has named the field. */
const notUtf8 = new WeakMap<IncomingMessage, Buffer>();

/** express.json's `verify`: remembers a UTF-8 body whose bytes are not UTF-8. */
export function rememberNotUtf8(req: IncomingMessage, _res: unknown, raw: Buffer, encoding: string): void {
  if (/^utf-?8$/i.test(encoding) && !isUtf8(raw)) notUtf8.set(req, raw);
}

const REPLACEMENT = Buffer.from('\uFFFD', 'utf8');
// A lone surrogate never comes out of decoding, so it can stand for the bytes that were not UTF-8.
const MARK = '\\udfff';

/**
 * The body text with each real U+FFFD written as its JSON escape and each run of bytes that are not
 * UTF-8 as MARK. EF BF BD always decodes to U+FFFD whatever comes before it (EF is no continuation
 * byte), so decoding the parts between them gives the same characters as decoding the whole.
 */
function markedText(raw: Buffer): string {
  let out = '';
  let from = 0;
  for (;;) {
    const at = raw.indexOf(REPLACEMENT, from);
    out += raw.subarray(from, at === -1 ? raw.length : at).toString('utf8').replaceAll('\uFFFD', MARK);
    if (at === -1) return out;
    out += '\\ufffd';
    from = at + REPLACEMENT.length;
  }
}

const LONE_SURROGATE = /\p{Cs}/u;

function problemOf(text: string): string | null {
  if (text.includes('\u0000')) return 'must not contain the NUL character (U+0000)';
  if (LONE_SURROGATE.test(text)) return 'is not valid UTF-8 text (it holds bytes or a character escape that stand for no character); send it as UTF-8';
  return null;
}

/** The dotted path (as zod names fields: entries.0.note) and problem of the first text that cannot be stored as sent. */
function findProblem(value: unknown, path: (string | number)[]): { path: string; reason: string } | null {
  if (typeof value === 'string') {
    const reason = problemOf(value);
    return reason ? { path: path.join('.'), reason } : null;
  }
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const found = findProblem(value[i], [...path, i]);
      if (found) return found;
    }
    return null;
  }
  if (value !== null && typeof value === 'object') {
    for (const [key, item] of Object.entries(value)) {
      const keyReason = problemOf(key);
      if (keyReason) return { path: [...path, JSON.stringify(key).slice(1, -1)].join('.'), reason: `(a field name) ${keyReason}` };
      const found = findProblem(item, [...path, key]);
      if (found) return found;
    }
  }
  return null;
}

/** After express.json: refuses with 422 (code invalid_text, the field's path) a body holding text that cannot be stored as sent. */
export function refuseUnstorableText(): RequestHandler {
  return (req, _res, next) => {
    const raw = notUtf8.get(req);
    notUtf8.delete(req);
    // The body parsed once already, so the marked text (only escapes changed inside strings) parses too.
    const found = findProblem(raw ? JSON.parse(markedText(raw)) : req.body, []);
    if (found) throw new AppError(422, 'invalid_text', found.path ? `${found.path}: ${found.reason}` : `The request body ${found.reason}`, found.path || undefined);
    if (raw) throw new AppError(422, 'invalid_text', 'The request body is not valid UTF-8 text; send it as UTF-8');
    next();
  };
}
