import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, type VueWrapper } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import { cautionText } from '@shared/cautions';
import { importMappingSchema } from '@shared/imports';
import type { LoggerImportDetail, Tank, TankEditor } from '@shared/schemas';
import * as authApi from '@/api/auth';
import * as farmsApi from '@/api/farms';
import * as importsApi from '@/api/imports';
import * as tanksApi from '@/api/tanks';
import { ApiError } from '@/api/http';
import ImportsView from '@/views/ImportsView.vue';
import { makeFarm, makeUser, sessionOf } from './support/fixtures';
import { mountWithApp, setViewportWidth } from './support/mountApp';

vi.mock('@/api/auth', () => ({
  fetchSession: vi.fn(),
  signIn: vi.fn(),
  signOut: vi.fn(),
  updateProfile: vi.fn(),
  setPassword: vi.fn(),
  requestPasswordReset: vi.fn(),
  fetchTokenInfo: vi.fn(),
}));
vi.mock('@/api/farms', () => ({ fetchFarms: vi.fn(), fetchFarm: vi.fn(), createFarm: vi.fn(), updateFarm: vi.fn() }));
vi.mock('@/api/tanks', () => ({ fetchTanks: vi.fn(), fetchTank: vi.fn(), updateTank: vi.fn() }));
vi.mock('@/api/imports', () => ({
  UPLOAD_MAX_BYTES: 200 * 1024 * 1024,
  MAX_FILES_PER_UPLOAD: 20,
  uploadLoggerFiles: vi.fn(),
  fetchImports: vi.fn(),
  fetchImport: vi.fn(),
  retryImport: vi.fn(),
  fetchImportSetup: vi.fn(),
  dryRunLoggerFiles: vi.fn(async () => []),
  rejectedRowsCsvUrl: (id: number) => `/api/imports/${id}/rejected.csv`,
}));
vi.mock('@/api/socket', () => ({ onServerEvent: vi.fn(() => () => undefined), whenConnected: vi.fn(async () => true) }));

const auth = vi.mocked(authApi);
const farms = vi.mocked(farmsApi);
const tanks = vi.mocked(tanksApi);
const api = vi.mocked(importsApi);
// The invented co-operative's owner and manager, who may change a tank's setup.
const EDITORS: TankEditor[] = [
  { name: 'Imre Vasquez', role: 'owner' },
  { name: 'Dana Okafor', role: 'manager' },
];
let pinia: Pinia;

// An invented 1,200 mm tall cylinder with an ultrasonic sensor 1,400 mm above its floor.
const tank: Tank = {
  id: 21,
  farmId: 11,
  name: 'Creek tank',
  code: 'CR-W1',
  contents: 'water',
  contentsNote: '',
  geometry: { shape: 'vertical-cylinder', diameterMm: 1200, heightMm: 1200 },
  datumOffsetMm: 0,
  outletHeightMm: 60,
  safeFillLevelMm: 1150,
  lowStockL: 100,
  specificGravity: 1,
  sensorHeightMm: 1400,
  walkOrder: 1,
  exposedToFrost: true,
  calibrationVersion: 'v1',
  heightMm: 1200,
  capacityL: 1357,
  archivedAt: null,
};

// Semicolons, decimal commas, day-first local time: what the screen must untangle.
const FILE = 'Datum;Abstand;Temp\n01.11.2026 06:00;41,5;12,0\n01.11.2026 06:30;42,0;12,1\n01.11.2026 07:00;ERR;12,1\n';

function result(overrides: Partial<LoggerImportDetail>): LoggerImportDetail {
  return {
    id: 80,
    farmId: 11,
    tankId: 21,
    tankName: 'Creek tank',
    tankCode: 'CR-W1',
    uploadedById: 3,
    uploadedBy: 'Tomas Lind',
    originalName: 'creek.csv',
    sizeBytes: FILE.length,
    sha256: 'cd'.repeat(32),
    mapping: importMappingSchema.parse({ timestamp: { column: 0, format: 'iso8601' }, value: { column: 1, kind: 'level', unit: 'mm' } }),
    policy: 'reject-file',
    status: 'rejected',
    delimiter: ';',
    rowsTotal: 3,
    rowsNew: 0,
    rowsDuplicate: 0,
    rowsRepeated: 0,
    noticeCount: 0,
    rowsRejected: 1,
    error: '1 of 3 rows have problems, so nothing from this file was imported (policy: reject the whole file)',
    duplicateOfId: null,
    createdAt: '2026-12-01T10:00:00.000Z',
    startedAt: '2026-12-01T10:00:00.000Z',
    finishedAt: '2026-12-01T10:00:01.000Z',
    rejectedPreview: [{ line: 4, field: 'value', column: 'Abstand', value: 'ERR', reason: 'Value "ERR" is not a number' }],
    rejectedProblems: 1,
    notices: [],
    ...overrides,
  };
}

async function chooseFile(wrapper: VueWrapper, file: File) {
  const input = wrapper.get('[data-testid="imports-file-input"]');
  Object.defineProperty(input.element, 'files', { value: [file], configurable: true });
  await input.trigger('change');
  await vi.waitFor(() => expect(wrapper.find('[data-testid="imports-preview"]').exists()).toBe(true));
  await flushPromises();
}

/** Opens a PrimeVue Select by its test id and chooses the option with this label (Select picks on mousedown). */
async function pick(wrapper: VueWrapper, testId: string, label: string) {
  await wrapper.get(`[data-testid="${testId}"]`).trigger('click');
  await flushPromises();
  const overlays = document.querySelectorAll('[data-pc-section="overlay"]');
  const options = Array.from(overlays[overlays.length - 1]?.querySelectorAll<HTMLElement>('[role="option"]') ?? []);
  const option = options.find((o) => o.getAttribute('aria-label') === label);
  if (!option) throw new Error(`No option "${label}" in ${testId}; have ${options.map((o) => o.getAttribute('aria-label')).join(' | ')}`);
  option.dispatchEvent(new MouseEvent('mousedown', { bubbles: true }));
  await flushPromises();
  expect(wrapper.get(`[data-testid="${testId}"]`).text()).toContain(label);
}

beforeEach(() => {
  vi.clearAllMocks();
  localStorage.clear();
  document.body.innerHTML = '';
  setViewportWidth(1280);
  pinia = createPinia();
  setActivePinia(pinia);
  auth.fetchSession.mockResolvedValue(sessionOf(makeUser('worker')));
  farms.fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site', { timeZone: 'Europe/Berlin' })]);
  tanks.fetchTanks.mockResolvedValue([tank]);
  api.fetchImports.mockResolvedValue([]);
  api.fetchImportSetup.mockResolvedValue({ saved: null, tankEditors: EDITORS });
});

describe('ImportsView', () => {
  it('builds from the preview and the choices made a mapping importMappingSchema accepts, and sends it with the policy', async () => {
    const { wrapper } = await mountWithApp(ImportsView, { pinia, path: '/imports' });
    await chooseFile(wrapper, new File([FILE], 'creek.csv', { type: 'text/csv' }));

    // "Abstand" has an ERR cell, so the guess leaves it open; and it cannot know it is a distance in cm.
    await pick(wrapper, 'map-value-column', 'Abstand (column 2)');
    await pick(wrapper, 'map-value-kind', 'Distance down from the sensor (ultrasonic)');
    await pick(wrapper, 'map-value-unit', 'cm — centimetres');
    await wrapper.get('[data-testid="imports-policy-valid-rows"] input').setValue(true);
    expect(wrapper.find('[data-testid="imports-preview-row-4"]').attributes('data-state')).toBe('rejected');
    expect(wrapper.get('[data-testid="imports-preview-row-4"]').text()).toContain('Value "ERR" is not a number');
    expect(wrapper.get('[data-testid="imports-preview-row-2"]').attributes('data-state')).toBe('reading');
    api.uploadLoggerFiles.mockResolvedValue([result({ policy: 'valid-rows', status: 'imported', rowsNew: 2, rowsRejected: 1, error: null })]);

    await wrapper.get('[data-testid="imports-submit"]').trigger('click');
    await flushPromises();

    const [input] = api.uploadLoggerFiles.mock.calls[0];
    const sent = JSON.parse(JSON.stringify(input.mapping)) as unknown;
    expect(importMappingSchema.safeParse(sent).success).toBe(true);
    expect(sent).toEqual({
      delimiter: 'auto',
      decimalComma: true,
      hasHeader: true,
      timestamp: { column: 'Datum', format: 'DD.MM.YYYY HH:mm', timeZone: 'Europe/Berlin', time: null },
      value: { column: 'Abstand', kind: 'ultrasonic', unit: 'cm' },
      temperature: { column: 'Temp', unit: 'C' },
    });
    expect(input.policy).toBe('valid-rows');
    expect(input.tankId).toBe(21);
    expect(wrapper.get('[data-testid="imports-result-80"]').attributes('data-status')).toBe('imported');
    expect(wrapper.get('[data-testid="imports-result-80"] [data-testid="imports-result-new"]').text()).toBe('2');
  });

  it('shows the bad lines of a refused file and the link to all of them', async () => {
    const { wrapper } = await mountWithApp(ImportsView, { pinia, path: '/imports' });
    await chooseFile(wrapper, new File([FILE], 'creek.csv', { type: 'text/csv' }));
    api.uploadLoggerFiles.mockResolvedValue([result({})]);

    await wrapper.get('[data-testid="imports-submit"]').trigger('click');
    await flushPromises();

    const card = wrapper.get('[data-testid="imports-result-80"]');
    expect(card.get('[data-testid="imports-result-status"]').text()).toBe('Refused');
    expect(card.get('[data-testid="imports-problem-line-4"]').text()).toContain('Value "ERR" is not a number');
    expect(card.get('[data-testid="imports-result-download"]').attributes('href')).toBe('/api/imports/80/rejected.csv');
  });

  it('keeps the import from going out and names the fields when the mapping is unfinished', async () => {
    const { wrapper } = await mountWithApp(ImportsView, { pinia, path: '/imports' });
    await chooseFile(wrapper, new File(['a;b\nx;y\n'], 'odd.csv', { type: 'text/csv' }));

    await wrapper.get('[data-testid="imports-submit"]').trigger('click');
    await flushPromises();

    expect(api.uploadLoggerFiles).not.toHaveBeenCalled();
    expect(wrapper.get('[data-testid="map-ts-column-error"]').text()).toBe('Choose the column that holds the date and time');
    expect(wrapper.get('[data-testid="map-value-column-error"]').text()).toBe('Choose the column that holds the level, distance or pressure');
  });

  it('puts a refusal of the whole upload under the field the server names', async () => {
    const { wrapper } = await mountWithApp(ImportsView, { pinia, path: '/imports' });
    await chooseFile(wrapper, new File([FILE], 'creek.csv', { type: 'text/csv' }));
    api.uploadLoggerFiles.mockRejectedValue(
      new ApiError(422, 'mapping_unfit', "mapping.value.kind: distances from an ultrasonic sensor need the tank's sensor height (sensorHeightMm); set it on the tank first", 'mapping.value.kind'),
    );

    await wrapper.get('[data-testid="imports-submit"]').trigger('click');
    await flushPromises();

    expect(wrapper.get('[data-testid="map-value-kind-error"]').text()).toBe("distances from an ultrasonic sensor need the tank's sensor height (sensorHeightMm); set it on the tank first");
    expect(wrapper.find('[data-testid="imports-results"]').exists()).toBe(false);
  });

  it('says which file size and count the upload takes', async () => {
    const { wrapper } = await mountWithApp(ImportsView, { pinia, path: '/imports' });

    expect(wrapper.get('#imports-file-limit').text()).toBe('CSV text files, up to 200 MB each, at most 20 at once.');
  });

  it('shows the confined-space caution in the shared words, through the caution note', async () => {
    const { wrapper } = await mountWithApp(ImportsView, { pinia, path: '/imports' });

    const note = wrapper.get('[data-testid="caution-confined-space"]');
    expect(note.attributes('data-caution')).toBe('confined-space');
    expect(note.text()).toBe(cautionText('confined-space'));
  });
});

describe('ImportsView: distances and the sensor height', () => {
  const noSensor: Tank = { ...tank, sensorHeightMm: null };
  const distanceFile = () => new File(['Time,Distance (mm)\n2026-11-01T06:00:00Z,412\n2026-11-01T06:30:00Z,415\n'], 'creek.csv', { type: 'text/csv' });

  it('tells a worker exactly whom to ask for the sensor height, by name', async () => {
    tanks.fetchTanks.mockResolvedValue([noSensor]);
    const { wrapper } = await mountWithApp(ImportsView, { pinia, path: '/imports' });
    await chooseFile(wrapper, distanceFile());

    expect(wrapper.get('[data-testid="map-value-kind"]').text()).toContain('Distance down from the sensor');
    const ask = wrapper.get('[data-testid="imports-sensor-height-ask"]').text();
    expect(ask).toContain('ask Imre Vasquez (owner) or Dana Okafor (manager)');
    expect(wrapper.find('[data-testid="imports-sensor-height-input"]').exists()).toBe(false);
    // The file is previewed: no hint to choose one.
    expect(wrapper.text()).not.toContain('Choose a file to see its first lines');
  });

  it('lets a manager keep the sensor height on the tank from the import form', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('manager')));
    tanks.fetchTanks.mockResolvedValue([noSensor]);
    tanks.updateTank.mockResolvedValue({ ...noSensor, sensorHeightMm: 1450 });
    const { wrapper } = await mountWithApp(ImportsView, { pinia, path: '/imports' });
    await chooseFile(wrapper, distanceFile());

    const input = wrapper.get('[data-testid="imports-sensor-height-input"] input');
    await input.setValue('1450');
    await input.trigger('blur');
    await wrapper.get('[data-testid="imports-sensor-height-save"]').trigger('click');
    await flushPromises();

    expect(tanks.updateTank).toHaveBeenCalledWith(21, { sensorHeightMm: 1450 });
    expect(wrapper.find('[data-testid="imports-sensor-height"]').exists()).toBe(false);
    expect(wrapper.get('[data-testid="imports-tank-facts"]').text()).toContain('ultrasonic sensor 1,450 mm above the floor');
  });
});

describe('ImportsView: the server dry run', () => {
  it('sends the previewed file for a dry run and shows the server counts and the line messages past the first lines', async () => {
    api.dryRunLoggerFiles.mockResolvedValue([
      {
        originalName: 'creek.csv', sizeBytes: 120, status: 'imported', delimiter: ';', rowsTotal: 1440, rowsNew: 1436, rowsDuplicate: 1, rowsRepeated: 1, rowsRejected: 2, noticeCount: 0, error: null, duplicateOfId: null,
        rejectedPreview: [
          { line: 4, field: 'value', column: 'Abstand', value: 'ERR', reason: 'Value "ERR" is not a number' },
          { line: 977, field: 'value', column: 'Abstand', value: '-3,0', reason: '-3,0 cm: the distance is negative' },
        ],
        rejectedProblems: 2,
        notices: [],
      },
    ]);
    const { wrapper } = await mountWithApp(ImportsView, { pinia, path: '/imports' });
    await chooseFile(wrapper, new File([FILE], 'creek.csv', { type: 'text/csv' }));
    await pick(wrapper, 'map-value-column', 'Abstand (column 2)');
    await pick(wrapper, 'map-value-kind', 'Distance down from the sensor (ultrasonic)');

    await vi.waitFor(() => expect(wrapper.get('[data-testid="imports-dry-run"]').attributes('data-state')).toBe('ready'), { timeout: 2000 });
    const [input, signal] = api.dryRunLoggerFiles.mock.calls.at(-1)!;
    expect(input).toMatchObject({ tankId: 21, policy: 'reject-file', files: [expect.objectContaining({ name: 'creek.csv' })] });
    expect(signal).toBeInstanceOf(AbortSignal);
    expect(wrapper.get('[data-testid="imports-dry-run-new"]').text()).toBe('1,436');
    expect(wrapper.get('[data-testid="imports-dry-run-duplicate"]').text()).toBe('1');
    expect(wrapper.get('[data-testid="imports-dry-run-repeated"]').text()).toBe('1');
    expect(wrapper.get('[data-testid="imports-dry-run-lines-line-977"]').text()).toContain('the distance is negative');
    expect(wrapper.text()).not.toContain('Choose a file to see its first lines');
  });
});
