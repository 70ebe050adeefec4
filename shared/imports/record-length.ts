// A cheap pass over an upload's bytes before the CSV parser sees them: no record (one row, with any
// quoted line breaks inside it) may be longer than MAX_RECORD_BYTES. A logger row is a few dozen
// bytes; a line of millions of separators, a cell of megabytes or a quote that is never closed would
// otherwise make the streaming parser hold (and re-read) one ever-growing record. The quote rules are
// papaparse's: a quote opens a field only as its first character, "" inside is a quote, and a closing
// quote may be followed by spaces before the separator or line break.

/** The longest record, in bytes, a logger file may have (header row included). */
export const MAX_RECORD_BYTES = 64 * 1024;

/** A record that is too long: the 1-based physical line it starts on, and why. */
export interface RecordProblem {
  line: number;
  reason: string;
}

/** Feeds an upload's bytes chunk by chunk; returns the first record that is too long, or null. */
export interface RecordGuard {
  push(chunk: Uint8Array): RecordProblem | null;
}

const QUOTE = 0x22;
const LF = 0x0a;
const CR = 0x0d;
const SPACE = 0x20;

// Where the guard is within a record.
const FIELD_START = 0;
const UNQUOTED = 1;
const QUOTED = 2;
/** A quote seen inside a quoted field: an escaped quote, the closing quote, or a stray one. */
const QUOTE_SEEN = 3;
/** Spaces after what may be the closing quote. */
const QUOTE_SPACES = 4;

const bytes = (n: number) => n.toLocaleString('en-US');

/** True when a chunk has no quote and every CR in it is followed by an LF within the chunk (native scans only). */
function quoteFreeLfChunk(chunk: Uint8Array): boolean {
  if (chunk.indexOf(QUOTE) !== -1) return false;
  for (let p = chunk.indexOf(CR); p !== -1; p = chunk.indexOf(CR, p + 1)) if (chunk[p + 1] !== LF) return false;
  return true;
}

/** A guard for one file whose field separator is `delimiter` (one character). */
export function createRecordGuard(delimiter: string, maxBytes = MAX_RECORD_BYTES): RecordGuard {
  const delim = delimiter.charCodeAt(0);
  let state: number = FIELD_START;
  let line = 1;
  let recordLine = 1;
  /** Bytes of the current record seen in earlier chunks. */
  let carried = 0;
  // A CR ended the previous chunk: an LF opening this one belongs to the same line break.
  let afterCr = false;
  let problem: RecordProblem | null = null;

  const tooLong = (atLine: number, inState: number): RecordProblem => {
    const quoted = inState === QUOTED || inState === QUOTE_SEEN || inState === QUOTE_SPACES;
    const reason = quoted
      ? `the row on line ${atLine} has a quoted field running past ${bytes(maxBytes)} bytes (a logger row is a few dozen); is a closing quote (") missing?`
      : `the row on line ${atLine} is longer than ${bytes(maxBytes)} bytes (a logger row is a few dozen); it cannot be a logger reading`;
    return { line: atLine, reason };
  };

  return {
    push(chunk) {
      if (problem) return problem;
      // Locals in the loop (the closure's variables are written back at the end): this pass runs over every byte.
      let s = state;
      let ln = line;
      let rl = recordLine;
      let cr = afterCr;
      // Where the current record starts, relative to this chunk (negative: it started in an earlier one).
      let start = -carried;
      const n = chunk.length;
      if ((s === FIELD_START || s === UNQUOTED) && quoteFreeLfChunk(chunk)) {
        // The usual logger chunk: no quotes and every CR part of a CRLF, so only the line feeds matter.
        for (let j = chunk.indexOf(LF); j !== -1; j = chunk.indexOf(LF, j + 1)) {
          const end = j > 0 && chunk[j - 1] === CR ? j - 1 : j;
          if (end - start > maxBytes) return (problem = tooLong(rl, UNQUOTED));
          if (!(j === 0 && cr)) ln++;
          start = j + 1;
          rl = ln;
        }
        s = start === n || chunk[n - 1] === delim ? FIELD_START : UNQUOTED;
        cr = false;
        carried = n - start;
        if (carried > maxBytes) return (problem = tooLong(rl, s));
        state = s;
        line = ln;
        recordLine = rl;
        afterCr = cr;
        return null;
      }
      for (let i = 0; i < n; i++) {
        const b = chunk[i];
        if (b === LF || b === CR) {
          if (!(cr && b === LF)) ln++;
          cr = b === CR;
          // A line break inside a quoted field is part of the record.
          if (s === QUOTED) continue;
          if (i - start > maxBytes) return (problem = tooLong(rl, s));
          s = FIELD_START;
          start = i + 1;
          rl = ln;
          continue;
        }
        cr = false;
        if (s === UNQUOTED) {
          if (b === delim) s = FIELD_START;
        } else if (s === FIELD_START) {
          s = b === QUOTE ? QUOTED : b === delim ? FIELD_START : UNQUOTED;
        } else if (s === QUOTED) {
          if (b === QUOTE) s = QUOTE_SEEN;
        } else if (s === QUOTE_SEEN) {
          s = b === QUOTE ? QUOTED : b === delim ? FIELD_START : b === SPACE ? QUOTE_SPACES : QUOTED;
        } else {
          s = b === SPACE ? QUOTE_SPACES : b === delim ? FIELD_START : QUOTED;
        }
      }
      carried = n - start;
      if (carried > maxBytes) return (problem = tooLong(rl, s));
      state = s;
      line = ln;
      recordLine = rl;
      afterCr = cr;
      return null;
    },
  };
}
