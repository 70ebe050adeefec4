// A logger file's line reasons and notes, a mapped column missing from the file and an empty file, said from
// their codes (area `checks`, imports.*): in English exactly the English the shared row reader gives the
// API, so no screen's English changes; in Spanish and French as whole sentences with the language's dates.
// The files are made up here; the expected sentences in Spanish and French are written by hand.
import Papa from 'papaparse';
import { afterEach, describe, expect, it } from 'vitest';
import type { CheckProblem } from '@shared/check-problems';
import { createImportReader, csvParseOptions, importMappingSchema, mappingProblem, refusedFileReason, type ImportMappingInput } from '@shared/imports';
import type { TankSetup } from '@shared/readings';
import { setLanguage } from '@/i18n';
import { checkMessage } from '@/i18n/checkMessage';
import { importErrorText, importReasonText } from '@/components/imports/importErrors';
import { buildMapping, emptyDraft } from '@/components/imports/importMapping';
import en from '@shared/i18n/messages/en/checks.json';

afterEach(() => setLanguage('en'));

// A 1,000 mm wide, 1,500 mm tall upright cylinder, as in tests/shared/imports.test.ts.
const TANK: TankSetup = { geometry: { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1500 }, datumOffsetMm: 0, outletHeightMm: 100, safeFillLevelMm: 1400, specificGravity: 1 };
const NOW = Date.parse('2027-01-01T00:00:00Z');

interface Said {
  reason: string;
  problem: CheckProblem;
}

/** Every reason, note and file verdict the reader gives for `text` read with `mapping`. */
function reasonsOf(text: string, mapping: ImportMappingInput, displayTimeZone = 'UTC'): Said[] {
  const parsed = Papa.parse<string[]>(text, csvParseOptions(','));
  const reader = createImportReader({ mapping: importMappingSchema.parse(mapping), tank: TANK, nowMs: NOW, displayTimeZone });
  const out: Said[] = [];
  for (const cells of parsed.data) {
    const r = reader.feed(cells);
    if (r.kind === 'rejected') out.push(...r.problems);
    else if (r.kind === 'reading' && r.notice) out.push({ reason: r.notice.note, problem: r.notice.problem });
    else if (r.kind === 'fatal') out.push(r);
  }
  const end = reader.end();
  if (!end.ok && !out.some((s) => s.reason === end.reason)) out.push(end);
  return out;
}

const ISO: ImportMappingInput = { timestamp: { column: 'time', format: 'iso8601' }, value: { column: 'level', kind: 'level', unit: 'mm' }, temperature: { column: 'temp', unit: 'C' } };
const LOCAL: ImportMappingInput = { timestamp: { column: 'time', format: 'DD/MM/YYYY HH:mm', timeZone: 'Europe/Madrid' }, value: { column: 'level', kind: 'level', unit: 'mm' } };
const SPLIT: ImportMappingInput = {
  timestamp: { column: 'date', format: 'DD/MM/YYYY', timeZone: 'Europe/Madrid', time: { column: 'time', format: 'hh:mm AM/PM' } },
  value: { column: 'level', kind: 'level', unit: 'mm' },
  decimalComma: true,
};

const FILES: [string, string, ImportMappingInput][] = [
  [
    'bad ISO timestamps, numbers and temperatures',
    [
      'time,level,temp',
      'yesterday,500,10',
      '2025-06-01T06:00:00,500,10',
      '2025-06-01T06:00:00+19:00,500,10',
      '2025-13-01T06:00:00Z,500,10',
      '2025-02-30T06:00:00Z,500,10',
      '1969-06-01T06:00:00Z,500,10',
      '2025-06-01T24:00:00Z,500,10',
      '2025-06-01T06:61:00Z,500,10',
      '2028-06-01T06:00:00Z,500,10',
      '2025-06-01T06:00:00Z,lots,10',
      '2025-06-01T06:00:00Z,12,5,10',
      '2025-06-01T06:00:00Z,1e999,10',
      '2025-06-01T06:00:00Z,-20,10',
      '2025-06-01T06:00:00Z,500,warm',
      '2025-06-01T06:00:00Z,500,95',
      '2025-06-01T06:00:00Z',
      ',500,10',
    ].join('\n'),
    ISO,
  ],
  ['local times in the spring gap and the autumn repeat', 'time,level\n29/03/2026 02:30,500\n25/10/2026 02:30,500\n25/10/2026 02:10,500\n25/10/2026 01:00,500\n25/10/2026 02:20,500\n12-03-2026 06:00,500\n', LOCAL],
  ['a date and a 12-hour time in two cells, with a decimal comma', 'date,time,level\n31/04/2026,06:00 AM,500\n01/04/2026,13:00 PM,500\n01/04/2026,06:00 AM,500.5\n29/03/2026,02:30 AM,500\n,06:00 AM,500\n', SPLIT],
  ['a mapped column not in the header', 'when,level\n2025-06-01T00:00:00Z,5\n', { timestamp: { column: 'time', format: 'iso8601' }, value: { column: 1, kind: 'level', unit: 'mm' } }],
  ['a column number past the header', 'time,level\n2025-06-01T00:00:00Z,5\n', { timestamp: { column: 0, format: 'iso8601' }, value: { column: 4, kind: 'level', unit: 'mm' } }],
  ['a header without names', ',\n', { timestamp: { column: 'time', format: 'iso8601' }, value: { column: 1, kind: 'level', unit: 'mm' } }],
  ['a header and no rows', 'time,level\n', { timestamp: { column: 'time', format: 'iso8601' }, value: { column: 'level', kind: 'level', unit: 'mm' } }],
  ['no rows at all', '', { timestamp: { column: 0, format: 'iso8601' }, value: { column: 1, kind: 'level', unit: 'mm' }, hasHeader: false }],
];

const all = FILES.flatMap(([, text, mapping]) => reasonsOf(text, mapping));
const codes = new Set(all.map((s) => s.problem.code));

/** Every sentence of an area file, nested groups included. */
const sentences = (group: unknown): string[] => (typeof group === 'string' ? [group] : Object.values(group as Record<string, unknown>).flatMap(sentences));

describe('checkMessage for logger files', () => {
  it.each(FILES)('says every reason and note of %s in English exactly as the row reader', (_case, text, mapping) => {
    const said = reasonsOf(text, mapping);
    expect(said.length).toBeGreaterThan(0);
    for (const s of said) expect(checkMessage(s.problem), s.problem.code).toBe(s.reason);
  });

  it('meets most of the codes of the area (the cases are not all alike)', () => {
    expect(codes.size).toBeGreaterThanOrEqual(25);
  });

  it('says the distances-need-a-sensor-height refusal as the mapping form did (without the field path)', () => {
    const problem = mappingProblem(importMappingSchema.parse({ timestamp: { column: 0, format: 'iso8601' }, value: { column: 1, kind: 'ultrasonic', unit: 'mm' } }), TANK)!;
    expect(checkMessage(problem.problem)).toBe(problem.message.replace(/^mapping\.value\.kind: /, ''));
    setLanguage('es');
    expect(checkMessage(problem.problem)).toBe('las distancias de un sensor ultrasónico necesitan la altura del sensor del tanque (sensorHeightMm); indíquela primero en el tanque');
  });

  it('says a spring-gap time, a future one and a repeated hour in Spanish with Spanish dates', () => {
    setLanguage('es');
    const gap = reasonsOf('time,level\n29/03/2026 02:30,500\n', LOCAL)[0];
    expect(checkMessage(gap.problem)).toBe(
      'La marca de tiempo "29/03/2026 02:30" no existe en Europe/Madrid: los relojes se adelantaron de 02:00 a 03:00 el 29 mar 2026, así que no se tomó ninguna lectura a esa hora local (revise el reloj del registrador y su zona horaria)',
    );
    const future = reasonsOf('time,level,temp\n2028-06-01T06:00:00Z,500,10\n', ISO)[0];
    expect(checkMessage(future.problem)).toBe('La marca de tiempo "2028-06-01T06:00:00Z" está en el futuro (después de 1 ene 2027, 0:00, la hora actual de la finca)');
    const note = reasonsOf('time,level\n25/10/2026 02:30,500\n', LOCAL)[0];
    expect(checkMessage(note.problem)).toBe(
      '"25/10/2026 02:30" ocurre dos veces en Europe/Madrid (esa noche los relojes se atrasan una hora); se lee como la primera vez (UTC+02:00), ya que ninguna fila anterior indica cuál. Se guarda como 25 oct 2026, 0:30 UTC.',
    );
  });

  it('names a column of a file without a header row in the language when a row is too short for it', () => {
    const mapping: ImportMappingInput = { timestamp: { column: 0, format: 'iso8601' }, value: { column: 1, kind: 'level', unit: 'mm' }, hasHeader: false };
    const [short] = reasonsOf('2025-06-01T00:00:00Z\n', mapping);
    expect(checkMessage(short.problem)).toBe('Missing: the row has 1 field, so there is no column 2');
    setLanguage('es');
    expect(checkMessage(short.problem)).toBe('Falta: la fila tiene 1 campo, así que no llega a la columna 2');
  });

  it('says a decimal point in a decimal-comma file and a missing column in French', () => {
    setLanguage('fr');
    const [point] = reasonsOf('date,time,level\n01/04/2026,06:00 AM,500.5\n', SPLIT);
    expect(checkMessage(point.problem)).toBe('La valeur « 500.5 » a un point décimal, mais la correspondance des colonnes indique que les nombres utilisent une virgule décimale');
    const [missing] = reasonsOf('when,level\n2025-06-01T00:00:00Z,5\n', FILES[3][2]);
    expect(checkMessage(missing.problem)).toBe('Colonne d’horodatage : La colonne « time » n’est pas dans la ligne d’en-tête (elle contient "when", "level")');
  });

  it.each(['es', 'fr'] as const)('leaves no English run of the area in %s', (language) => {
    setLanguage(language);
    const english = sentences(en.imports);
    // English runs of three words or more, placeholders and identifiers left out.
    const runs = english.flatMap((m) => m.split(/\{[^}]*\}|[();:—"]|\b\w*Mm\b|\b\w*[A-Z]\w*\b/).map((s) => s.trim()).filter((s) => s.split(/\s+/).length >= 3));
    expect(runs.length).toBeGreaterThan(20);
    for (const s of all) {
      const said = checkMessage(s.problem);
      for (const run of runs) expect(said, `${s.problem.code}: "${run}"`).not.toContain(run);
    }
  });
});

describe('importErrorText', () => {
  // The server's English as server/services/import-run.ts and imports.ts write it.
  const refused = refusedFileReason(4, 1216);
  const noneGood = 'None of the 1,216 rows could be imported; see the refused rows';
  const duplicate = 'This file was imported into this tank already (import 12, 4 Dec 2026, 02:03); nothing was added';

  it('keeps the English of a refused file, an import with no good rows and a duplicate exactly', () => {
    for (const text of [refused, noneGood, duplicate]) expect(importErrorText(text)).toBe(text);
    expect(importErrorText(null)).toBeNull();
  });

  it('says them in Spanish and French with the counts and the policy title of the language', () => {
    setLanguage('es');
    expect(importErrorText(refused)).toBe('4 de 1216 filas tienen problemas, así que no se registró nada de este archivo (se eligió «Rechazar el archivo entero si alguna fila es errónea»)');
    expect(importErrorText(noneGood)).toBe('No se pudo importar ninguna de las 1216 filas; vea las filas rechazadas');
    setLanguage('fr');
    expect(importErrorText(refused)).toMatch(/^4 lignes sur 1\u202f216 ont des problèmes, donc rien de ce fichier n’a été enregistré \(« .+ » a été choisi\)$/);
    expect(importErrorText(duplicate)).toBe('Ce fichier a déjà été importé dans cette cuve (import 12, 4 Dec 2026, 02:03) ; rien n’a été ajouté');
  });

  it('says a mapped column missing from the file, with its parts, and a stopped import', () => {
    const [missing] = reasonsOf('time,level\n2025-06-01T00:00:00Z,5\n', FILES[4][2]);
    expect(importErrorText(missing.reason)).toBe(missing.reason);
    setLanguage('es');
    expect(importErrorText(missing.reason)).toBe('Columna de valor: La columna 5 (índice 4) no está en el archivo: la fila de encabezado tiene 2 columnas');
    expect(importErrorText('The import stopped (disk full); nothing from this file was kept. Retry it.')).toBe('La importación se detuvo (disk full); no se conservó nada de este archivo. Vuelva a intentarlo.');
  });

  it('leaves any other text as the server wrote it', () => {
    setLanguage('es');
    expect(importErrorText('Something else went wrong')).toBe('Something else went wrong');
  });
});

describe('buildMapping’s field messages', () => {
  // A draft whose value column is the timestamp's: the schema says so under the value's column.
  const draft = { ...emptyDraft('Europe/Madrid'), timestampColumn: 0, timestampFormat: 'iso8601' as const, valueColumn: 0 };

  it('says the schema’s refusal in English as the schema writes it, and in Spanish and French', () => {
    const built = buildMapping(draft, TANK);
    expect(built.ok).toBe(false);
    expect(!built.ok && built.errors['value.column']).toBe('is the same column as the timestamp');
    setLanguage('es');
    const spanish = buildMapping(draft, TANK);
    expect(!spanish.ok && spanish.errors['value.column']).toBe('es la misma columna que la marca de tiempo');
    setLanguage('fr');
    const french = buildMapping(draft, TANK);
    expect(!french.ok && french.errors['value.column']).toBe('est la même colonne que l’horodatage');
  });
});

describe('importReasonText for lines stored without their code', () => {
  it('keeps every stored English reason and note exactly', () => {
    for (const s of all) expect(importReasonText(s.reason)).toBe(s.reason);
  });

  it('says stored reasons in Spanish, the parts inside too, and most of them at all', () => {
    setLanguage('es');
    expect(importReasonText('Value "ERR" is not a number')).toBe('El valor "ERR" no es un número');
    expect(importReasonText('Timestamp "2099-09-05T05:00:00Z" is in the future (after 4 Dec 2026, 02:03, the farm\'s time now)')).toBe(
      'La marca de tiempo "2099-09-05T05:00:00Z" está en el futuro (después de 4 Dec 2026, 02:03, la hora actual de la finca)',
    );
    const said = all.map((s) => importReasonText(s.reason));
    const translated = said.filter((text, i) => text !== all[i].reason).length;
    expect(translated / all.length).toBeGreaterThan(0.9);
  });

  it('prefers the code when the server sent one', () => {
    const [bad] = reasonsOf('time,level,temp\n2025-06-01T06:00:00Z,lots,10\n', ISO);
    setLanguage('fr');
    expect(importReasonText(bad.reason, bad.problem)).toBe('La valeur « lots » n’est pas un nombre');
  });
});
