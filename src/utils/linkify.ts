/** A run of mail text: plain, or a link to open. */
export interface TextPart {
  text: string;
  href?: string;
}

const URL_PATTERN = /https?:\/\/[^\s<>"]+/g;
const TRAILING = /[.,;:!?)\]'}]+$/;

/** Splits plain text into text and link parts so links can be shown clickable without using v-html. */
export function linkify(text: string): TextPart[] {
  const parts: TextPart[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    const start = match.index;
    // A sentence ending right after a link ("…?token=abc.") must not carry the full stop into the link.
    const url = match[0].replace(TRAILING, '');
    if (start > last) parts.push({ text: text.slice(last, start) });
    parts.push({ text: url, href: url });
    last = start + url.length;
  }
  if (last < text.length) parts.push({ text: text.slice(last) });
  return parts;
}
