// The words of flag texts: one short message (at most one 160-character segment of plain characters
// when the names allow) that names the flag and links to the tank, or to the flags page for several,
// in the language of the person who gets it.
import { DEFAULT_LANGUAGE, type Language } from '@shared/i18n/languages';
import type { Flag } from '../models';
import { flagLabelIn, flagMessageIn, tr } from '../i18n';

/** Longest text we compose: one SMS segment of the GSM 7-bit alphabet (3GPP TS 23.038; 160 septets). */
export const TEXT_MAX_CHARS = 160;

// The GSM 7-bit default alphabet's printable characters (3GPP TS 23.038, 6.2.1), less the extension table.
const GSM7 = new Set("@£$¥èéùìòÇ\nØø\rÅåΔ_ΦΓΛΩΠΨΣΘΞÆæßÉ !\"#¤%&'()*+,-./0123456789:;<=>?¡ABCDEFGHIJKLMNOPQRSTUVWXYZÄÖÑÜ§¿abcdefghijklmnopqrstuvwxyzäöñüà");
const PLAIN: Record<string, string> = { '’': "'", '‘': "'", '“': '"', '”': '"', '«': '"', '»': '"', '–': '-', '—': '-', '…': '...', '\u202f': ' ', '\u00a0': ' ', œ: 'oe', Œ: 'OE' };

/**
 * Our own words in characters of the GSM alphabet, so a Spanish or French text still fits one segment:
 * an accent the alphabet lacks is dropped (á → a, ê → e), as texts in those languages commonly are written.
 */
function plainText(ours: string): string {
  return [...ours].map((c) => (GSM7.has(c) ? c : (PLAIN[c] ?? (c.normalize('NFD').replace(/\p{M}/gu, '') || c)))).join('');
}

const clip = (s: string, max: number) => (s.length <= max ? s : `${s.slice(0, Math.max(0, max - 3)).trimEnd()}...`);

/** Text made of a lead clipped to fit before a link that is never cut. */
function withLink(lead: string, link: string): string {
  return `${clip(lead, TEXT_MAX_CHARS - link.length - 1)} ${link}`;
}

/** Where a flag's text points: its tank's page, or the flags page for an input's flag. */
export function flagLink(flag: Pick<Flag, 'subjectType' | 'subjectId'>, publicUrl: string): string {
  return flag.subjectType === 'tank' ? `${publicUrl}/tanks/${flag.subjectId}` : `${publicUrl}/flags`;
}

/** The text about newly raised flags in `language`: the flag itself when one, a count and the kinds when several. */
export function raisedFlagsText(flags: Flag[], farmNames: Map<number, string>, publicUrl: string, language: Language = DEFAULT_LANGUAGE): string {
  const kindOf = (f: Flag) => plainText(flagLabelIn(f.kind, language));
  if (flags.length === 1) {
    const [f] = flags;
    const lead = tr(language, 'texts.one', { kind: kindOf(f), farm: farmNames.get(f.farmId) ?? plainText(tr(language, 'texts.farm')), message: plainText(flagMessageIn(f.message, language)) });
    return withLink(lead, flagLink(f, publicUrl));
  }
  const kinds = [...new Set(flags.map(kindOf))].join(', ');
  const tanks = new Set(flags.filter((f) => f.subjectType === 'tank').map((f) => f.subjectId));
  const link = tanks.size === 1 ? flagLink(flags.find((f) => f.subjectType === 'tank')!, publicUrl) : `${publicUrl}/flags`;
  return withLink(plainText(tr(language, 'texts.several', { n: flags.length, kinds })), link);
}

/** The daily summary text in `language`: how many flags are active and of which kinds. */
export function digestText(flags: Flag[], publicUrl: string, language: Language = DEFAULT_LANGUAGE): string {
  const kinds = [...new Set(flags.map((f) => plainText(flagLabelIn(f.kind, language))))].join(', ');
  return withLink(plainText(tr(language, 'texts.digest', { n: flags.length, kinds }, flags.length)), `${publicUrl}/flags`);
}
