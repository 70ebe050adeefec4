// zod's own messages (where a schema gives none) made catalogue messages, by issue code: the English
// of area `errors` with the issue's numbers filled in, so that the server and the client can then
// say them in the person's language (shared/i18n/known-messages.ts) under the field they belong to.
import { z } from 'zod';

type Issue = Parameters<z.core.$ZodErrorMap>[0];

const fill = (template: string, named: Record<string, string | number>) => template.replace(/\{\s*(\w+)\s*\}/g, (_m, name: string) => String(named[name] ?? ''));

/** The English catalogue message (from `errors`, the English area `errors` messages) for a zod issue, or undefined for zod's own. */
export function issueMessage(issue: Issue, errors: Record<string, unknown>): string | undefined {
  const say = (key: string, named: Record<string, string | number> = {}) => (typeof errors[key] === 'string' ? fill(errors[key], named) : undefined);
  const bound = (value: unknown) => (typeof value === 'bigint' || typeof value === 'number' ? Number(value).toLocaleString('en-US') : String(value));
  switch (issue.code) {
    case 'invalid_type':
      if (issue.input === undefined || issue.input === null || issue.input === '') return say('required');
      if (issue.expected === 'int') return typeof issue.input === 'number' ? say('notInteger') : say('notNumber');
      if (issue.expected === 'number' || issue.expected === 'bigint') return say('notNumber');
      if (issue.expected === 'string') return say('notText');
      if (issue.expected === 'date') return say('notDate');
      return say('invalid');
    case 'too_small': {
      const minimum = bound(issue.minimum);
      if (issue.origin === 'string') return Number(issue.minimum) <= 1 ? say('required') : say('tooShort', { minimum });
      if (issue.origin === 'array' || issue.origin === 'set') return say('tooFew', { minimum });
      return say(issue.inclusive === false ? 'aboveMinimum' : 'atLeast', { minimum });
    }
    case 'too_big': {
      const maximum = bound(issue.maximum);
      if (issue.origin === 'string') return say('tooLong', { maximum });
      if (issue.origin === 'array' || issue.origin === 'set') return say('tooMany', { maximum });
      return say(issue.inclusive === false ? 'belowMaximum' : 'atMost', { maximum });
    }
    case 'invalid_format':
      return issue.format === 'email' ? say('invalidEmail') : say('invalid');
    case 'invalid_value':
      return say('invalidChoice');
    case 'not_multiple_of':
      return issue.divisor === 1 ? say('notInteger') : say('invalid');
    default:
      return say('invalid');
  }
}

/** Makes every zod message a schema does not give itself a catalogue message (`errors`: the English area `errors`). */
export function useCatalogueZodMessages(errors: Record<string, unknown>): void {
  z.config({ customError: (issue) => issueMessage(issue, errors) });
}
