// Reading a stored logger file as CSV: the separators to read it with, decided from its first bytes
// as the browser preview decides them, and its records in batches from a stream so a long file is
// never held whole.
import { createReadStream } from 'node:fs';
import Papa from 'papaparse';
import { csvParseOptions, delimiterCandidates, stripBom, type FieldDelimiter, type ImportMapping, type LineBreak } from '@shared/imports';

/** Records per parsed batch: the file is paused while a batch is checked, converted and queued for loading. */
export const READING_BATCH_ROWS = 2_500;

/**
 * The field separator and record separator to read the file with: the mapping's separator or papaparse's
 * guess among the allowed ones, and papaparse's guess of the line ending, both from the first bytes. Both
 * are then given to the streaming parse, so every chunk is read alike and line numbers can be counted.
 */
export function chooseLayout(head: Uint8Array, mapping: ImportMapping): { delimiter: FieldDelimiter; newline: LineBreak } {
  const candidates = delimiterCandidates(mapping);
  const text = stripBom(Buffer.from(head).toString('utf8'));
  const meta = Papa.parse<string[]>(text, { ...(candidates.length === 1 ? { delimiter: candidates[0] } : { delimitersToGuess: candidates }), preview: 50, skipEmptyLines: 'greedy' }).meta;
  const delimiter = candidates.includes(meta.delimiter as FieldDelimiter) ? (meta.delimiter as FieldDelimiter) : candidates[0];
  const newline = (['\n', '\r\n', '\r'] as const).find((n) => n === meta.linebreak) ?? '\n';
  return { delimiter, newline };
}

/**
 * The records of a CSV file in batches of up to `size`, read as a stream: papaparse is paused (and the
 * file with it) while a batch is being stored, so at most about one batch and one read chunk are held.
 */
export function csvRecords(path: string, options: ReturnType<typeof csvParseOptions>, size: number) {
  // utf8 on the read stream: its decoder keeps multi-byte characters whole across chunk boundaries.
  const input = createReadStream(path, { encoding: 'utf8', highWaterMark: 256 * 1024 });
  async function* batches(): AsyncGenerator<string[][]> {
    let batch: string[][] = [];
    let handle: Papa.Parser | null = null;
    let held = false;
    let done = false;
    let failure: unknown = null;
    let wake: (() => void) | null = null;
    const signal = () => {
      const w = wake;
      wake = null;
      w?.();
    };
    Papa.parse<string[]>(input, {
      ...options,
      step: (r, p) => {
        handle = p;
        batch.push(r.data);
        if (batch.length >= size) {
          held = true;
          p.pause();
          input.pause();
          signal();
        }
      },
      complete: () => {
        done = true;
        signal();
      },
      error: (err) => {
        failure = err;
        done = true;
        signal();
      },
    });
    try {
      for (;;) {
        if (failure) throw failure;
        if (batch.length >= size || (done && batch.length)) {
          const out = batch;
          batch = [];
          yield out;
          if (held) {
            held = false;
            (handle as Papa.Parser | null)?.resume();
            // Resuming may have filled the next batch at once; the file stays paused then.
            if (!held) input.resume();
          }
          continue;
        }
        if (done) return;
        await new Promise<void>((r) => (wake = r));
      }
    } finally {
      if (!done) (handle as Papa.Parser | null)?.abort();
      input.destroy();
    }
  }
  return { batches: batches(), bytesRead: () => input.bytesRead };
}
