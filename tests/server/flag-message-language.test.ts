// Every sentence the flag rules write in English is one the catalogue reads back (area flagKinds.message),
// so a Spanish or French reader never gets an English flag sentence; and API errors keep their field.
import { describe, expect, it } from 'vitest';
import { frostAheadMessage, tankFlagConditions, type TankFlagInput } from '@shared/flags';
import { errorIn, flagMessageIn } from '../../server/i18n';

const NOW = Date.UTC(2026, 2, 4, 12);
const base: TankFlagInput = {
  name: 'Tank P1',
  contents: 'culture',
  usableL: 12_345.5,
  lowStockL: 0,
  levelMm: 900,
  safeFillLevelMm: 1_400,
  temperatureC: 22,
  takenAt: NOW - 3_600_000,
  now: NOW,
  staleAfterDays: 3,
  coldCultureC: 18,
  frostRiskC: 2,
  leaks: [],
};

const sentences: [string, string][] = [
  ['low-stock', tankFlagConditions({ ...base, lowStockL: 20_000 })[0].message],
  ['stale-tank', tankFlagConditions({ ...base, takenAt: NOW - 5 * 86_400_000 })[0].message],
  ['frost-risk', tankFlagConditions({ ...base, temperatureC: 1.5 })[0].message],
  ['cold-culture', tankFlagConditions({ ...base, temperatureC: 12.5 })[0].message],
  ['overfill', tankFlagConditions({ ...base, levelMm: 1_450 })[0].message],
  ['suspected-leak', tankFlagConditions({ ...base, leaks: [{ lossL: 1_250, rateLPerHour: 4.5 }] })[0].message],
  ['frost-ahead (culture)', frostAheadMessage({ name: 'Tank P1', contents: 'culture' }, { atMs: NOW, lowC: -1.5 }, 2, 'Europe/Madrid')],
  ['frost-ahead (water)', frostAheadMessage({ name: 'Tank P1', contents: 'water' }, { atMs: NOW, lowC: -1.5 }, 2, 'Europe/Madrid')],
];

describe('flag sentences in another language', () => {
  it.each(sentences.flatMap(([kind, message]) => (['es', 'fr'] as const).map((language) => [kind, language, message] as const)))(
    'reads the %s sentence back into %s, keeping the tank name',
    (_kind, language, message) => {
      const said = flagMessageIn(message, language);
      expect(said).not.toBe(message);
      expect(said).toContain('Tank P1');
    },
  );

  it('writes the figures the language’s way and leaves English and unknown sentences as they are', () => {
    const low = sentences[0][1];
    expect(low).toBe('Tank P1 has 12,346 L usable, under its 20,000 L threshold');
    expect(flagMessageIn(low, 'es')).toBe('Tank P1 tiene 12.346 L útiles, por debajo de su mínimo de 20.000 L');
    expect(flagMessageIn(low, 'fr')).toBe('Tank P1 a 12\u202f346 L utiles, sous son seuil de 20\u202f000 L');
    expect(flagMessageIn(low, 'en')).toBe(low);
    expect(flagMessageIn('Something new happened', 'es')).toBe('Something new happened');
    // 2026-03-04 12:00 UTC is a Wednesday, 13:00 in Madrid (CET, UTC+1 until the last Sunday of March).
    const frost = sentences[6][1];
    expect(frost).toContain('around Wed 4 Mar, 13:00');
    expect(flagMessageIn(frost, 'es')).toContain('hacia mié, 4 mar, 13:00');
    expect(flagMessageIn(frost, 'fr')).toContain('vers mer. 4 mars, 13:00');
  });
});

describe('API errors in another language', () => {
  it.each([
    ['E-mail or password is wrong', 'es', 'El correo o la contraseña no son correctos'],
    ['name: Required', 'fr', 'name: Obligatoire'],
    ['Tank not found', 'fr', 'Cuve introuvable'],
    ['Sensor not found', 'es', 'No se encontró: Sensor'],
    ['takenAt: a round cannot be in the future', 'es', 'takenAt: una ronda no puede estar en el futuro'],
    ['lowStockL: must be 0 L or more', 'fr', 'lowStockL: doit valoir 0 L ou plus'],
    ['Something the catalogue does not know', 'es', 'Something the catalogue does not know'],
    ['Tank not found', 'en', 'Tank not found'],
  ] as const)('says "%s" in %s', (english, language, said) => {
    expect(errorIn(english, language)).toBe(said);
  });
});
