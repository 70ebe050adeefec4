import { i18n } from '@/i18n';

// The English text of one area's messages, cut at placeholders and plural bars into runs of at
// least two words: what a screen in another language must not show.
function englishRuns(area: string): string[] {
  const messages = (i18n.global.getLocaleMessage('en') as Record<string, unknown>)[area];
  const runs = new Set<string>();
  const walk = (value: unknown): void => {
    if (typeof value === 'string') {
      for (const part of value.split(/\{[^}]*\}|\|/)) {
        const run = part.trim().replace(/^[\s.,:;·()→-]+|[\s.,:;·()→-]+$/g, '');
        if (run.split(/\s+/).filter((w) => /\p{L}{2,}/u.test(w)).length >= 2) runs.add(run);
      }
    } else if (value && typeof value === 'object') {
      Object.values(value).forEach(walk);
    }
  };
  walk(messages);
  return [...runs];
}

/** The English runs of `areas`' messages that `text` still contains (empty when it is all translated). */
export function englishLeft(text: string, areas: readonly string[]): string[] {
  const flat = text.replace(/\s+/g, ' ');
  return areas.flatMap(englishRuns).filter((run) => flat.includes(run));
}
