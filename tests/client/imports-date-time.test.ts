// The Logger files form on loggers' own exports: a date column plus a time column (the MF-F1 sample)
// guessed and built into a mapping the server accepts, a column whose name says distance never guessed
// as a level, and the policy's one wording on the form and on a result.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import { createImportReader, IMPORT_POLICY_TITLES, importMappingSchema } from '@shared/imports';
import type { LoggerImportDetail } from '@shared/schemas';
import { buildMapping, emptyDraft, guessDraft } from '@/components/imports/importMapping';
import { policyLabel } from '@/components/imports/importLabels';
import { previewRecords, readFileHead, resolveDelimiter } from '@/components/imports/importPreview';
import ImportsPolicyChoice from '@/components/imports/ImportsPolicyChoice.vue';
import ImportsResultCard from '@/components/imports/ImportsResultCard.vue';

const root = join(import.meta.dirname, '../..');
// MF-F1, the fertigation tote of samples/demo/scenario.json: a 1,200 × 1,000 × 1,000 mm box.
const TOTE = { geometry: { shape: 'box' as const, lengthMm: 1200, widthMm: 1000, heightMm: 1000 }, datumOffsetMm: 0, outletHeightMm: 30, safeFillLevelMm: 960, specificGravity: 1.05 };

describe('guessDraft with the date and the time in two columns', () => {
  it('finds the Date and Time columns of the MF-F1 sample and builds a mapping every row reads with', async () => {
    const file = new File([readFileSync(join(root, 'samples/loggers/mf-f1-date-time-2026-03-26.csv'))], 'mf-f1.csv', { type: 'text/csv' });
    const head = await readFileHead(file);
    const records = previewRecords(head, resolveDelimiter(head.text, { delimiter: 'auto', decimalComma: false }));
    const draft = guessDraft(records, emptyDraft('Europe/Dublin'));

    expect(draft).toMatchObject({ timestampColumn: 'Date', timestampFormat: 'DD/MM/YYYY', timeColumn: 'Time', timeFormat: 'HH:mm:ss', valueColumn: 'Level (cm)', valueKind: 'level', valueUnit: 'cm', temperatureColumn: 'Water temp (C)' });
    const built = buildMapping(draft, TOTE);
    expect(built.ok).toBe(true);
    if (!built.ok) return;
    expect(importMappingSchema.parse(JSON.parse(JSON.stringify(built.mapping)))).toEqual(built.mapping);
    expect(built.mapping.timestamp).toEqual({ column: 'Date', format: 'DD/MM/YYYY', timeZone: 'Europe/Dublin', time: { column: 'Time', format: 'HH:mm:ss' } });
    const reader = createImportReader({ mapping: built.mapping, tank: TOTE, nowMs: Date.UTC(2026, 11, 1) });
    const results = records.map((r) => reader.feed(r));
    expect(results.filter((r) => r.kind === 'reading')).toHaveLength(records.length - 1);
  });

  it('asks for the time column when a date-only layout is chosen without one', () => {
    const draft = { ...emptyDraft('UTC'), timestampColumn: 0, timestampFormat: 'DD/MM/YYYY' as const, valueColumn: 2 };
    expect(buildMapping(draft, TOTE)).toEqual({ ok: false, errors: { 'timestamp.time.column': 'Choose the column that holds the time of day' } });
  });
});

describe('guessDraft on a distance column', () => {
  it.each(['Distance (mm)', 'Sensor to water (mm)', 'Depth to water (mm)', 'Air gap (mm)', 'Abstand (mm)', 'Empty space (mm)'])('guesses %s as a distance from the sensor, never a level', (name) => {
    const records = [['Time', name, 'Battery (V)'], ['2026-11-01T06:00:00Z', '412', '3.6'], ['2026-11-01T06:30:00Z', '415', '3.6']];
    expect(guessDraft(records, emptyDraft('UTC'))).toMatchObject({ valueColumn: name, valueKind: 'ultrasonic', valueUnit: 'mm' });
  });

  it('still guesses a level column as a level', () => {
    const records = [['Time', 'Water level (mm)'], ['2026-11-01T06:00:00Z', '412']];
    expect(guessDraft(records, emptyDraft('UTC'))).toMatchObject({ valueColumn: 'Water level (mm)', valueKind: 'level' });
  });
});

describe('the refuse-the-file choice', () => {
  it('reads the same on the form, on a refused result and in the server message', () => {
    const title = IMPORT_POLICY_TITLES['reject-file'];
    expect(policyLabel('reject-file').title).toBe(title);
    const form = mount(ImportsPolicyChoice, { props: { modelValue: 'reject-file' }, global: { plugins: [[PrimeVue, { unstyled: true }]] } });
    expect(form.text()).toContain(title);
    const result: LoggerImportDetail = {
      id: 9, farmId: 1, tankId: 2, tankName: 'Fertigation tote', tankCode: 'MF-F1', uploadedById: 3, uploadedBy: 'Ines Haar', originalName: 'tote.csv', sizeBytes: 10, sha256: 'ab'.repeat(32),
      mapping: importMappingSchema.parse({ timestamp: { column: 0, format: 'iso8601' }, value: { column: 1, kind: 'level', unit: 'mm' } }),
      policy: 'reject-file', status: 'rejected', delimiter: ',', rowsTotal: 4, rowsNew: 0, rowsDuplicate: 0, rowsRepeated: 0, rowsRejected: 1, noticeCount: 0,
      error: `1 of 4 rows have problems, so nothing from this file was stored ("${title}" was chosen)`, duplicateOfId: null,
      createdAt: '2026-12-01T10:00:00.000Z', startedAt: null, finishedAt: null, rejectedPreview: [], rejectedProblems: 0, notices: [],
    };
    const card = mount(ImportsResultCard, { props: { result }, global: { plugins: [[PrimeVue, { unstyled: true }]] } });
    expect(card.get('[data-testid="imports-result-policy"]').text()).toContain(`chosen: ${title}`);
    expect(card.get('[data-testid="imports-result-error"]').text()).toContain(`"${title}" was chosen`);
  });
});
