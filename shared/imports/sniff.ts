// Is an upload CSV text at all? Decided from its first bytes, never from the name or the type the
// browser claims: archive, compressed, document and image signatures, UTF-16 text, NUL bytes, a
// high share of control characters and bytes that are not UTF-8 all mean "not a text file we can read".

/** How many leading bytes the check looks at. */
export const SNIFF_BYTES = 64 * 1024;

import { checkProblem, type CheckProblem } from '../check-problems';

/**
 * The verdict on a file's first bytes: text, or what it looks like instead, in English (`reason`, the API's)
 * and as a code of message area `checks` (`problem`, sniff.*) for screens in other languages.
 */
export type SniffResult = { ok: true } | { ok: false; reason: string; problem: CheckProblem };

// File signatures ("magic numbers") from each format's own specification (ZIP APPNOTE 4.3.7 for
// PK\x03\x04, RFC 1952 §2.3.1 for gzip's 1F 8B, ISO 32000-1 §7.5.2 for %PDF, PNG spec §5.2, and so on;
// section numbers recalled from memory, not re-checked).
const SIGNATURES: { bytes: number[]; what: string; kind: string }[] = [
  { bytes: [0x50, 0x4b, 0x03, 0x04], what: 'a ZIP archive (a spreadsheet workbook is one)', kind: 'zip' },
  { bytes: [0x50, 0x4b, 0x05, 0x06], what: 'an empty ZIP archive', kind: 'zipEmpty' },
  { bytes: [0x50, 0x4b, 0x07, 0x08], what: 'a ZIP archive', kind: 'zipSpanned' },
  { bytes: [0x1f, 0x8b], what: 'a gzip-compressed file', kind: 'gzip' },
  { bytes: [0x42, 0x5a, 0x68], what: 'a bzip2-compressed file', kind: 'bzip2' },
  { bytes: [0xfd, 0x37, 0x7a, 0x58, 0x5a, 0x00], what: 'an xz-compressed file', kind: 'xz' },
  { bytes: [0x37, 0x7a, 0xbc, 0xaf, 0x27, 0x1c], what: 'a 7z archive', kind: 'sevenZip' },
  { bytes: [0x52, 0x61, 0x72, 0x21, 0x1a, 0x07], what: 'a RAR archive', kind: 'rar' },
  { bytes: [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1], what: 'an old-style office document or workbook', kind: 'oldOffice' },
  { bytes: [0x25, 0x50, 0x44, 0x46, 0x2d], what: 'a PDF document', kind: 'pdf' },
  { bytes: [0x89, 0x50, 0x4e, 0x47], what: 'a PNG image', kind: 'png' },
  { bytes: [0xff, 0xd8, 0xff], what: 'a JPEG image', kind: 'jpeg' },
  { bytes: [0x47, 0x49, 0x46, 0x38], what: 'a GIF image', kind: 'gif' },
  { bytes: [0x7f, 0x45, 0x4c, 0x46], what: 'a program (ELF executable)', kind: 'elf' },
];

/** The 1-based line of the first byte sequence that is not UTF-8, or null; a character cut off at the end of `head` is not counted. */
function firstNonUtf8Line(head: Uint8Array): number | null {
  try {
    // stream: true leaves a character cut off at the end of the head undecoded instead of failing on it.
    new TextDecoder('utf-8', { fatal: true }).decode(head, { stream: true });
    return null;
  } catch {
    const text = new TextDecoder('utf-8').decode(head, { stream: true });
    const at = text.indexOf('\uFFFD');
    let line = 1;
    for (let i = 0; i < at; i++) if (text.charCodeAt(i) === 10 || (text.charCodeAt(i) === 13 && text.charCodeAt(i + 1) !== 10)) line++;
    return line;
  }
}

const startsWith = (b: Uint8Array, sig: number[]) => b.length >= sig.length && sig.every((v, i) => b[i] === v);

/** Whether the first bytes of an upload (up to SNIFF_BYTES) look like CSV text, or what they look like instead. */
export function sniffCsv(head: Uint8Array): SniffResult {
  for (const s of SIGNATURES) {
    if (startsWith(head, s.bytes)) {
      return { ok: false, reason: `it is ${s.what}, not CSV text; export the logger data as a CSV file`, problem: checkProblem('sniff.notCsv', { what: checkProblem(`sniff.what.${s.kind}`) }) };
    }
  }
  if (startsWith(head, [0xff, 0xfe]) || startsWith(head, [0xfe, 0xff])) {
    return { ok: false, reason: 'it is saved as UTF-16 text; save or export it as UTF-8 (or plain) CSV', problem: checkProblem('sniff.utf16') };
  }
  const n = Math.min(head.length, SNIFF_BYTES);
  let control = 0;
  for (let i = 0; i < n; i++) {
    const b = head[i];
    if (b === 0) return { ok: false, reason: 'it contains NUL bytes, so it is a binary file, not CSV text', problem: checkProblem('sniff.nul') };
    // Tab, line feed, vertical tab, form feed and carriage return are text; 0x1A ends old DOS text files.
    if (b < 0x20 && (b < 0x09 || b > 0x0d) && b !== 0x1a) control++;
  }
  if (n > 0 && control / n > 0.01) return { ok: false, reason: 'it is mostly control characters, so it is a binary file, not CSV text', problem: checkProblem('sniff.control') };
  const notUtf8 = firstNonUtf8Line(head.subarray(0, n));
  if (notUtf8 !== null) {
    return {
      ok: false,
      reason: `it is not UTF-8 text (line ${notUtf8} has bytes that are not UTF-8, as in a Latin-1 or Windows-1252 file); save or export it as UTF-8 CSV`,
      problem: checkProblem('sniff.notUtf8', { line: String(notUtf8) }),
    };
  }
  return { ok: true };
}
