import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { knownMessages, localiseFigures, sayKnown } from '@shared/i18n/known-messages';
import { issueMessage } from '@shared/i18n/zod-messages';

const errors = JSON.parse(readFileSync(resolve(import.meta.dirname, '../../shared/i18n/messages/en/errors.json'), 'utf8')) as Record<string, unknown>;
const spanish = JSON.parse(readFileSync(resolve(import.meta.dirname, '../../shared/i18n/messages/es/errors.json'), 'utf8')) as Record<string, unknown>;

/** The catalogue message of the first issue of parsing `value` with `schema`. */
function messageOf(schema: z.ZodType, value: unknown): string | undefined {
  const result = schema.safeParse(value, { error: (issue) => issueMessage(issue, errors) });
  if (result.success) throw new Error('expected a failed parse');
  return result.error.issues[0].message;
}

describe("zod's own messages as catalogue messages", () => {
  it.each([
    ['an empty required text', z.string().min(1), '', 'Required'],
    ['a missing field', z.object({ name: z.string() }), {}, 'Required'],
    ['a text too short', z.string().min(8), 'abc', 'At least 8 characters'],
    ['a text too long', z.string().max(5), 'abcdefg', 'At most 5 characters'],
    ['text for a number', z.number(), 'x', 'Enter a number'],
    ['a fraction for a whole number', z.number().int(), 1.5, 'Enter a whole number'],
    ['a number under its minimum', z.number().min(10_000), 3, 'Must be at least 10,000'],
    ['a number at an exclusive maximum', z.number().lt(5), 5, 'Must be less than 5'],
    ['a word outside an enum', z.enum(['metric', 'us']), 'imperial', 'Choose one of the options'],
    ['a malformed e-mail', z.email(), 'not-an-address', 'Enter a valid e-mail address'],
    ['an empty list', z.array(z.number()).min(1), [], 'Choose at least 1'],
  ])('words %s', (_name, schema, value, message) => {
    expect(messageOf(schema, value)).toBe(message);
  });

  it('keeps a message the schema gives itself', () => {
    expect(messageOf(z.string().min(1, 'say why the flag is over'), '')).toBe('say why the flag is over');
  });
});

describe('known messages', () => {
  const known = knownMessages('errors', errors);
  const say = (text: string) => sayKnown(text, known, (key, named) => {
    const template = key.split('.').slice(1).reduce<unknown>((o, k) => (o as Record<string, unknown>)[k], spanish) as string;
    return template.replace(/\{(\w+)\}/g, (_m, n: string) => named[n]);
  });

  it('prefers the most specific message and keeps the field in front', () => {
    expect(known.match('Tank not found')).toEqual({ key: 'errors.notFound.tank', named: {} });
    expect(known.match('Sensor not found')).toEqual({ key: 'errors.notFound.generic', named: { what: 'Sensor' } });
    expect(say('staleAfterDays: must be 3 days or more')).toBe('staleAfterDays: debe ser 3 días o más');
    expect(say('lowStockL: must be 0 L or more')).toBe('lowStockL: debe ser 0 L o más');
    expect(say('Nothing like it')).toBe('Nothing like it');
  });

  it('writes English figures the way a locale writes them, leaving other values alone', () => {
    expect(localiseFigures({ a: '12,345.67', b: '0.5', c: '-3', d: 'Tank 1,2' }, 'es-ES')).toEqual({ a: '12.345,67', b: '0,5', c: '-3', d: 'Tank 1,2' });
  });
});
