import { computed, ref, shallowRef } from 'vue';
import { defineStore } from 'pinia';
import type { ImportMapping, ImportPolicy } from '@shared/imports';
import type { TankSetup } from '@shared/readings';
import type { ImportProgress, LoggerImport, LoggerImportDetail, SavedImportMapping, Tank } from '@shared/schemas';
import * as importsApi from '@/api/imports';
import * as tanksApi from '@/api/tanks';
import { errorMessage } from '@/api/http';
import { onServerEvent, whenConnected } from '@/api/socket';
import { buildMapping, columnOptions, draftFromMapping, emptyDraft, guessDraft, rebaseColumn, unitsFor, type MappingDraft } from '@/components/imports/importMapping';
import { checkPreview, previewRecords, readFileHead, resolveDelimiter, uncheckedRows, type FileHead, type PreviewCheck } from '@/components/imports/importPreview';
import { formatBytes } from '@/components/imports/importLabels';
import { useFarmsStore, type LoadStatus } from './farms';
import { useSessionStore } from './session';

/** A file picked for upload, with its first bytes once read and why it cannot go, if it cannot. */
export interface ChosenFile {
  key: string;
  file: File;
  head: FileHead | null;
  problem: string | null;
}

/** idle: nothing sent; uploading: the body is going out; importing: the server is reading the files; done: results are in. */
export type UploadPhase = 'idle' | 'uploading' | 'importing' | 'done';

/** What the uploader sees of one file of the upload under way. */
export interface FileProgress {
  name: string;
  sizeBytes: number;
  progress: ImportProgress | null;
}

/** How long an upload waits for the live connection before it goes anyway (progress is then only missing, not needed). */
const SOCKET_WAIT_MS = 1500;
const HISTORY_LIMIT = 25;

/** The tank's setup as the shared reading functions take it. */
export function tankSetupOf(tank: Tank): TankSetup {
  return {
    geometry: tank.geometry,
    datumOffsetMm: tank.datumOffsetMm,
    outletHeightMm: tank.outletHeightMm,
    safeFillLevelMm: tank.safeFillLevelMm,
    specificGravity: tank.specificGravity,
    sensorHeightMm: tank.sensorHeightMm ?? undefined,
  };
}

const fileKey = (f: File) => `${f.name}|${f.size}|${f.lastModified}`;
const storageKey = (userId: number) => `brimstock.imports.target.${userId}`;

/** Logger file imports: the farm and tank, the chosen files, the column mapping, the upload and its results, the history. */
export const useImportsStore = defineStore('imports', () => {
  const farms = useFarmsStore();
  const session = useSessionStore();
  let ownerId: number | null = null;

  // ---- farm and tank ----
  const farmId = ref<number | null>(null);
  const tankId = ref<number | null>(null);
  const tanks = shallowRef<Tank[]>([]);
  const tanksStatus = ref<LoadStatus>('idle');
  const tanksError = ref<string | null>(null);
  const farm = computed(() => (farmId.value === null ? null : (farms.byId.get(farmId.value) ?? null)));
  const tank = computed(() => tanks.value.find((t) => t.id === tankId.value) ?? null);
  const setup = computed(() => (tank.value ? tankSetupOf(tank.value) : null));
  const farmTimeZone = computed(() => farm.value?.timeZone ?? 'UTC');

  // ---- saved mapping and the form's draft ----
  const saved = ref<SavedImportMapping | null>(null);
  const savedStatus = ref<LoadStatus>('idle');
  const savedError = ref<string | null>(null);
  const draft = ref<MappingDraft>(emptyDraft('UTC'));
  /** Where the draft came from: nothing yet, the tank's saved mapping, or a guess from the file. */
  const draftOrigin = ref<'none' | 'saved' | 'guess'>('none');
  /** The person changed something since; a new guess must not undo that. */
  const draftEdited = ref(false);
  const policy = ref<ImportPolicy>('reject-file');

  // ---- files and preview ----
  const files = shallowRef<ChosenFile[]>([]);
  const filesError = ref<string | null>(null);
  const previewKey = ref<string | null>(null);
  const previewFile = computed(() => files.value.find((f) => f.key === previewKey.value && f.head && !f.problem) ?? files.value.find((f) => f.head && !f.problem) ?? null);
  const delimiter = computed(() => (previewFile.value?.head ? resolveDelimiter(previewFile.value.head.text, draft.value) : null));
  const records = computed(() => (previewFile.value?.head && delimiter.value ? previewRecords(previewFile.value.head, delimiter.value) : []));
  const firstRecord = computed(() => records.value.find((r) => r.some((c) => c.trim() !== '')) ?? null);
  const header = computed(() => (draft.value.hasHeader && firstRecord.value ? firstRecord.value.map((c) => c.trim()) : null));
  const width = computed(() => Math.max(0, ...records.value.map((r) => r.length)));
  const columns = computed(() => columnOptions(header.value, width.value));
  const built = computed(() => buildMapping(draft.value, setup.value));
  const check = computed<PreviewCheck | null>(() => {
    if (!records.value.length) return null;
    if (!built.value.ok || !setup.value) return { rows: uncheckedRows(records.value), fatal: null, good: 0, bad: 0 };
    return checkPreview(records.value, built.value.mapping, setup.value, Date.now());
  });
  const readyFiles = computed(() => files.value.filter((f) => f.head && !f.problem));
  const filesBlocked = computed(() => !!filesError.value || files.value.some((f) => f.problem || !f.head));

  // ---- upload ----
  const phase = ref<UploadPhase>('idle');
  const sentBytes = ref(0);
  const totalBytes = ref(0);
  const sending = shallowRef<{ name: string; sizeBytes: number }[]>([]);
  const progress = ref<ImportProgress[]>([]);
  const results = shallowRef<LoggerImportDetail[]>([]);
  const retryingId = ref<number | null>(null);
  const busy = computed(() => phase.value === 'uploading' || phase.value === 'importing');
  const fileProgress = computed<FileProgress[]>(() =>
    // The server imports the files one after the other in the order sent, so the n-th import it reports is the n-th file.
    sending.value.map((f, i) => ({ name: f.name, sizeBytes: f.sizeBytes, progress: progress.value[i] ?? null })),
  );

  // ---- history ----
  const history = shallowRef<LoggerImport[]>([]);
  const historyStatus = ref<LoadStatus>('idle');
  const historyError = ref<string | null>(null);

  let tanksToken = 0;
  let savedToken = 0;
  let historyToken = 0;

  function remember(): void {
    if (ownerId === null || typeof localStorage === 'undefined') return;
    try {
      localStorage.setItem(storageKey(ownerId), JSON.stringify({ farmId: farmId.value, tankId: tankId.value }));
    } catch {
      // Private mode or a full store: the choice is just not remembered.
    }
  }

  function remembered(): { farmId?: number; tankId?: number } {
    if (ownerId === null || typeof localStorage === 'undefined') return {};
    try {
      const value = JSON.parse(localStorage.getItem(storageKey(ownerId)) ?? '{}') as { farmId?: unknown; tankId?: unknown };
      return { farmId: typeof value.farmId === 'number' ? value.farmId : undefined, tankId: typeof value.tankId === 'number' ? value.tankId : undefined };
    } catch {
      return {};
    }
  }

  /** A fresh draft for the chosen farm, guessed from the previewed file when there is one. */
  function freshDraft(): void {
    const base = emptyDraft(farmTimeZone.value);
    draftEdited.value = false;
    draft.value = base;
    draftOrigin.value = 'none';
    guessFromPreview();
  }

  function guessFromPreview(): void {
    if (draftOrigin.value === 'saved' || draftEdited.value || !records.value.length) return;
    draft.value = guessDraft(records.value, { ...draft.value, timeZone: draft.value.timeZone || farmTimeZone.value });
    draftOrigin.value = 'guess';
  }

  /**
   * Opens the screen: loads the farms and picks the farm and tank asked for (route query), else the
   * ones this person used last, else the first farm. Keeps the current choice when coming back.
   */
  async function start(wanted: { farmId?: number; tankId?: number } = {}): Promise<void> {
    const userId = session.user?.id ?? null;
    if (userId !== ownerId) {
      reset();
      ownerId = userId;
    }
    await farms.ensureLoaded();
    const active = farms.activeFarms;
    if (wanted.farmId === undefined && wanted.tankId === undefined && farmId.value !== null && active.some((f) => f.id === farmId.value)) {
      if (tanksStatus.value === 'error') await loadTanks();
      // Someone may have imported meanwhile (another device, a colleague).
      void loadHistory();
      return;
    }
    const last = wanted.farmId !== undefined || wanted.tankId !== undefined ? wanted : remembered();
    let target = active.find((f) => f.id === last.farmId) ?? null;
    if (!target && last.tankId !== undefined) {
      // A link to a tank alone: find its farm.
      const t = await tanksApi.fetchTank(last.tankId).catch(() => null);
      target = active.find((f) => f.id === t?.farmId) ?? null;
    }
    target ??= active[0] ?? null;
    if (!target) return;
    await selectFarm(target.id, last.tankId);
  }

  async function loadTanks(preferTankId?: number): Promise<void> {
    const id = farmId.value;
    if (id === null) return;
    const token = ++tanksToken;
    tanksStatus.value = 'loading';
    tanksError.value = null;
    try {
      const list = (await tanksApi.fetchTanks({ farmId: id })).filter((t) => t.archivedAt === null);
      if (token !== tanksToken) return;
      tanks.value = list;
      tanksStatus.value = 'ready';
      const pick = list.find((t) => t.id === (preferTankId ?? tankId.value)) ?? (list.length === 1 ? list[0] : null);
      if (pick && pick.id !== tankId.value) await selectTank(pick.id);
      else if (!pick) tankId.value = null;
    } catch (e) {
      if (token !== tanksToken) return;
      tanksError.value = errorMessage(e);
      tanksStatus.value = 'error';
    }
  }

  /** Chooses the farm: loads its tanks (picking `preferTankId`, or the only one) and its import history. */
  async function selectFarm(id: number, preferTankId?: number): Promise<void> {
    const changed = id !== farmId.value;
    farmId.value = id;
    if (changed) {
      tankId.value = null;
      tanks.value = [];
      saved.value = null;
      savedStatus.value = 'idle';
      if (draftOrigin.value !== 'saved' && !draftEdited.value) draft.value = { ...draft.value, timeZone: farmTimeZone.value };
    }
    if (changed) {
      history.value = [];
      historyStatus.value = 'idle';
    }
    remember();
    await loadTanks(preferTankId);
    // With a tank picked its history is loading already; otherwise show the farm's.
    if (tankId.value === null) void loadHistory();
  }

  /** Chooses the tank: its saved mapping fills the form, and its history is shown. */
  async function selectTank(id: number): Promise<void> {
    tankId.value = id;
    remember();
    void loadHistory();
    await loadSaved();
  }

  async function loadSaved(): Promise<void> {
    const id = tankId.value;
    if (id === null) return;
    const token = ++savedToken;
    savedStatus.value = 'loading';
    savedError.value = null;
    try {
      const found = await importsApi.fetchSavedMapping(id);
      if (token !== savedToken) return;
      saved.value = found;
      savedStatus.value = 'ready';
      if (found) {
        draft.value = draftFromMapping(found.mapping, farmTimeZone.value);
        policy.value = found.policy;
        draftOrigin.value = 'saved';
        draftEdited.value = false;
      } else if (draftOrigin.value === 'saved') {
        freshDraft();
      }
    } catch (e) {
      if (token !== savedToken) return;
      savedError.value = errorMessage(e);
      savedStatus.value = 'error';
    }
  }

  /** Changes part of the form; keeps the unit fitting the value kind and the columns pointing at the same place. */
  function updateDraft(patch: Partial<MappingDraft>): void {
    const next = { ...draft.value, ...patch };
    if (patch.valueKind && !unitsFor(next.valueKind).includes(next.valueUnit)) next.valueUnit = next.valueKind === 'pressure' ? 'kPa' : 'mm';
    if (patch.hasHeader !== undefined && patch.hasHeader !== draft.value.hasHeader) {
      const names = firstRecord.value ? firstRecord.value.map((c) => c.trim()) : null;
      next.timestampColumn = rebaseColumn(draft.value.timestampColumn, names, next.hasHeader, width.value);
      next.valueColumn = rebaseColumn(draft.value.valueColumn, names, next.hasHeader, width.value);
      next.temperatureColumn = rebaseColumn(draft.value.temperatureColumn, names, next.hasHeader, width.value);
    }
    draft.value = next;
    draftEdited.value = true;
  }

  /** Puts the saved mapping back, or guesses again from the previewed file when there is none. */
  function resetDraft(): void {
    if (saved.value) {
      draft.value = draftFromMapping(saved.value.mapping, farmTimeZone.value);
      policy.value = saved.value.policy;
      draftOrigin.value = 'saved';
      draftEdited.value = false;
    } else freshDraft();
  }

  function checkCount(list: ChosenFile[]): void {
    filesError.value =
      list.length > importsApi.MAX_FILES_PER_UPLOAD ? `At most ${importsApi.MAX_FILES_PER_UPLOAD} files go in one upload; remove ${list.length - importsApi.MAX_FILES_PER_UPLOAD}.` : null;
  }

  function replaceFile(key: string, change: Partial<ChosenFile>): void {
    files.value = files.value.map((f) => (f.key === key ? { ...f, ...change } : f));
  }

  /** Adds files to the upload; each is checked for size and content, and the first good one previewed. */
  async function addFiles(picked: readonly File[]): Promise<void> {
    if (phase.value === 'done') {
      // A new batch after results: the old results stay until this one is sent.
      phase.value = 'idle';
    }
    const known = new Set(files.value.map((f) => f.key));
    const added: ChosenFile[] = [];
    for (const file of picked) {
      const key = fileKey(file);
      if (known.has(key)) continue;
      known.add(key);
      let problem: string | null = null;
      if (file.size === 0) problem = 'The file is empty.';
      else if (file.size > importsApi.UPLOAD_MAX_BYTES) problem = `It is ${formatBytes(file.size)}; the limit is ${formatBytes(importsApi.UPLOAD_MAX_BYTES)} per file. Split it into smaller files.`;
      added.push({ key, file, head: null, problem });
    }
    const list = [...files.value, ...added];
    files.value = list;
    checkCount(list);
    await Promise.all(
      added
        .filter((f) => !f.problem)
        .map(async (f) => {
          try {
            const head = await readFileHead(f.file);
            replaceFile(f.key, { head, problem: head.problem });
          } catch (e) {
            replaceFile(f.key, { problem: `It could not be read here: ${errorMessage(e)}` });
          }
        }),
    );
    guessFromPreview();
  }

  function removeFile(key: string): void {
    files.value = files.value.filter((f) => f.key !== key);
    checkCount(files.value);
    if (previewKey.value === key) previewKey.value = null;
  }

  function clearFiles(): void {
    files.value = [];
    filesError.value = null;
    previewKey.value = null;
  }

  function showPreviewOf(key: string): void {
    previewKey.value = key;
  }

  /** A pushed progress report: kept when it belongs to the upload or retry under way. */
  function onProgress(payload: ImportProgress): void {
    const known = progress.value.findIndex((p) => p.importId === payload.importId);
    if (known >= 0) {
      progress.value = progress.value.map((p, i) => (i === known ? payload : p));
      return;
    }
    if (busy.value || retryingId.value === payload.importId) progress.value = [...progress.value, payload];
  }

  /** Listens for the server's progress reports; returns the function that stops listening. */
  function listen(): () => void {
    return onServerEvent('import:progress', onProgress);
  }

  /**
   * Sends the chosen files with `mapping` and the policy; returns each file's outcome. Throws the
   * ApiError of a refused request (nothing imported then), leaving the files chosen.
   */
  async function upload(mapping: ImportMapping): Promise<LoggerImportDetail[]> {
    const id = tankId.value;
    if (id === null) throw new Error('Choose the tank the logger belongs to.');
    const list = readyFiles.value.map((f) => f.file);
    if (!list.length) throw new Error('Choose at least one CSV file.');
    phase.value = 'uploading';
    sentBytes.value = 0;
    totalBytes.value = list.reduce((sum, f) => sum + f.size, 0);
    sending.value = list.map((f) => ({ name: f.name, sizeBytes: f.size }));
    progress.value = [];
    await whenConnected(SOCKET_WAIT_MS);
    try {
      const out = await importsApi.uploadLoggerFiles(
        { tankId: id, policy: policy.value, mapping, files: list },
        {
          onProgress: (sent, total) => {
            sentBytes.value = sent;
            totalBytes.value = total;
          },
          onSent: () => {
            phase.value = 'importing';
          },
        },
      );
      results.value = out;
      phase.value = 'done';
      clearFiles();
      void loadHistory();
      // The server saves the mapping of a successful import for the tank; show that it is the saved one now.
      if (out.some((r) => r.status === 'imported') && tankId.value === id) {
        saved.value = { tankId: id, mapping, policy: policy.value, savedAt: new Date().toISOString(), savedBy: session.user?.name ?? '' };
        draftOrigin.value = 'saved';
        draftEdited.value = false;
      }
      return out;
    } catch (e) {
      phase.value = 'idle';
      throw e;
    }
  }

  /** Runs a failed import again; its new outcome replaces the old one in the results and the history. */
  async function retry(importId: number): Promise<LoggerImportDetail> {
    retryingId.value = importId;
    progress.value = progress.value.filter((p) => p.importId !== importId);
    try {
      const detail = await importsApi.retryImport(importId);
      results.value = results.value.some((r) => r.id === importId) ? results.value.map((r) => (r.id === importId ? detail : r)) : [detail, ...results.value];
      history.value = history.value.map((h) => (h.id === importId ? detail : h));
      return detail;
    } finally {
      retryingId.value = null;
    }
  }

  /** The first refused rows of an import from the history, to show beside it. */
  async function openResult(importId: number): Promise<LoggerImportDetail> {
    const detail = await importsApi.fetchImport(importId);
    results.value = [detail, ...results.value.filter((r) => r.id !== importId)];
    return detail;
  }

  /** Hides one result card, or all of them. */
  function dismissResults(importId?: number): void {
    results.value = importId === undefined ? [] : results.value.filter((r) => r.id !== importId);
    if (!results.value.length && !busy.value) phase.value = 'idle';
  }

  /** The chosen tank's recent imports, or the farm's when no tank is chosen. */
  async function loadHistory(): Promise<void> {
    const query = tankId.value !== null ? { tankId: tankId.value } : farmId.value !== null ? { farmId: farmId.value } : null;
    if (!query) return;
    const token = ++historyToken;
    historyStatus.value = 'loading';
    historyError.value = null;
    try {
      const list = await importsApi.fetchImports({ ...query, limit: HISTORY_LIMIT });
      if (token !== historyToken) return;
      history.value = list;
      historyStatus.value = 'ready';
    } catch (e) {
      if (token !== historyToken) return;
      historyError.value = errorMessage(e);
      historyStatus.value = 'error';
    }
  }

  function reset(): void {
    tanksToken++;
    savedToken++;
    historyToken++;
    ownerId = null;
    farmId.value = null;
    tankId.value = null;
    tanks.value = [];
    tanksStatus.value = 'idle';
    tanksError.value = null;
    saved.value = null;
    savedStatus.value = 'idle';
    savedError.value = null;
    draft.value = emptyDraft('UTC');
    draftOrigin.value = 'none';
    draftEdited.value = false;
    policy.value = 'reject-file';
    clearFiles();
    phase.value = 'idle';
    sentBytes.value = 0;
    totalBytes.value = 0;
    sending.value = [];
    progress.value = [];
    results.value = [];
    retryingId.value = null;
    history.value = [];
    historyStatus.value = 'idle';
    historyError.value = null;
  }

  return {
    farmId,
    tankId,
    tanks,
    tanksStatus,
    tanksError,
    farm,
    tank,
    setup,
    farmTimeZone,
    saved,
    savedStatus,
    savedError,
    draft,
    draftOrigin,
    draftEdited,
    policy,
    files,
    filesError,
    previewFile,
    delimiter,
    records,
    header,
    columns,
    built,
    check,
    readyFiles,
    filesBlocked,
    phase,
    sentBytes,
    totalBytes,
    progress,
    fileProgress,
    results,
    retryingId,
    busy,
    history,
    historyStatus,
    historyError,
    start,
    loadTanks,
    selectFarm,
    selectTank,
    loadSaved,
    updateDraft,
    resetDraft,
    addFiles,
    removeFile,
    clearFiles,
    showPreviewOf,
    onProgress,
    listen,
    upload,
    retry,
    openResult,
    dismissResults,
    loadHistory,
    reset,
  };
});
