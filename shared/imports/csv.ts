// CSV layout helpers shared by the browser preview and the server's streaming import: the parser
// options both sides give papaparse, and the bookkeeping that turns parsed records back into
// physical line numbers (a quoted field may span several lines).
import type { Delimiter, ImportMapping } from './mapping';

/** A concrete field separator (after 'auto' has been resolved). */
export type FieldDelimiter = Exclude<Delimiter, 'auto'>;

/** Separators 'auto' may pick; with a decimal comma the comma cannot be the separator (it would split every number). */
export function delimiterCandidates(mapping: Pick<ImportMapping, 'delimiter' | 'decimalComma'>): FieldDelimiter[] {
  if (mapping.delimiter !== 'auto') return [mapping.delimiter];
  return mapping.decimalComma ? [';', '\t'] : [',', ';', '\t'];
}

/** A record separator papaparse may find (or be told): LF, CRLF or a lone CR. */
export type LineBreak = '\n' | '\r\n' | '\r';

/**
 * The papaparse options (a plain object) for reading a logger file record by record: every cell as text,
 * no header handling and no blank-line skipping, so line numbers can be counted from what comes back.
 * Without `newline` papaparse guesses the line ending itself.
 */
export function csvParseOptions(delimiter: FieldDelimiter, newline?: LineBreak) {
  return { delimiter, ...(newline ? { newline } : {}), quoteChar: '"', escapeChar: '"', header: false, dynamicTyping: false, skipEmptyLines: false } as const;
}

/** The text without a leading UTF-8 byte-order mark. */
export function stripBom(text: string): string {
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

/** True when every cell of a record is empty or white space (a blank line, or one of separators only). */
export function isBlankRow(cells: readonly string[]): boolean {
  for (const c of cells) if (c.trim() !== '') return false;
  return true;
}

/**
 * How many physical line breaks (CRLF, lone CR or lone LF) sit inside a record that papaparse split at
 * `newline`: a record starting on line n ends on line n + this. Where a separator and a character beside
 * it form one CRLF (a CR left at the end of an LF-separated record, or an LF opening a CR-separated one),
 * the pair counts once. `first`: the file's first record, which no separator precedes.
 */
export function lineBreaksInside(cells: readonly string[], newline: LineBreak = '\n', first = false): number {
  let n = 0;
  for (const c of cells) {
    if (c.indexOf('\n') === -1 && c.indexOf('\r') === -1) continue;
    for (let j = 0; j < c.length; j++) {
      const ch = c.charCodeAt(j);
      if (ch === 10) n++;
      else if (ch === 13 && c.charCodeAt(j + 1) !== 10) n++;
    }
  }
  if (newline === '\n' && cells.length && cells[cells.length - 1].endsWith('\r')) n--;
  if (newline === '\r' && !first && cells.length && cells[0].startsWith('\n')) n--;
  return n;
}
