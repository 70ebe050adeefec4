// Every CSV the server hands out (exports, the refused rows of an import, an order's attachment) is
// written by toCsv, so a spreadsheet never runs a cell as a formula, whichever separator it splits on.
// Formula characters and the prefix are those of OWASP's "CSV Injection" page.
import Papa, { type UnparseConfig } from 'papaparse';

/** A ; tab or line break straight before a formula character: a reader that splits there would start a cell with it. */
const SPLIT_THEN_FORMULA = /([;\t\r\n])(?=[=+\-@])/g;

/** Text gets a ' after each such split point; other values go through as they are. */
function defuse(cell: unknown): unknown {
  return typeof cell === 'string' ? cell.replace(SPLIT_THEN_FORMULA, "$1'") : cell;
}

const SAFE = {
  // A cell starting with = + - @ (or a tab or CR) gets a leading ' and quotes. papaparse's own pattern
  // ends in .*$, which misses such a cell when it goes on over a line break, hence this one.
  escapeFormulae: /^[=+\-@\t\r]/,
  // A cell holding ; or a tab is quoted, so a reader splitting on that keeps it whole where the cell
  // starts a field; where it does not, the split part is defused above.
  quotes: (value: unknown) => typeof value === 'string' && /[;\t]/.test(value),
} satisfies UnparseConfig;

/** CSV text of rows (or of named fields and rows) with every cell made safe for spreadsheets; CRLF line ends unless told. */
export function toCsv(input: unknown[][] | { fields: string[]; data: unknown[][] }, options: Pick<UnparseConfig, 'header' | 'newline'> = {}): string {
  const table = Array.isArray(input) ? input.map((row) => row.map(defuse)) : { fields: input.fields.map((f) => String(defuse(f))), data: input.data.map((row) => row.map(defuse)) };
  return Papa.unparse(table, { ...options, ...SAFE });
}
