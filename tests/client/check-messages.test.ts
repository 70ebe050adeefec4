// The shared checks' refusals said from their codes (area `checks`): in English exactly the English the
// shared functions give the API, so no screen's English changes; in Spanish and French with the figures
// written the language's way. Figures of the cases are the shared tests' (tests/shared/readings.test.ts,
// gauge.test.ts, calibration-validate.test.ts); the expected sentences below are written by hand.
import { afterEach, describe, expect, it } from 'vitest';
import { validateGeometry, type TankGeometry } from '@shared/calibration';
import { GaugeStripError, gaugeStripLayout, type GaugeStripInput } from '@shared/gauge';
import { sniffCsv } from '@shared/imports';
import { passwordStrength } from '@shared/passwords';
import { readingToVolumes, type ReadingInput, type TankSetup } from '@shared/readings';
import { setLanguage } from '@/i18n';
import { checkMessage } from '@/i18n/checkMessage';
import en from '@shared/i18n/messages/en/checks.json';

afterEach(() => setLanguage('en'));

// A 1,000 mm × 1,790 mm upright cylinder, outlet at 60 mm, fill line at 1,700 mm.
const setup = (over: Partial<TankSetup> = {}): TankSetup => ({
  geometry: { shape: 'vertical-cylinder', diameterMm: 1000, heightMm: 1790 },
  datumOffsetMm: 0,
  outletHeightMm: 60,
  safeFillLevelMm: 1700,
  specificGravity: 1,
  ...over,
});

const READINGS: [string, TankSetup | null, ReadingInput | null][] = [
  ['a tube reading that is not a number', setup(), { kind: 'sight-tube', readingMm: Number.NaN }],
  ['below the zero mark', setup(), { kind: 'sight-tube', readingMm: -5.5 }],
  ['above the top', setup(), { kind: 'sight-tube', readingMm: 1830 }],
  ['above the top with the zero mark raised', setup({ datumOffsetMm: 20 }), { kind: 'sight-tube', readingMm: 1800 }],
  ['below the floor with the zero mark below it', setup({ datumOffsetMm: -60 }), { kind: 'sight-tube', readingMm: 25 }],
  ['a level that is not a number', setup(), { kind: 'level', levelMm: Number.NaN }],
  ['a level below the floor', setup(), { kind: 'level', levelMm: -3 }],
  ['a level above the top', setup(), { kind: 'level', levelMm: 2000 }],
  ['ultrasonic without a sensor height', setup(), { kind: 'ultrasonic', distanceMm: 100 }],
  ['an ultrasonic distance that is not a number', setup({ sensorHeightMm: 1900 }), { kind: 'ultrasonic', distanceMm: Number.NaN }],
  ['a negative distance', setup({ sensorHeightMm: 1900 }), { kind: 'ultrasonic', distanceMm: -1 }],
  ['a distance past the sensor height', setup({ sensorHeightMm: 1900 }), { kind: 'ultrasonic', distanceMm: 1950 }],
  ['a distance above the top', setup({ sensorHeightMm: 1900 }), { kind: 'ultrasonic', distanceMm: 50 }],
  ['a pressure that is not a number', setup(), { kind: 'pressure', pressureKPa: Number.NaN }],
  ['a negative pressure', setup(), { kind: 'pressure', pressureKPa: -0.2 }],
  ['0 kPa at a raised sensor', setup({ sensorHeightMm: 50 }), { kind: 'pressure', pressureKPa: 0 }],
  ['a pressure above the top', setup(), { kind: 'pressure', pressureKPa: 30 }],
  ['an unknown kind', setup(), { kind: 'dipstick' } as unknown as ReadingInput],
  ['no setup', null, { kind: 'level', levelMm: 1 }],
  ['no reading', setup(), null],
  ['a bad geometry', setup({ geometry: { shape: 'vertical-cylinder', diameterMm: -1, heightMm: 1790 } }), { kind: 'level', levelMm: 1 }],
  ['a zero mark that is not a number', setup({ datumOffsetMm: Number.NaN }), { kind: 'level', levelMm: 1 }],
  ['a zero mark too far', setup({ datumOffsetMm: 40_000 }), { kind: 'level', levelMm: 1 }],
  ['an outlet outside the tank', setup({ outletHeightMm: 2000 }), { kind: 'level', levelMm: 1 }],
  ['a fill line under the outlet', setup({ safeFillLevelMm: 50 }), { kind: 'level', levelMm: 1 }],
  ['a specific gravity of 0', setup({ specificGravity: 0 }), { kind: 'level', levelMm: 1 }],
  ['a specific gravity over the limit', setup({ specificGravity: 5 }), { kind: 'level', levelMm: 1 }],
  ['a sensor height that is not a number', setup({ sensorHeightMm: Number.NaN }), { kind: 'level', levelMm: 1 }],
];

const refusalOf = (tank: TankSetup | null, input: ReadingInput | null) => {
  const r = readingToVolumes(tank as TankSetup, input as ReadingInput);
  if (r.ok) throw new Error('expected a refusal');
  return r;
};

const GEOMETRIES: [string, unknown][] = [
  ['a box with a negative, a worded and a missing size', { shape: 'box', lengthMm: -1, widthMm: 'wide' }],
  ['an unknown shape', { shape: 'blob' }],
  ['no geometry', undefined],
  ['bad ends', { shape: 'horizontal-cylinder', diameterMm: 1000, lengthMm: 2000, ends: 'round' }],
  ['a size over the limit', { shape: 'sphere', diameterMm: 40_000 }],
  ['no points', { shape: 'points', points: [] }],
  ['points that are not a list', { shape: 'points', points: 'many' }],
  ['a point that is not an object', { shape: 'points', points: [3] }],
  ['too many points', { shape: 'points', points: Array.from({ length: 501 }, (_, i) => ({ levelMm: i, volumeL: i })) }],
  ['a volume over the limit', { shape: 'points', points: [{ levelMm: 0, volumeL: 0 }, { levelMm: 10, volumeL: 40_000_000 }] }],
  ['a first mark above the floor with no volume', { shape: 'points', points: [{ levelMm: 100, volumeL: 0 }, { levelMm: 200, volumeL: 50 }] }],
  ['rows out of order', { shape: 'points', points: [{ levelMm: 0, volumeL: 0 }, { levelMm: 400.25, volumeL: 120.5 }, { levelMm: 300, volumeL: 150 }, { levelMm: 500, volumeL: 100 }] }],
  ['a single point at the floor', { shape: 'points', points: [{ levelMm: 0, volumeL: 0 }] }],
];

const cylinder: TankGeometry = { shape: 'vertical-cylinder', diameterMm: 2000, heightMm: 2000 };
const strip = (over: Partial<GaugeStripInput>): GaugeStripInput => ({ geometry: cylinder, datumOffsetMm: 0, everyL: 10, unitSystem: 'metric', ...over });
const GAUGES: [string, GaugeStripInput][] = [
  ['marks too many for the strip', strip({ everyL: 5 })],
  ['two marks too close where the tank is widest', strip({ geometry: { shape: 'horizontal-cylinder', diameterMm: 1000, lengthMm: 2000, ends: 'flat' }, everyL: 3.5 })],
  ['more than 100 pages', strip({ geometry: { shape: 'vertical-cylinder', diameterMm: 3000, heightMm: 30_000 }, everyL: 1000 })],
  ['no step', strip({ everyL: undefined })],
  ['an unknown unit', strip({ everyL: undefined, everyVolume: { value: 10, unit: 'pint' as 'L' } })],
  ['a step of 0', strip({ everyL: 0 })],
  ['a page of no height', strip({ page: { widthMm: 210, heightMm: 0, marginMm: 10 } })],
  ['a negative margin', strip({ page: { widthMm: 210, heightMm: 297, marginMm: -1 } })],
  ['a page too narrow', strip({ page: { widthMm: 105, heightMm: 297, marginMm: 10 } })],
  ['a page too short', strip({ page: { widthMm: 210, heightMm: 148, marginMm: 10 } })],
  ['a zero mark that is not a number', strip({ datumOffsetMm: Number.NaN })],
  ['a zero mark at the top', strip({ datumOffsetMm: 2000 })],
];

// Passwords of the shared password tests, each refused for a different reason (or none named).
const PASSWORDS: [string, string[]][] = [
  ['password', []],
  ['password1234', []],
  ['abcdefgh12', []],
  ['monkey', []],
  ['aaaaaaaaaaaa', []],
  ['tallowbrook', ['owner@tallowbrook.example']],
];
const passwordProblem = (password: string, inputs: string[]) => {
  const verdict = passwordStrength(password, inputs);
  if (!verdict.problem || verdict.message === null) throw new Error('expected a refusal');
  return { problem: verdict.problem, message: verdict.message };
};

// First bytes of uploads that are not CSV text (signatures as in tests/shared/imports.test.ts).
const bytesOf = (s: string) => [...new TextEncoder().encode(s)];
const UPLOADS: [string, number[]][] = [
  ['a ZIP archive', [0x50, 0x4b, 0x03, 0x04, 0x14, 0x00]],
  ['an empty ZIP archive', [0x50, 0x4b, 0x05, 0x06]],
  ['a gzip file', [0x1f, 0x8b, 0x08, 0x00]],
  ['a PDF', bytesOf('%PDF-1.7\n')],
  ['a program', [0x7f, 0x45, 0x4c, 0x46, 0x02]],
  ['UTF-16 text', [0xff, 0xfe, 0x74, 0x00]],
  ['NUL bytes', [...bytesOf('time,level\n1,2'), 0x00]],
  ['control characters', [...bytesOf('ab'), ...Array.from({ length: 20 }, () => 0x01), ...bytesOf('cd'.repeat(100))]],
  ['Latin-1 text', [...bytesOf('time;level\n'), ...bytesOf('Temp'), 0xb0, ...bytesOf('C\n')]],
];
const sniffProblem = (bytes: number[]) => {
  const verdict = sniffCsv(Uint8Array.from(bytes));
  if (verdict.ok) throw new Error('expected a refusal');
  return verdict;
};

/** Every sentence of an area file, nested groups included. */
const sentences = (group: unknown): string[] => (typeof group === 'string' ? [group] : Object.values(group as Record<string, unknown>).flatMap(sentences));

function gaugeError(input: GaugeStripInput): GaugeStripError {
  try {
    gaugeStripLayout(input);
  } catch (e) {
    if (e instanceof GaugeStripError) return e;
    throw e;
  }
  throw new Error('expected a GaugeStripError');
}

describe('checkMessage', () => {
  it.each(READINGS)('says a refused reading (%s) in English exactly as the shared reason', (_case, tank, input) => {
    const r = refusalOf(tank, input);
    expect(checkMessage(r.problem)).toBe(r.reason);
  });

  it.each(GEOMETRIES)('says every problem of a geometry (%s) in English exactly as validateGeometry', (_case, geometry) => {
    const v = validateGeometry(geometry);
    if (v.ok) throw new Error('expected problems');
    for (const issue of v.issues) {
      expect(issue.problem.code).not.toBe('geometry.other');
      expect(`${issue.field}: ${checkMessage(issue.problem)}`).toBe(issue.message);
    }
  });

  it.each(GAUGES)('says a gauge strip refusal (%s) in English exactly as the shared error', (_case, input) => {
    const e = gaugeError(input);
    expect(`${e.field}: ${checkMessage(e.problem)}`).toBe(e.message);
  });

  it.each(PASSWORDS)('says why the password %s is too easy in English exactly as the shared verdict', (password, inputs) => {
    const { problem, message } = passwordProblem(password, inputs);
    expect(checkMessage(problem)).toBe(message);
  });

  it.each(UPLOADS)('says why an upload (%s) is not CSV text in English exactly as the shared check', (_case, bytes) => {
    const verdict = sniffProblem(bytes);
    expect(checkMessage(verdict.problem)).toBe(verdict.reason);
  });

  it('says why an upload is not CSV text in Spanish and French', () => {
    setLanguage('es');
    expect(checkMessage(sniffProblem(UPLOADS[0][1]).problem)).toBe('es un archivo ZIP (un libro de hoja de cálculo lo es), no texto CSV; exporte los datos del registrador como archivo CSV');
    setLanguage('fr');
    expect(checkMessage(sniffProblem(UPLOADS[8][1]).problem)).toBe(
      'ce n’est pas du texte UTF-8 (la ligne 2 contient des octets qui ne sont pas de l’UTF-8, comme dans un fichier Latin-1 ou Windows-1252) ; enregistrez-le ou exportez-le en CSV UTF-8',
    );
  });

  it('says a too-easy password in Spanish and French', () => {
    setLanguage('es');
    expect(checkMessage(passwordProblem('aaaaaaaaaaaa', []).problem)).toBe(
      'Demasiado fácil de adivinar. Los caracteres repetidos son fáciles de adivinar. Añada una o dos palabras más que no tengan relación entre sí.',
    );
    setLanguage('fr');
    expect(checkMessage(passwordProblem('tallowbrook', ['owner@tallowbrook.example']).problem)).toBe(
      'Trop facile à deviner. Il est formé à partir de votre nom ou de votre adresse e-mail. Ajoutez un ou deux mots de plus, sans rapport entre eux.',
    );
  });

  it('says readings, fill-and-mark rows and gauge refusals in Spanish with decimal commas', () => {
    setLanguage('es');
    expect(checkMessage(refusalOf(setup(), { kind: 'sight-tube', readingMm: -5.5 }).problem)).toBe('La lectura de -5,5 mm está por debajo del cero del tubo');
    expect(checkMessage(refusalOf(setup({ datumOffsetMm: 20 }), { kind: 'sight-tube', readingMm: 1800 }).problem)).toBe(
      'La lectura de 1800 mm deja el nivel en 1820 mm, 30 mm por encima de lo alto del tanque (1790 mm)',
    );
    expect(checkMessage(refusalOf(setup({ safeFillLevelMm: 50 }), { kind: 'level', levelMm: 1 }).problem)).toBe(
      'Configuración del tanque: nivel máximo de llenado: 50 mm debe quedar por encima de la salida (60 mm)',
    );
    const rows = validateGeometry(GEOMETRIES[11][1]);
    if (rows.ok) throw new Error('expected problems');
    expect(rows.issues.map((i) => checkMessage(i.problem))).toEqual([
      'el nivel de 300 mm no está por encima de los 400,25 mm del punto anterior',
      'el volumen de 100 L no es mayor que los 150 L del punto anterior',
    ]);
    expect(checkMessage(gaugeError(strip({ everyL: 5 })).problem)).toBe(
      'una marca cada 5 L pone unas 1257 marcas en esta regla de 2000 mm, a 1,59 mm de media entre sí; para poder leerlas, las marcas deben quedar al menos a 2 mm: use 10 L o más',
    );
  });

  it('says them in French, with the French number spacing and decimal comma', () => {
    setLanguage('fr');
    expect(checkMessage(refusalOf(setup(), { kind: 'level', levelMm: -3 }).problem)).toBe('Le niveau de -3 mm est 3 mm sous le fond de la cuve');
    expect(checkMessage(refusalOf(setup(), { kind: 'sight-tube', readingMm: 1830 }).problem)).toBe(
      'Le relevé de 1\u202f830 mm place le niveau 40 mm au-dessus du haut de la cuve (1\u202f790 mm)',
    );
    expect(checkMessage(gaugeError(strip({ datumOffsetMm: 2000 })).problem)).toBe(
      'le zéro du tube (2\u202f000 mm au-dessus du fond) est à hauteur du haut de la cuve (2\u202f000 mm) ou au-dessus ; il n’y a rien à marquer',
    );
  });

  it.each(['es', 'fr'] as const)('leaves no English sentence of area checks in %s', (language) => {
    setLanguage(language);
    const problems = [
      ...READINGS.map(([, tank, input]) => refusalOf(tank, input).problem),
      ...GEOMETRIES.flatMap(([, g]) => {
        const v = validateGeometry(g);
        return v.ok ? [] : v.issues.map((i) => i.problem);
      }),
      ...GAUGES.map(([, input]) => gaugeError(input).problem),
      ...PASSWORDS.map(([password, inputs]) => passwordProblem(password, inputs).problem),
      ...UPLOADS.map(([, bytes]) => sniffProblem(bytes).problem),
    ];
    const english = sentences(en);
    // English runs of three words or more, placeholders and identifiers left out.
    const runs = english.flatMap((m) => m.split(/\{[^}]*\}|[();:—"]|\b\w*Mm\b|\b\w*[A-Z]\w*\b/).map((s) => s.trim()).filter((s) => s.split(/\s+/).length >= 3));
    for (const problem of problems) {
      const said = checkMessage(problem);
      for (const run of runs) expect(said, `${problem.code}: "${run}"`).not.toContain(run);
    }
  });
});
