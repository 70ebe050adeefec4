// Refusals the shared schemas write for forms (an order with no line, a stock count below zero, a flag
// closed without a reason…) said in the screens' language: each is an English sentence of area `errors`
// (forms.*) that sayError reads back, the way useFormErrors shows every schema message. English unchanged.
import { afterEach, describe, expect, it } from 'vitest';
import { fieldErrors, orderCreateSchema } from '@shared/schemas';
import { sayError, setLanguage } from '@/i18n';
import en from '@shared/i18n/messages/en/errors.json';

afterEach(() => setLanguage('en'));

const FORM_MESSAGES = Object.values(en.forms);

describe('sayError for the schemas’ form refusals', () => {
  it('says an order with no line as the schema does in English, and in Spanish and French', () => {
    const result = orderCreateSchema.safeParse({ supplierId: 1, farmId: 1, lines: [] });
    expect(result.success).toBe(false);
    const message = fieldErrors(result.error!).lines;
    expect(sayError(message)).toBe('add at least one line');
    setLanguage('es');
    expect(sayError(message)).toBe('añada al menos una línea');
    setLanguage('fr');
    expect(sayError(message)).toBe('ajoutez au moins une ligne');
  });

  it('keeps a temperature bound’s figure in the language’s sentence', () => {
    setLanguage('fr');
    expect(sayError('must be 45 °C or less')).toBe('doit être de 45 °C au plus');
    setLanguage('es');
    expect(sayError('must be 90° or less')).toBe('debe ser 90° o menos');
  });

  it.each(['es', 'fr'] as const)('has a sentence of its own in %s for every form refusal, none left in English', (language) => {
    const english = FORM_MESSAGES.map((m) => sayError(m.replace('{max}', '10')));
    expect(english).toEqual(FORM_MESSAGES.map((m) => m.replace('{max}', '10')));
    setLanguage(language);
    for (const message of FORM_MESSAGES) {
      const text = message.replace('{max}', '10');
      expect(sayError(text), text).not.toBe(text);
    }
  });
});
