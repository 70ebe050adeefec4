// Why an import refused a file or added nothing, in the screens' language. The server keeps the reason in
// English with the import (refused file, no good rows, a file imported already, a mapped column not in the
// file, an import stopped); each is one of the sentences of area `checks` (imports.file.*, imports.column.*),
// so it is read back as that sentence with its values and said again, counts written the language's way, the
// policy by its translated title and a column's part said the same way. Any other text stays as it is.
import { IMPORT_POLICY_TITLES, type ImportPolicy } from '@shared/imports';
import { knownMessages } from '@shared/i18n/known-messages';
import { formatNumber } from '@shared/units';
import en from '@shared/i18n/messages/en/checks.json';
import { i18n } from '@/i18n';
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
