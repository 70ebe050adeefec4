import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { importMappingSchema } from '@shared/imports';
import type { ImportProgress, LoggerImportDetail, SavedImportMapping, Tank, TankEditor } from '@shared/schemas';
import * as authApi from '@/api/auth';
import * as farmsApi from '@/api/farms';
import * as importsApi from '@/api/imports';
import * as tanksApi from '@/api/tanks';
import { ApiError } from '@/api/http';
import { useImportsStore } from '@/stores/imports';
import { useSessionStore } from '@/stores/session';
import { makeFarm, makeUser, sessionOf } from './support/fixtures';

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
  UPLOAD_MAX_BYTES: 64 * 1024,
  MAX_FILES_PER_UPLOAD: 3,
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

// Invented tanks of the test co-operative: a 1,000 mm cube tote and a horizontal header tank.
function makeTank(id: number, farmId: number, overrides: Partial<Tank> = {}): Tank {
  return {
    id,
    farmId,
    name: `Tote ${id}`,
    code: `T-${id}`,
    contents: 'water',
    contentsNote: '',
    geometry: { shape: 'box', lengthMm: 1000, widthMm: 1000, heightMm: 1000 },
    datumOffsetMm: 0,
    outletHeightMm: 50,
    safeFillLevelMm: 950,
    lowStockL: 100,
    specificGravity: 1,
    sensorHeightMm: null,
    walkOrder: 1,
    exposedToFrost: true,
    calibrationVersion: 'v1',
    heightMm: 1000,
    capacityL: 1000,
    archivedAt: null,
    ...overrides,
  };
}

const savedMapping: SavedImportMapping = {
  tankId: 21,
  mapping: importMappingSchema.parse({
    delimiter: ';',
    decimalComma: true,
    hasHeader: true,
    timestamp: { column: 'Zeit', format: 'DD.MM.YYYY HH:mm', timeZone: 'Europe/Lisbon' },
    value: { column: 'Stand (cm)', kind: 'level', unit: 'cm' },
    temperature: { column: 'Temp', unit: 'C' },
  }),
  policy: 'valid-rows',
  savedAt: '2026-11-20T09:00:00.000Z',
  savedBy: 'Tomas Lind',
};

function detail(id: number, overrides: Partial<LoggerImportDetail> = {}): LoggerImportDetail {
  return {
    id,
    farmId: 11,
    tankId: 21,
    tankName: 'Tote 21',
    tankCode: 'T-21',
    uploadedById: 3,
    uploadedBy: 'Tomas Lind',
    originalName: `logger-${id}.csv`,
    sizeBytes: 120,
    sha256: 'ab'.repeat(32),
    mapping: savedMapping.mapping,
    policy: 'reject-file',
    status: 'imported',
    delimiter: ',',
    rowsTotal: 3,
    rowsNew: 3,
    rowsDuplicate: 0,
    rowsRepeated: 0,
    noticeCount: 0,
    rowsRejected: 0,
    error: null,
    duplicateOfId: null,
    createdAt: '2026-11-30T10:00:00.000Z',
    startedAt: '2026-11-30T10:00:00.000Z',
    finishedAt: '2026-11-30T10:00:01.000Z',
    rejectedPreview: [],
    rejectedProblems: 0,
    notices: [],
    ...overrides,
  };
}

const csv = (name: string, text: string) => new File([text], name, { type: 'text/csv' });
const LEVEL_FILE = 'Time,Level (mm),Temp (C)\n2026-11-01T06:00:00Z,612.5,14.0\n2026-11-01T06:30:00Z,611.0,14.1\n2026-11-01T07:00:00Z,1204.0,14.1\n';
const sample = (name: string) => new File([readFileSync(join(import.meta.dirname, '../../samples/loggers', name))], name, { type: 'text/csv' });

async function storeWithTank(saved: SavedImportMapping | null) {
  api.fetchImportSetup.mockResolvedValue({ saved, tankEditors: EDITORS });
  const session = useSessionStore();
  await session.load();
  const store = useImportsStore();
  await store.start();
  return store;
}

beforeEach(() => {
  vi.clearAllMocks();
  localStorage.clear();
  setActivePinia(createPinia());
  auth.fetchSession.mockResolvedValue(sessionOf(makeUser('worker')));
  farms.fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site', { timeZone: 'Europe/Lisbon' }), makeFarm(12, 'Ridge block', { timeZone: 'America/Chicago' })]);
  tanks.fetchTanks.mockImplementation(async ({ farmId } = {}) => (farmId === 11 ? [makeTank(21, 11)] : [makeTank(31, 12), makeTank(32, 12)]));
  api.fetchImports.mockResolvedValue([]);
});

describe('useImportsStore: choosing farm and tank', () => {
  it('opens the first farm and picks its only tank, loading that tank saved mapping and history', async () => {
    const store = await storeWithTank(null);

    expect(store.farmId).toBe(11);
    expect(store.tankId).toBe(21);
    expect(api.fetchImportSetup).toHaveBeenCalledWith(21);
    expect(api.fetchImports).toHaveBeenLastCalledWith({ tankId: 21, limit: 25 });
  });

  it('leaves the tank to the person when the farm has several, and shows the farm history meanwhile', async () => {
    const store = await storeWithTank(null);

    await store.selectFarm(12);

    expect(store.tankId).toBeNull();
    expect(store.tanks.map((t) => t.id)).toEqual([31, 32]);
    expect(api.fetchImports).toHaveBeenLastCalledWith({ farmId: 12, limit: 25 });
  });

  it('comes back to the farm and tank this person used last', async () => {
    const first = await storeWithTank(null);
    await first.selectFarm(12);
    await first.selectTank(32);

    setActivePinia(createPinia());
    const again = await storeWithTank(null);

    expect([again.farmId, again.tankId]).toEqual([12, 32]);
  });
});

describe('useImportsStore: mapping pre-fill', () => {
  it('fills the form from the tank saved mapping, so the next file of that logger needs no clicks', async () => {
    const store = await storeWithTank(savedMapping);

    expect(store.draftOrigin).toBe('saved');
    expect(store.policy).toBe('valid-rows');
    expect(store.built).toEqual({ ok: true, mapping: savedMapping.mapping });
  });

  it('keeps the saved mapping when a file is chosen instead of guessing over it', async () => {
    const store = await storeWithTank(savedMapping);

    await store.addFiles([csv('next.csv', 'Zeit;Stand (cm);Temp\n01.11.2026 06:00;61,2;14,0\n01.11.2026 06:30;61,1;14,1\n')]);

    expect(store.built).toEqual({ ok: true, mapping: savedMapping.mapping });
    expect(store.delimiter).toBe(';');
    expect(store.check?.rows.map((r) => r.kind)).toEqual(['header', 'reading', 'reading']);
    expect(store.check?.rows[1].reading?.levelMm).toBeCloseTo(612, 6);
  });

  it('guesses from the first file when the tank has no saved mapping, and checks the preview rows with the tank', async () => {
    const store = await storeWithTank(null);

    await store.addFiles([csv('first.csv', LEVEL_FILE)]);

    expect(store.draftOrigin).toBe('guess');
    expect(store.built.ok && store.built.mapping).toEqual(
      importMappingSchema.parse({
        timestamp: { column: 'Time', format: 'iso8601' },
        value: { column: 'Level (mm)', kind: 'level', unit: 'mm' },
        temperature: { column: 'Temp (C)', unit: 'C' },
      }),
    );
    // The third row is above the 1,000 mm tote: red before anything is sent.
    expect(store.check?.rows.map((r) => r.kind)).toEqual(['header', 'reading', 'reading', 'rejected']);
    expect(store.check?.rows[3].problems[0].reason).toMatch(/above the top of the tank \(1,000 mm\)/);
  });

  it('does not guess over choices the person made', async () => {
    const store = await storeWithTank(null);
    store.updateDraft({ valueKind: 'pressure' });

    await store.addFiles([csv('first.csv', LEVEL_FILE)]);

    expect(store.draftOrigin).toBe('none');
    expect(store.draft.valueKind).toBe('pressure');
    expect(store.draft.valueUnit).toBe('kPa');
  });

  it('defaults a local timestamp layout to the farm time zone', async () => {
    const store = await storeWithTank(null);
    await store.selectFarm(12);
    await store.selectTank(31);

    await store.addFiles([csv('local.csv', 'When,Level (mm)\n11/01/2026 06:00,500\n11/13/2026 06:30,501\n')]);

    expect(store.built.ok && store.built.mapping.timestamp).toEqual({ column: 'When', format: 'MM/DD/YYYY HH:mm', timeZone: 'America/Chicago', time: null });
  });
});

describe('useImportsStore: files', () => {
  it('marks a file over the size limit and a file that is not CSV, and blocks the upload', async () => {
    const store = await storeWithTank(null);

    await store.addFiles([csv('big.csv', 'x'.repeat(70_000)), new File([new Uint8Array([0x25, 0x50, 0x44, 0x46, 0x2d, 0x31])], 'report.csv'), csv('ok.csv', LEVEL_FILE)]);

    expect(store.files.map((f) => [f.file.name, f.problem !== null])).toEqual([
      ['big.csv', true],
      ['report.csv', true],
      ['ok.csv', false],
    ]);
    expect(store.files[0].problem).toMatch(/^It is 68 KB; the limit is 64 KB per file/);
    expect(store.files[1].problem).toMatch(/PDF document/);
    expect(store.filesBlocked).toBe(true);
    expect(store.previewFile?.file.name).toBe('ok.csv');
  });

  it('says how many files to remove past the per-upload limit', async () => {
    const store = await storeWithTank(null);

    await store.addFiles(['a', 'b', 'c', 'd', 'e'].map((n) => csv(`${n}.csv`, LEVEL_FILE)));

    expect(store.filesError).toBe('At most 3 files go in one upload; remove 2.');
    store.removeFile(store.files[0].key);
    store.removeFile(store.files[0].key);
    expect(store.filesError).toBeNull();
  });
});

describe('useImportsStore: upload results', () => {
  it('keeps each file result, clears the chosen files, reloads the history and treats the mapping as saved', async () => {
    const store = await storeWithTank(null);
    await store.addFiles([csv('a.csv', LEVEL_FILE), csv('b.csv', LEVEL_FILE.replace('612.5', '612.6'))]);
    const imported = detail(41, { originalName: 'a.csv', rowsNew: 2, rowsRejected: 1, rowsTotal: 3, policy: 'valid-rows' });
    const duplicate = detail(42, { originalName: 'b.csv', status: 'duplicate', rowsNew: 0, rowsDuplicate: 3, duplicateOfId: 7, error: 'This file was imported into this tank already' });
    api.uploadLoggerFiles.mockResolvedValue([imported, duplicate]);
    api.fetchImports.mockClear();
    store.policy = 'valid-rows';
    const mapping = store.built.ok ? store.built.mapping : null;

    const out = await store.upload(mapping!);

    expect(out).toEqual([imported, duplicate]);
    const [input] = api.uploadLoggerFiles.mock.calls[0];
    expect(input.tankId).toBe(21);
    expect(input.policy).toBe('valid-rows');
    expect(input.files.map((f) => f.name)).toEqual(['a.csv', 'b.csv']);
    expect(importMappingSchema.parse(JSON.parse(JSON.stringify(input.mapping)))).toEqual(mapping);
    expect(store.results.map((r) => r.status)).toEqual(['imported', 'duplicate']);
    expect(store.phase).toBe('done');
    expect(store.files).toEqual([]);
    expect(api.fetchImports).toHaveBeenCalledWith({ tankId: 21, limit: 25 });
    expect(store.saved?.mapping).toEqual(mapping);
    expect(store.draftOrigin).toBe('saved');
  });

  it('does not call a mapping saved when no file of the upload was imported', async () => {
    const store = await storeWithTank(null);
    await store.addFiles([csv('a.csv', LEVEL_FILE)]);
    api.uploadLoggerFiles.mockResolvedValue([detail(43, { status: 'rejected', rowsNew: 0, rowsRejected: 1, error: '1 of 3 rows have problems' })]);

    await store.upload(store.built.ok ? store.built.mapping : (null as never));

    expect(store.saved).toBeNull();
    expect(store.results[0].status).toBe('rejected');
  });

  it('keeps the files and goes back to idle when the server refuses the upload as a whole', async () => {
    const store = await storeWithTank(null);
    await store.addFiles([csv('a.csv', LEVEL_FILE)]);
    api.uploadLoggerFiles.mockRejectedValue(new ApiError(415, 'not_csv', 'files: "a.csv" cannot be imported: it is a PDF document', 'files'));

    await expect(store.upload(store.built.ok ? store.built.mapping : (null as never))).rejects.toMatchObject({ code: 'not_csv' });

    expect(store.phase).toBe('idle');
    expect(store.files).toHaveLength(1);
    expect(store.results).toEqual([]);
  });

  it('shows the pushed progress of each file in the order the server imports them, and ignores reports when nothing is under way', async () => {
    const store = await storeWithTank(null);
    await store.addFiles([csv('a.csv', LEVEL_FILE), csv('b.csv', LEVEL_FILE.replace('612.5', '612.7'))]);
    const stray: ImportProgress = { importId: 5, rowsRead: 10, bytesRead: 100, totalBytes: 100, status: 'imported' };
    store.onProgress(stray);
    expect(store.progress).toEqual([]);

    let finish: (v: LoggerImportDetail[]) => void = () => undefined;
    api.uploadLoggerFiles.mockImplementation((_input, options) => {
      options?.onProgress?.(150, 300);
      options?.onSent?.();
      return new Promise((resolve) => (finish = resolve));
    });
    const running = store.upload(store.built.ok ? store.built.mapping : (null as never));
    await vi.waitFor(() => expect(store.phase).toBe('importing'));

    store.onProgress({ importId: 51, rowsRead: 1, bytesRead: 40, totalBytes: 150, status: 'importing' });
    store.onProgress({ importId: 51, rowsRead: 3, bytesRead: 150, totalBytes: 150, status: 'imported' });
    store.onProgress({ importId: 52, rowsRead: 0, bytesRead: 150, totalBytes: 150, status: 'duplicate' });

    expect(store.sentBytes).toBe(150);
    expect(store.fileProgress.map((f) => [f.name, f.progress?.status, f.progress?.rowsRead])).toEqual([
      ['a.csv', 'imported', 3],
      ['b.csv', 'duplicate', 0],
    ]);
    finish([detail(51), detail(52, { status: 'duplicate' })]);
    await running;
    expect(store.busy).toBe(false);
  });

  it('replaces a failed import by its retried outcome in the results and the history', async () => {
    const failed = detail(60, { status: 'failed', rowsNew: 0, error: 'The import stopped (connection lost); nothing from this file was kept. Retry it.' });
    api.fetchImports.mockResolvedValue([failed]);
    const store = await storeWithTank(null);
    await vi.waitFor(() => expect(store.history).toHaveLength(1));
    api.fetchImport.mockResolvedValue(failed);
    await store.openResult(60);
    api.retryImport.mockResolvedValue(detail(60, { status: 'imported', rowsNew: 3 }));

    const again = await store.retry(60);

    expect(again.status).toBe('imported');
    expect(store.results.map((r) => [r.id, r.status])).toEqual([[60, 'imported']]);
    expect(store.history.map((r) => [r.id, r.status, r.rowsNew])).toEqual([[60, 'imported', 3]]);
    expect(store.retryingId).toBeNull();
  });
});

describe('useImportsStore on the sample files', () => {
  it('pre-fills nothing wrong for the second file of the same logger after the first import saved the mapping', async () => {
    // samples/loggers: two files of the Flats header tank logger, a week apart.
    const tank = makeTank(21, 11, { geometry: { shape: 'horizontal-cylinder', diameterMm: 1600, lengthMm: 3800, ends: 'ellipsoidal-2to1' }, heightMm: 1600, safeFillLevelMm: 1500 });
    tanks.fetchTanks.mockResolvedValue([tank]);
    const store = await storeWithTank(null);
    await store.addFiles([sample('mf-w1-level-2025-07-07.csv')]);
    const mapping = store.built.ok ? store.built.mapping : null;
    expect(mapping).not.toBeNull();
    api.uploadLoggerFiles.mockResolvedValue([detail(70, { mapping: mapping! })]);
    await store.upload(mapping!);

    // The next visit: the server now answers with the saved mapping.
    setActivePinia(createPinia());
    const next = await storeWithTank({ tankId: 21, mapping: mapping!, policy: 'reject-file', savedAt: '2026-12-01T08:00:00.000Z', savedBy: 'Tomas Lind' });
    await next.addFiles([sample('mf-w1-level-2025-07-13.csv')]);

    expect(next.built).toEqual({ ok: true, mapping });
    expect(next.check?.bad).toBe(0);
    expect(next.check?.good).toBe(19);
  });
});
