// Refusals the shared schemas write for forms (an order with no line, a stock count below zero, a flag
// closed without a reason…) said in the screens' language: each is an English sentence of area `errors`
// (forms.*) that sayError reads back, the way useFormErrors shows every schema message. English unchanged.
import { afterEach, describe, expect, it } from 'vitest';
import { fieldErrors, orderCreateSchema } from '@shared/schemas';
import { readingToVolumes } from '@shared/readings';
import { sayError, setLanguage } from '@/i18n';
import { checkMessage } from '@/i18n/checkMessage';
import { applyResults } from '@/stores/round-answers';
import type { RoundDraft } from '@/stores/round-entry';
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

  it('says a tank editor’s fill line above the top of the tank in Spanish with the top’s figure', () => {
    expect(sayError('must be at or below the top of the tank (1500 mm)')).toBe('must be at or below the top of the tank (1500 mm)');
    setLanguage('es');
    expect(sayError('must be at or below the top of the tank (1500 mm)')).toBe('debe estar a la altura de la parte superior del tanque (1500 mm) o por debajo');
  });

  it('keeps a temperature bound’s figure in the language’s sentence', () => {
    setLanguage('fr');
    expect(sayError('must be 45 °C or less')).toBe('doit être de 45 °C au plus');
    setLanguage('es');
    expect(sayError('must be 90° or less')).toBe('debe ser 90° o menos');
  });

  it.each(['es', 'fr'] as const)('has a sentence of its own in %s for every form refusal, none left in English', (language) => {
    const fill = (m: string) => m.replace('{max}', '10').replace('{top}', '1500');
    const english = FORM_MESSAGES.map((m) => sayError(fill(m)));
    expect(english).toEqual(FORM_MESSAGES.map(fill));
    setLanguage(language);
    for (const message of FORM_MESSAGES) {
      const text = fill(message);
      expect(sayError(text), text).not.toBe(text);
    }
  });
});

describe('the server’s answers to a round’s entries', () => {
  it('says a refused tank in Spanish and French, the tank’s name kept', () => {
    expect(sayError('This tank is archived')).toBe('This tank is archived');
    setLanguage('es');
    expect(sayError('This tank is archived')).toBe('Este tanque está archivado');
    setLanguage('fr');
    expect(sayError('Ridge water tank (HR-W1): this entry\'s key is used by another entry of the round')).toBe(
      'Ridge water tank (HR-W1) : la clé de cette saisie est utilisée par une autre saisie de la tournée',
    );
  });

  it('keeps the code of a reading the tank refuses with the entry, so the card says it in the language', () => {
    // A 1,000 mm upright cylinder 1,500 mm tall: a 2,000 mm tube reading is above its top.
    const refused = readingToVolumes({ geometry: { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1500 }, datumOffsetMm: 0, outletHeightMm: 100, safeFillLevelMm: 1400, specificGravity: 1 }, { kind: 'sight-tube', readingMm: 2000 });
    if (refused.ok) throw new Error('expected a refusal');
    const draft = { entries: { '7': { tankId: 7, result: null, outboxSeq: null } } } as unknown as RoundDraft;
    applyResults(draft, [{ tankId: 7, status: 'refused', reason: refused.reason, problem: refused.problem }]);
    const result = draft.entries['7'].result!;
    expect(checkMessage(result.problem!)).toBe(result.reason);
    setLanguage('es');
    expect(checkMessage(result.problem!)).toMatch(/^La lectura de 2000 mm deja el nivel 500 mm por encima/);
  });
});
