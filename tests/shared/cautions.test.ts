import { describe, expect, it } from 'vitest';
import { CAUTION_SENTENCES, CAUTION_TOPICS, cautionText } from '@shared/cautions';
import { FLAG_CAUTION_SENTENCES, FLAG_CAUTIONS } from '@shared/flags';
import { FLAG_KINDS } from '@shared/schemas';

const everyCaution: [string, readonly string[]][] = [
  ...CAUTION_TOPICS.map((topic) => [topic, CAUTION_SENTENCES[topic]] as [string, readonly string[]]),
  ...FLAG_KINDS.filter((kind) => FLAG_CAUTION_SENTENCES[kind].length > 0).map((kind) => [`flag ${kind}`, FLAG_CAUTION_SENTENCES[kind]] as [string, readonly string[]]),
];

describe('cautions', () => {
  it.each(everyCaution)('writes the %s caution as short plain sentences', (_name, sentences) => {
    expect(sentences.length).toBeGreaterThan(0);
    for (const sentence of sentences) {
      // One statement each: a capital first, a full stop last, no clauses strung on with ; — or :.
      expect(sentence).toMatch(/^[A-Z].*\.$/);
      expect(sentence).not.toMatch(/[;:—–]/);
      expect(sentence.split(/\s+/).length).toBeLessThanOrEqual(16);
    }
  });

  it.each(everyCaution)('lets the %s caution defer to local codes or rules', (_name, sentences) => {
    expect(sentences.join(' ')).toMatch(/\blocal\b/);
  });

  it('joins a topic into one paragraph and a flag kind without a caution into null', () => {
    expect(cautionText('electrical')).toBe(CAUTION_SENTENCES.electrical.join(' '));
    expect(FLAG_CAUTIONS['cold-culture']).toBe(['Check the heater.', ...CAUTION_SENTENCES.electrical].join(' '));
    expect(FLAG_CAUTIONS['low-stock']).toBeNull();
  });
});
