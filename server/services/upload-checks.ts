// Checks an upload passes before any import work starts: the type the browser declared, the first
// bytes (the shared content check), and one streaming pass that no record is longer than a logger row
// can be. Each refusal is a 4xx naming the file and, for a record, its line.
import { createReadStream } from 'node:fs';
import { open } from 'node:fs/promises';
import Papa from 'papaparse';
import { SNIFF_BYTES, createRecordGuard, delimiterCandidates, sniffCsv, stripBom, type FieldDelimiter, type ImportMapping } from '@shared/imports';
import { AppError } from '../errors';
import { labelOf, type UploadedFile } from './upload-files';

// Types a browser or logger tool may give a CSV file: text/csv, text/plain and the like, the
// spreadsheet type some systems give every .csv, and "unknown". Anything else (an image, an archive, a
// document) is refused before it is stored.
const CSV_LIKE_TYPES = new Set(['', 'application/octet-stream', 'application/csv', 'application/x-csv', 'application/vnd.ms-excel']);

/** Null when a declared content type can be CSV text, otherwise why not. */
export function declaredTypeProblem(mimetype: string | undefined): string | null {
  const type = (mimetype ?? '').split(';')[0].trim().toLowerCase();
  if (type.startsWith('text/') || CSV_LIKE_TYPES.has(type)) return null;
  return `it was sent as ${type.slice(0, 100)}, not as CSV text; choose the logger's CSV export`;
}

/** The first SNIFF_BYTES bytes of a stored upload. */
export async function readHead(path: string): Promise<Uint8Array> {
  const fh = await open(path, 'r');
  try {
    const buf = Buffer.alloc(SNIFF_BYTES);
    const { bytesRead } = await fh.read(buf, 0, SNIFF_BYTES, 0);
    return buf.subarray(0, bytesRead);
  } finally {
    await fh.close();
  }
}

/** The field separator the import will read with: the mapping's, or papaparse's guess among the allowed ones from the first bytes. */
function separatorOf(head: Uint8Array, mapping: ImportMapping): FieldDelimiter {
  const candidates = delimiterCandidates(mapping);
  if (candidates.length === 1) return candidates[0];
  const meta = Papa.parse<string[]>(stripBom(Buffer.from(head).toString('utf8')), { delimitersToGuess: candidates, preview: 50, skipEmptyLines: 'greedy' }).meta;
  return candidates.includes(meta.delimiter as FieldDelimiter) ? (meta.delimiter as FieldDelimiter) : candidates[0];
}

/** Refuses (415 or 422, field "files") the first uploaded file that is not CSV text or has a record longer than MAX_RECORD_BYTES. */
export async function assertUploadsReadable(files: UploadedFile[], mapping: ImportMapping): Promise<void> {
  for (const f of files) {
    const head = await readHead(f.path);
    const verdict = sniffCsv(head);
    if (!verdict.ok) throw new AppError(415, 'not_csv', `files: "${labelOf(f.originalName)}" cannot be imported: ${verdict.reason}`, 'files');
    const guard = createRecordGuard(separatorOf(head, mapping));
    for await (const chunk of createReadStream(f.path, { highWaterMark: 256 * 1024 })) {
      const problem = guard.push(chunk as Buffer);
      if (problem) throw new AppError(422, 'record_too_long', `files: "${labelOf(f.originalName)}" cannot be imported: ${problem.reason}`, 'files');
    }
  }
}
