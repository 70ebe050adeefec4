import { afterEach, describe, expect, it } from 'vitest';
import { flushPromises, mount, type VueWrapper } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import SelectButton from 'primevue/selectbutton';
import { importMappingSchema } from '@shared/imports';
import type { Language } from '@shared/i18n/languages';
import type { LoggerImport, LoggerImportDetail } from '@shared/schemas';
import enBrews from '@shared/i18n/messages/en/brews.json';
import enImports from '@shared/i18n/messages/en/imports.json';
import esBrews from '@shared/i18n/messages/es/brews.json';
import esImports from '@shared/i18n/messages/es/imports.json';
import frBrews from '@shared/i18n/messages/fr/brews.json';
import frImports from '@shared/i18n/messages/fr/imports.json';
import { setLanguage } from '@/i18n';
import BrewsBatchChecks from '@/components/brews/BrewsBatchChecks.vue';
import BrewsMixingCalculator from '@/components/brews/BrewsMixingCalculator.vue';
import BrewsTemperatureChart from '@/components/brews/BrewsTemperatureChart.vue';
import { readyText } from '@/components/brews/brewLabels';
import ImportsCounts from '@/components/imports/ImportsCounts.vue';
import ImportsFilePicker from '@/components/imports/ImportsFilePicker.vue';
import ImportsHistory from '@/components/imports/ImportsHistory.vue';
import ImportsPolicyChoice from '@/components/imports/ImportsPolicyChoice.vue';
import ImportsPreviewTable from '@/components/imports/ImportsPreviewTable.vue';
import ImportsProgressPanel from '@/components/imports/ImportsProgressPanel.vue';
import ImportsResultCard from '@/components/imports/ImportsResultCard.vue';
import { formatBytes } from '@/components/imports/importLabels';
import { buildMapping, columnOptions, emptyDraft } from '@/components/imports/importMapping';

type Tree = { [key: string]: string | Tree };
const leaves = (tree: Tree, prefix = ''): [string, string][] =>
  Object.entries(tree).flatMap(([key, value]) => (typeof value === 'string' ? [[`${prefix}${key}`, value] as [string, string]] : leaves(value, `${prefix}${key}.`)));

/**
 * Pieces of English that must not show in `language`: the literal text between the placeholders of every
 * message of these areas whose translation differs, kept when it holds a word of four letters or more.
 */
function englishPieces(language: Exclude<Language, 'en'>): string[] {
  const translated = { es: { brews: esBrews, imports: esImports }, fr: { brews: frBrews, imports: frImports } }[language];
  const pieces = new Set<string>();
  for (const [area, english] of [['brews', enBrews], ['imports', enImports]] as const) {
    const other = new Map(leaves(translated[area] as Tree));
    for (const [key, message] of leaves(english as Tree)) {
      if (other.get(key) === message) continue;
      for (const piece of message.split(/\{[^}]*\}|\|/)) {
        const text = piece.trim();
        if (/[A-Za-z]{4,}/.test(text) && text.length >= 8) pieces.add(text);
      }
    }
  }
  return [...pieces];
}

const plugins = { global: { plugins: [[PrimeVue, { unstyled: true }]] as never } };

afterEach(() => setLanguage('en'));

async function type(wrapper: VueWrapper, testId: string, value: number) {
  await wrapper.find(`[data-testid="${testId}"]`).setValue(String(value));
}
async function chooseMode(wrapper: VueWrapper, mode: string) {
  wrapper.findAllComponents(SelectButton)[0]!.vm.$emit('update:modelValue', mode);
  await flushPromises();
}
const calculator = (tankFill: { grossL: number; ullageL: number } | null = null, unitSystem: 'metric' | 'us' = 'metric') =>
  mount(BrewsMixingCalculator, { props: { unitSystem, kind: 'fertilizer', tankFill }, ...plugins });

describe('BrewsMixingCalculator: why a top-up is refused, in the person\'s words and units', () => {
  // Figures worked by hand from the mass balance C·V before and after (common practice, no published source).
  it('names the volume already held when the target is below it', async () => {
    const wrapper = calculator({ grossL: 400, ullageL: 150 });
    await chooseMode(wrapper, 'topup');
    await type(wrapper, 'mix-vt', 300);
    await type(wrapper, 'mix-ct', 1);
    await type(wrapper, 'mix-cs', 10);
    expect(wrapper.get('[data-testid="mix-topup-refusal"]').text()).toBe('The tank already holds 400 L, more than the target of 300 L; use or drain some first.');
  });

  it('offers water alone when the tank is already too strong and the diluted volume fits', async () => {
    // 100 L at 5 % holds 5 L of active ingredient; 200 L at 1 % holds 2 L; 5 L at 1 % is 500 L, 400 L more, within the 500 L of room.
    const wrapper = calculator();
    await chooseMode(wrapper, 'topup');
    await type(wrapper, 'mix-v0', 100);
    await type(wrapper, 'mix-c0', 5);
    await type(wrapper, 'mix-ullage-input', 500);
    await type(wrapper, 'mix-vt', 200);
    await type(wrapper, 'mix-ct', 1);
    await type(wrapper, 'mix-cs', 10);
    expect(wrapper.get('[data-testid="mix-topup-refusal"]').text()).toBe(
      'The tank already holds more active ingredient than 200 L at strength 1 % contains. Adding water alone reaches the target strength at 500 L.',
    );
  });

  it('says the strongest mix reachable when the concentrate is too weak', async () => {
    // Filling the 100 L to 200 L with 10 % concentrate gives 10 L in 200 L = 5 %, short of the 8 % wanted.
    const wrapper = calculator();
    await chooseMode(wrapper, 'topup');
    await type(wrapper, 'mix-v0', 100);
    await type(wrapper, 'mix-c0', 0);
    await type(wrapper, 'mix-ullage-input', 500);
    await type(wrapper, 'mix-vt', 200);
    await type(wrapper, 'mix-ct', 8);
    await type(wrapper, 'mix-cs', 10);
    expect(wrapper.get('[data-testid="mix-topup-refusal"]').text()).toBe('Even adding only concentrate, 200 L reaches strength 5 % at most, short of 8 %.');
  });

  it('words the safe-fill-line refusal in Spanish, and in gallons for a US-units person', async () => {
    setLanguage('es');
    const spanish = calculator({ grossL: 400, ullageL: 150 });
    await chooseMode(spanish, 'topup');
    await type(spanish, 'mix-vt', 800);
    await type(spanish, 'mix-ct', 1);
    await type(spanish, 'mix-cs', 10);
    expect(spanish.get('[data-testid="mix-topup-refusal"]').text()).toBe('Llegar a 800 L supone añadir 400 L, pero solo caben 150 L por debajo del nivel máximo de llenado.');
    setLanguage('en');
    // 400 L = 105.67 gal, 150 L = 39.63 gal; the target is typed in gallons (US gallon 3.785411784 L, NIST Handbook 44 Appendix C).
    const us = calculator({ grossL: 400, ullageL: 150 }, 'us');
    await chooseMode(us, 'topup');
    await type(us, 'mix-vt', 200);
    await type(us, 'mix-ct', 1);
    await type(us, 'mix-cs', 10);
    expect(us.get('[data-testid="mix-topup-refusal"]').text()).toBe('Reaching 200 gal means adding 94.33 gal, but only 39.63 gal fits below the safe fill line.');
  });
});

describe('BrewsMixingCalculator: figures it cannot work with', () => {
  it('names the figure instead of passing on the shared check\'s developer message', async () => {
    const wrapper = calculator();
    await chooseMode(wrapper, 'strength');
    await type(wrapper, 'mix-c1', 0);
    await type(wrapper, 'mix-c2', 1);
    await type(wrapper, 'mix-v2', 100);
    expect(wrapper.text()).toContain('Stock strength must be greater than zero.');
    expect(wrapper.text()).not.toContain('stockStrength');
    await type(wrapper, 'mix-c1', 0.5);
    expect(wrapper.text()).toContain('The final strength cannot be above the stock strength: dilution only weakens.');
    await chooseMode(wrapper, 'ratio');
    await type(wrapper, 'mix-n', 0);
    expect(wrapper.get('[data-testid="mix-ratio-error"]').text()).toBe('N must be greater than zero.');
  });

  it('says so in French', async () => {
    setLanguage('fr');
    const wrapper = calculator();
    await chooseMode(wrapper, 'injection');
    await type(wrapper, 'mix-inj-target', 2);
    await type(wrapper, 'mix-inj-stock', 1);
    expect(wrapper.text()).toContain('La concentration voulue dans la conduite ne peut pas dépasser celle du concentré.');
  });
});

describe('the ratio readings in each language', () => {
  it.each([
    ['en', '1 part to 100 parts water = 1 in 101 total', '1 part in 100 total = 1 part to 99 parts water'],
    ['es', '1 parte por 100 partes de agua = 1 en 101 en total', '1 parte en 100 en total = 1 parte por 99 partes de agua'],
    ['fr', '1 partie pour 100 parties d’eau = 1 sur 101 au total', '1 partie sur 100 au total = 1 partie pour 99 parties d’eau'],
  ] as const)('reads 1 : 100 both ways in %s', async (language, water, total) => {
    setLanguage(language);
    const wrapper = calculator();
    await type(wrapper, 'mix-n', 100);
    expect(wrapper.get('[data-testid="mix-reading-water"]').text()).toBe(water);
    expect(wrapper.get('[data-testid="mix-reading-total"]').text()).toBe(total);
  });

  it('writes one part in the singular and a decimal N with the language\'s decimal mark', async () => {
    setLanguage('es');
    const wrapper = calculator();
    await type(wrapper, 'mix-n', 1);
    expect(wrapper.get('[data-testid="mix-reading-water"]').text()).toBe('1 parte por 1 parte de agua = 1 en 2 en total');
    await type(wrapper, 'mix-n', 4.5);
    expect(wrapper.get('[data-testid="mix-reading-water"]').text()).toBe('1 parte por 4,5 partes de agua = 1 en 5,5 en total');
  });
});

describe('readyText', () => {
  const now = new Date('2026-03-02T08:00:00.000Z');
  it.each([
    ['en', '2026-03-02T07:00:00.000Z', 'ready'],
    ['en', '2026-03-02T13:00:00.000Z', 'ready in 5 h'],
    ['en', '2026-03-03T09:00:00.000Z', 'ready in 2 days'],
    ['es', '2026-03-03T08:00:00.000Z', 'lista en 1 día'],
    ['fr', '2026-03-05T08:00:00.000Z', 'prête dans 3 jours'],
  ] as const)('in %s, ready at %s reads "%s"', (language, readyAt, words) => {
    setLanguage(language);
    expect(readyText(readyAt, now)).toBe(words);
  });
});

describe('logger file words outside the templates', () => {
  it('follows the language for file sizes, column names and the mapping\'s missing choices', () => {
    expect(formatBytes(3.4 * 1024 * 1024)).toBe('3.4 MB');
    setLanguage('fr');
    expect(formatBytes(3.4 * 1024 * 1024)).toBe('3,4 Mo');
    expect(columnOptions(['Horodatage', ''], 2).map((c) => c.label)).toEqual(['Horodatage (colonne 1)', 'Colonne 2']);
    setLanguage('es');
    const built = buildMapping(emptyDraft('Europe/Madrid'), null);
    expect(built.ok ? null : built.errors['timestamp.column']).toBe('Elija la columna que contiene la fecha y la hora');
  });
});

describe('sentences set side by side', () => {
  it('keep the space between them where the template joins two elements', () => {
    const checks = mount(BrewsBatchChecks, { props: { tankName: 'Tote by the barn', unitSystem: 'metric', context: 'form', fit: { verdict: 'tight', batchL: 95, safeFillL: 400, heldL: 300, freeL: 100, leftL: 5, percentOfFree: 95 } }, ...plugins });
    expect(checks.text()).toContain('Close to the safe fill line. This brew makes 95.0 L, 95 % of the 100.0 L free in Tote by the barn: 5.0 L would be left. Fill slowly');
    const rows = [
      { line: 1, cells: ['Date'], kind: 'header' as const, problems: [], reading: null, notice: null },
      { line: 2, cells: [''], kind: 'blank' as const, problems: [], reading: null, notice: null },
    ];
    const preview = mount(ImportsPreviewTable, { props: { check: { rows, fatal: null, good: 0, bad: 0 }, header: ['Date'], mapped: {}, judged: true, unitSystem: 'metric', fileName: 'tote.csv' }, ...plugins });
    expect(preview.get('.preview__summary').text()).toBe('First 2 lines of tote.csv. 0 good, 0 with problems.');
  });
});

const LINE = { line: 4, column: 'nivel_mm', value: 'ERR', field: 'value' as const };
const detail: LoggerImportDetail = {
  id: 9, farmId: 1, tankId: 2, tankName: 'Tote by the barn', tankCode: 'MF-F1', uploadedById: 3, uploadedBy: 'Ines Haar', originalName: 'tote.csv', sizeBytes: 2048, sha256: 'ab'.repeat(32),
  mapping: importMappingSchema.parse({ timestamp: { column: 0, format: 'iso8601' }, value: { column: 1, kind: 'level', unit: 'mm' } }),
  policy: 'valid-rows', status: 'imported', delimiter: ',', rowsTotal: 1300, rowsNew: 1204, rowsDuplicate: 2, rowsRepeated: 1, rowsRejected: 93, noticeCount: 3,
  error: null, duplicateOfId: null, createdAt: '2026-12-01T10:00:00.000Z', startedAt: null, finishedAt: null,
  rejectedPreview: [{ ...LINE, reason: 'x' }], rejectedProblems: 93, notices: [{ ...LINE, line: 7, note: 'y' }],
};
const history: LoggerImport[] = [{ ...detail, id: 10, status: 'failed' }];

describe.each(['es', 'fr'] as const)('logger files and brews in %s', (language) => {
  it('show no English words of their own', async () => {
    setLanguage(language);
    const shown: string[] = [];
    const keep = (wrapper: VueWrapper) => shown.push(wrapper.text());

    const mix = calculator({ grossL: 400, ullageL: 150 });
    await type(mix, 'mix-n', 100);
    await type(mix, 'mix-total', 200);
    keep(mix);
    for (const mode of ['strength', 'topup', 'injection']) {
      await chooseMode(mix, mode);
      keep(mix);
    }
    await type(mix, 'mix-inj-target', 1);
    await type(mix, 'mix-inj-stock', 10);
    await type(mix, 'mix-flow', 40);
    keep(mix);
    keep(mount(BrewsBatchChecks, { props: { tankName: 'Tote by the barn', unitSystem: 'metric', context: 'form', fit: { verdict: 'over', overL: 10, batchL: 110, safeFillL: 400, heldL: 300, freeL: 100, leftL: 0, percentOfFree: 110 }, shortfalls: [{ inputId: 9, lines: [0], wanted: 35, onHand: 30, missing: 5, name: 'Kelp', unit: 'ml' }] }, ...plugins }));
    keep(mount(BrewsBatchChecks, { props: { tankName: 'Tote by the barn', unitSystem: 'metric', context: 'calculator', fit: { verdict: 'tight', batchL: 95, safeFillL: 400, heldL: 300, freeL: 100, leftL: 5, percentOfFree: 95 } }, ...plugins }));
    keep(mount(BrewsTemperatureChart, { props: { unitSystem: 'metric', temperatures: [{ at: '2026-12-01T10:00:00.000Z', temperatureC: 16, source: 'reading' }] }, ...plugins }));

    keep(mount(ImportsResultCard, { props: { result: detail }, ...plugins }));
    keep(mount(ImportsResultCard, { props: { result: { ...detail, status: 'failed' } }, ...plugins }));
    keep(mount(ImportsPolicyChoice, { props: { modelValue: 'reject-file' }, ...plugins }));
    keep(mount(ImportsCounts, { props: { counts: detail, testid: 'x', would: true }, ...plugins }));
    keep(mount(ImportsProgressPanel, { props: { phase: 'uploading', sentBytes: 1024, totalBytes: 4096, files: [{ name: 'tote.csv', sizeBytes: 4096, progress: null }] }, ...plugins }));
    keep(mount(ImportsFilePicker, { props: { files: [], previewKey: null }, ...plugins }));
    for (const compact of [true, false]) {
      keep(mount(ImportsHistory, { props: { items: history, status: 'ready', error: null, showTank: true, compact, retryingId: null, scope: '' }, ...plugins }));
    }

    const text = shown.join('\n');
    expect(text).toContain(language === 'es' ? 'Calculadora de mezclas' : 'Calculateur de mélange');
    const left = englishPieces(language).filter((piece) => text.includes(piece));
    expect(left).toEqual([]);
  });
});
