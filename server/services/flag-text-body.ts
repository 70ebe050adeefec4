// The words of flag texts: one short message (at most one 160-character segment of plain characters
// when the names allow) that names the flag and links to the tank, or to the flags page for several.
import { FLAG_LABELS } from '@shared/flags';
import type { Flag } from '../models';

/** Longest text we compose: one SMS segment of the GSM 7-bit alphabet (3GPP TS 23.038; 160 septets). */
export const TEXT_MAX_CHARS = 160;

const clip = (s: string, max: number) => (s.length <= max ? s : `${s.slice(0, Math.max(0, max - 3)).trimEnd()}...`);

/** Text made of a lead clipped to fit before a link that is never cut. */
function withLink(lead: string, link: string): string {
  return `${clip(lead, TEXT_MAX_CHARS - link.length - 1)} ${link}`;
}

/** Where a flag's text points: its tank's page, or the flags page for an input's flag. */
export function flagLink(flag: Pick<Flag, 'subjectType' | 'subjectId'>, publicUrl: string): string {
  return flag.subjectType === 'tank' ? `${publicUrl}/tanks/${flag.subjectId}` : `${publicUrl}/flags`;
}

/** The text about newly raised flags: the flag itself when one, a count and the kinds when several. */
export function raisedFlagsText(flags: Flag[], farmNames: Map<number, string>, publicUrl: string): string {
  if (flags.length === 1) {
    const [f] = flags;
    return withLink(`Brimstock ${FLAG_LABELS[f.kind]}, ${farmNames.get(f.farmId) ?? 'farm'}: ${f.message}`, flagLink(f, publicUrl));
  }
  const kinds = [...new Set(flags.map((f) => FLAG_LABELS[f.kind]))].join(', ');
  const tanks = new Set(flags.filter((f) => f.subjectType === 'tank').map((f) => f.subjectId));
  const link = tanks.size === 1 ? flagLink(flags.find((f) => f.subjectType === 'tank')!, publicUrl) : `${publicUrl}/flags`;
  return withLink(`Brimstock: ${flags.length} new flags - ${kinds}`, link);
}

/** The daily summary text: how many flags are active and of which kinds. */
export function digestText(flags: Flag[], publicUrl: string): string {
  const kinds = [...new Set(flags.map((f) => FLAG_LABELS[f.kind]))].join(', ');
  return withLink(`Brimstock daily: ${flags.length} flag${flags.length === 1 ? '' : 's'} need${flags.length === 1 ? 's' : ''} a look - ${kinds}`, `${publicUrl}/flags`);
}
