// Why an import refused a file or added nothing, in the screens' language. The server keeps the reason in
// English with the import (refused file, no good rows, a file imported already, a mapped column not in the
// file, an import stopped); each is one of the sentences of area `checks` (imports.file.*, imports.column.*),
// so it is read back as that sentence with its values and said again, counts written the language's way, the
// policy by its translated title and a column's part said the same way. Any other text stays as it is.
import { IMPORT_POLICY_TITLES, type ImportPolicy } from '@shared/imports';
import { knownMessages } from '@shared/i18n/known-messages';
import { formatNumber } from '@shared/units';
import en from '@shared/i18n/messages/en/checks.json';
import type { CheckProblem } from '@shared/check-problems';
import { i18n } from '@/i18n';
import { checkMessage } from '@/i18n/checkMessage';
import { policyLabel } from './importLabels';

const fileMessages = knownMessages('checks.imports.file', en.imports.file);
const columnMessages = knownMessages('checks.imports.column', en.imports.column);
const POLICY_BY_TITLE = new Map(Object.entries(IMPORT_POLICY_TITLES).map(([policy, title]) => [title, policy as ImportPolicy]));

/** A count as the server's English writes it ("1,234"), in the language's way; any other text as it is. */
function sayCount(text: string): string {
  return /^\d{1,3}(,\d{3})*$/.test(text) ? formatNumber(Number(text.replace(/,/g, ''))) : text;
}

/** A mapped column's refusal ("Value column: The column 5 (index 4) is not in the file…") said again, its parts too; null when it is none. */
function sayColumn(text: string): string | null {
  const known = columnMessages.match(text);
  if (!known) return null;
  const named: Record<string, string> = {};
  // The column's description and the reason inside "Value column: …" are sentences of the same group.
  for (const [name, value] of Object.entries(known.named)) named[name] = name === 'detail' || name === 'ref' ? (sayColumn(value) ?? value) : value;
  return i18n.global.t(known.key, named);
}

/** An import's `error` (English, from the server) in the screens' language; null for none. */
export function importErrorText(error: string | null): string | null {
  if (!error) return null;
  const known = fileMessages.match(error);
  if (!known) return sayColumn(error) ?? error;
  const named: Record<string, string> = {};
  for (const [name, value] of Object.entries(known.named)) {
    const policy = name === 'policy' ? POLICY_BY_TITLE.get(value) : undefined;
    named[name] = policy ? policyLabel(policy).title : name === 'rejected' || name === 'rows' ? sayCount(value) : value;
  }
  return i18n.global.t(known.key, named);
}

// A stored line's reason (kept in English, without its code, by imports read before codes came along).
const lineMessages = knownMessages('checks.imports', { cell: en.imports.cell, number: en.imports.number, row: en.imports.row, what: en.imports.what, column: en.imports.column, note: en.imports.note, file: en.imports.file });
const readingMessages = knownMessages('checks.reading', en.reading);
/** Values of a reason that are reasons or descriptions themselves. */
const NESTED = new Set(['what', 'detail', 'gap', 'ref']);

/**
 * `text` read back as a sentence of area checks and said in `locale`, its parts too; null when it is none. A
 * reading of the text counts only when its parts are sentences too and saying it in English gives the text again.
 */
function sayLine(text: string, locale: string, depth = 0): string | null {
  if (depth > 3) return null;
  for (const known of [readingMessages.match(text), lineMessages.match(text)]) {
    if (!known) continue;
    const english: Record<string, string> = {};
    const said: Record<string, string> = {};
    let whole = true;
    for (const [name, value] of Object.entries(known.named)) {
      if (!NESTED.has(name)) {
        english[name] = said[name] = value;
        continue;
      }
      const inner = sayLine(value, 'en', depth + 1);
      if (inner !== value) whole = false;
      english[name] = value;
      said[name] = sayLine(value, locale, depth + 1) ?? value;
    }
    if (whole && i18n.global.t(known.key, english, { locale: 'en' }) === text) return i18n.global.t(known.key, said, { locale });
  }
  return null;
}

/**
 * A refused line's reason in the screens' language: from its code when the server sent one, else the stored
 * English read back as its sentence, used only when saying that sentence in English gives the stored text
 * again (a pattern that read it wrongly would not); figures and moments inside stay as stored. Otherwise as stored.
 */
export function importReasonText(reason: string, problem?: CheckProblem): string {
  if (problem) return checkMessage(problem);
  return sayLine(reason, i18n.global.locale.value) ?? reason;
}
