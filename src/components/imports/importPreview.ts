// The browser's look at a chosen logger file before it is sent: its first bytes checked the way the
// server checks them, its first records split by papaparse with the server's own options, and each
// of those records run through the shared row reader so bad rows show red before anything uploads.
import Papa from 'papaparse';
import {
  SNIFF_BYTES,
  createImportReader,
  csvParseOptions,
  delimiterCandidates,
  sniffCsv,
  stripBom,
  type FieldDelimiter,
  type ImportMapping,
  type ImportNotice,
  type ImportProblem,
  type ImportedReading,
} from '@shared/imports';
import type { TankSetup } from '@shared/readings';
import { i18n } from '@/i18n';
import { checkMessage } from '@/i18n/checkMessage';

/** Records the preview shows (and checks). */
export const PREVIEW_RECORDS = 20;

/** The start of a chosen file: its text (up to SNIFF_BYTES) and whether it looks like CSV at all. */
export interface FileHead {
  text: string;
  /** The file is longer than `text`. */
  truncated: boolean;
  /** Why the file cannot be imported (not text, UTF-16, binary…), or null. */
  problem: string | null;
}

/** Reads the first SNIFF_BYTES of `file` and checks them with the server's content check. */
export async function readFileHead(file: Blob): Promise<FileHead> {
  const bytes = new Uint8Array(await file.slice(0, SNIFF_BYTES).arrayBuffer());
  const verdict = sniffCsv(bytes);
  if (!verdict.ok) return { text: '', truncated: file.size > bytes.length, problem: i18n.global.t('imports.files.cannotImport', { reason: checkMessage(verdict.problem) }) };
  // stream: true leaves a multi-byte character cut at the end of the slice out instead of garbling it.
  const text = stripBom(new TextDecoder('utf-8').decode(bytes, { stream: file.size > bytes.length }));
  return { text, truncated: file.size > bytes.length, problem: null };
}

/** The separator the server will read the file with: the mapping's, or papaparse's guess among the allowed ones. */
export function resolveDelimiter(text: string, mapping: Pick<ImportMapping, 'delimiter' | 'decimalComma'>): FieldDelimiter {
  const candidates = delimiterCandidates(mapping);
  if (candidates.length === 1) return candidates[0];
  // The same guess the server makes from the same first bytes (server/services/import-csv.ts chooseLayout).
  const guess = Papa.parse<string[]>(text, { delimitersToGuess: candidates, preview: 50, skipEmptyLines: 'greedy' }).meta.delimiter as FieldDelimiter;
  return candidates.includes(guess) ? guess : candidates[0];
}

/** The first records of the file's text as papaparse splits them with the import's own options. */
export function previewRecords(head: FileHead, delimiter: FieldDelimiter): string[][] {
  const parsed = Papa.parse<string[]>(head.text, { ...csvParseOptions(delimiter), preview: PREVIEW_RECORDS });
  const records = parsed.data;
  // A file longer than the slice may end it mid-line; that last record would be reported wrongly.
  if (head.truncated && records.length < PREVIEW_RECORDS) records.pop();
  // papaparse gives a trailing line break one empty record of its own; the file has no such line.
  const last = records[records.length - 1];
  if (!head.truncated && last && last.length === 1 && last[0] === '' && /\r?\n$|\r$/.test(head.text)) records.pop();
  return records;
}

/** One previewed record after the row reader saw it. */
export interface PreviewRow {
  /** 1-based line of the file where the record starts. */
  line: number;
  cells: readonly string[];
  kind: 'header' | 'blank' | 'reading' | 'rejected' | 'unchecked';
  problems: ImportProblem[];
  reading: ImportedReading | null;
  /** How a local time that happens twice was read, when it was. */
  notice: ImportNotice | null;
}

/** The preview rows checked with the mapping; `fatal` says why the file as a whole cannot be read with it. */
export interface PreviewCheck {
  rows: PreviewRow[];
  fatal: string | null;
  good: number;
  bad: number;
}

/**
 * Runs the records through the shared row reader with the tank's setup, as the server will, and says
 * for each whether it is the header, a good reading or a refused row with its problems.
 */
export function checkPreview(records: readonly (readonly string[])[], mapping: ImportMapping, tank: TankSetup, nowMs: number, displayTimeZone = 'UTC'): PreviewCheck {
  const reader = createImportReader({ mapping, tank, nowMs, displayTimeZone });
  const rows: PreviewRow[] = [];
  let fatal: string | null = null;
  let line = 1;
  for (const cells of records) {
    if (fatal) {
      rows.push({ line, cells, kind: 'unchecked', problems: [], reading: null, notice: null });
      continue;
    }
    const r = reader.feed(cells);
    if (r.kind === 'fatal') {
      fatal = checkMessage(r.problem);
      rows.push({ line, cells, kind: 'unchecked', problems: [], reading: null, notice: null });
    } else if (r.kind === 'reading') {
      line = r.reading.line;
      rows.push({ line, cells, kind: 'reading', problems: [], reading: r.reading, notice: r.notice ?? null });
    } else {
      line = r.line;
      rows.push({ line, cells, kind: r.kind, problems: r.kind === 'rejected' ? r.problems : [], reading: null, notice: null });
    }
    line++;
  }
  const good = rows.filter((r) => r.kind === 'reading').length;
  const bad = rows.filter((r) => r.kind === 'rejected').length;
  return { rows, fatal, good, bad };
}

/** The records without a mapping to check them: numbered by line, nothing judged yet. */
export function uncheckedRows(records: readonly (readonly string[])[]): PreviewRow[] {
  // Without the reader a quoted field spanning lines is not counted; fine for a preview that judges nothing.
  return records.map((cells, i) => ({ line: i + 1, cells, kind: 'unchecked', problems: [], reading: null, notice: null }));
}
