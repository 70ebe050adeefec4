import { computed, ref, shallowRef } from 'vue';
import { defineStore } from 'pinia';
import { useLocalStorage } from '@vueuse/core';
import type { ImportMapping, ImportPolicy } from '@shared/imports';
import { tankSetupOf } from '@shared/readings';
import type { SavedImportMapping, Tank, TankEditor } from '@shared/schemas';
import * as importsApi from '@/api/imports';
import * as tanksApi from '@/api/tanks';
import { errorMessage } from '@/api/http';
import { i18n } from '@/i18n';
import { buildMapping, columnOptions, draftFromMapping, emptyDraft, guessDraft, rebaseColumn, unitsFor, type MappingDraft } from '@/components/imports/importMapping';
import { checkPreview, previewRecords, resolveDelimiter, uncheckedRows, type PreviewCheck } from '@/components/imports/importPreview';
import { useFarmsStore, type LoadStatus } from './farms';
import { useDryRun } from './imports-dry-run';
import { useChosenFiles } from './imports-files';
import { useImportUpload } from './imports-upload';
import { useSessionStore } from './session';

export type { ChosenFile } from './imports-files';
export type { FileProgress, UploadPhase } from './imports-upload';

const storageKey = (userId: number) => `brimstock.imports.target.${userId}`;

/**
 * Logger file imports: the farm and tank, the column mapping, and (from the pieces beside this file)
 * the chosen files, the server's dry run of the previewed one, the upload with its results and the history.
 */
export const useImportsStore = defineStore('imports', () => {
  const farms = useFarmsStore();
  const session = useSessionStore();
  let ownerId: number | null = null;
  // The farm and tank each person used last, kept on this device (under their own key, so not shown to another).
  // A full or blocked store just means the choice is not remembered.
  const ownerKey = ref<string>(storageKey(0));
  const lastTarget = useLocalStorage<{ farmId?: unknown; tankId?: unknown }>(ownerKey, {}, { flush: 'sync', writeDefaults: false, onError: () => undefined });

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
  /** Owners and managers may change a tank's setup (PATCH /api/tanks/:id); others are told whom to ask. */
  const canEditTank = computed(() => session.hasRole('owner', 'manager'));
  const tankEditors = shallowRef<TankEditor[]>([]);

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

  // ---- files and the browser's look at the first lines ----
  const chosen = useChosenFiles(() => guessFromPreview());
  const { files, previewFile, readyFiles } = chosen;
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
    return checkPreview(records.value, built.value.mapping, setup.value, Date.now(), farmTimeZone.value);
  });

  // ---- the server's dry run of the previewed file, and the upload ----
  const dryRun = useDryRun({
    tankId,
    file: computed(() => previewFile.value?.file ?? null),
    mapping: computed(() => (built.value.ok ? built.value.mapping : null)),
    policy,
  });
  const sending = useImportUpload({
    farmId,
    tankId,
    policy,
    readyFiles,
    clearFiles: chosen.clearFiles,
    onSaved: (id: number, mapping: ImportMapping) => {
      // The server saves the mapping of a successful import for the tank; show that it is the saved one now.
      saved.value = { tankId: id, mapping, policy: policy.value, savedAt: new Date().toISOString(), savedBy: session.user?.name ?? '' };
      draftOrigin.value = 'saved';
      draftEdited.value = false;
    },
  });

  let tanksToken = 0;
  let savedToken = 0;

  function remember(): void {
    if (ownerId === null) return;
    lastTarget.value = { farmId: farmId.value, tankId: tankId.value };
  }

  function remembered(): { farmId?: number; tankId?: number } {
    if (ownerId === null) return {};
    const value = lastTarget.value;
    return { farmId: typeof value.farmId === 'number' ? value.farmId : undefined, tankId: typeof value.tankId === 'number' ? value.tankId : undefined };
  }

  /** A fresh draft for the chosen farm, guessed from the previewed file when there is one. */
  function freshDraft(): void {
    draftEdited.value = false;
    draft.value = emptyDraft(farmTimeZone.value);
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
    // The lists of another person are already gone (src/stores/plugins/forgetOnUserChange.ts); this picks their remembered choice.
    ownerId = userId;
    ownerKey.value = storageKey(userId ?? 0);
    await farms.ensureLoaded();
    const active = farms.activeFarms;
    if (wanted.farmId === undefined && wanted.tankId === undefined && farmId.value !== null && active.some((f) => f.id === farmId.value)) {
      if (tanksStatus.value === 'error') await loadTanks();
      // Someone may have imported meanwhile (another device, a colleague).
      void sending.loadHistory();
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
      sending.clearHistory();
    }
    remember();
    await loadTanks(preferTankId);
    // With a tank picked its history is loading already; otherwise show the farm's.
    if (tankId.value === null) void sending.loadHistory();
  }

  /** Chooses the tank: its saved mapping fills the form, and its history is shown. */
  async function selectTank(id: number): Promise<void> {
    tankId.value = id;
    remember();
    void sending.loadHistory();
    await loadSaved();
  }

  /** The tank's saved mapping (a tank without one answers null, not an error) and who may change its setup. */
  async function loadSaved(): Promise<void> {
    const id = tankId.value;
    if (id === null) return;
    const token = ++savedToken;
    savedStatus.value = 'loading';
    savedError.value = null;
    try {
      const found = await importsApi.fetchImportSetup(id);
      if (token !== savedToken) return;
      saved.value = found.saved;
      tankEditors.value = found.tankEditors;
      savedStatus.value = 'ready';
      if (found.saved) {
        draft.value = draftFromMapping(found.saved.mapping, farmTimeZone.value);
        policy.value = found.saved.policy;
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

  /**
   * Keeps the ultrasonic sensor's height (mm above the tank floor) on the chosen tank, for an owner or
   * manager importing distances. Throws the ApiError of a refused change (its field is sensorHeightMm).
   */
  async function saveSensorHeight(sensorHeightMm: number): Promise<Tank> {
    const id = tankId.value;
    if (id === null) throw new Error(i18n.global.t('imports.go.chooseTank'));
    const updated = await tanksApi.updateTank(id, { sensorHeightMm });
    tanks.value = tanks.value.map((t) => (t.id === updated.id ? updated : t));
    return updated;
  }

  /** Changes part of the form; keeps the unit fitting the value kind and the columns pointing at the same place. */
  function updateDraft(patch: Partial<MappingDraft>): void {
    const next = { ...draft.value, ...patch };
    if (patch.valueKind && !unitsFor(next.valueKind).includes(next.valueUnit)) next.valueUnit = next.valueKind === 'pressure' ? 'kPa' : 'mm';
    if (patch.hasHeader !== undefined && patch.hasHeader !== draft.value.hasHeader) {
      const names = firstRecord.value ? firstRecord.value.map((c) => c.trim()) : null;
      for (const key of ['timestampColumn', 'timeColumn', 'valueColumn', 'temperatureColumn'] as const) next[key] = rebaseColumn(draft.value[key], names, next.hasHeader, width.value);
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

  /** Adds files to the upload; a new batch after results goes back to the form (the old results stay until it is sent). */
  async function addFiles(picked: readonly File[]): Promise<void> {
    if (sending.phase.value === 'done') sending.phase.value = 'idle';
    await chosen.addFiles(picked);
  }

  function reset(): void {
    tanksToken++;
    savedToken++;
    ownerId = null;
    farmId.value = null;
    tankId.value = null;
    tanks.value = [];
    tanksStatus.value = 'idle';
    tanksError.value = null;
    tankEditors.value = [];
    saved.value = null;
    savedStatus.value = 'idle';
    savedError.value = null;
    draft.value = emptyDraft('UTC');
    draftOrigin.value = 'none';
    draftEdited.value = false;
    policy.value = 'reject-file';
    chosen.clearFiles();
    sending.reset();
    dryRun.reset();
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
    canEditTank,
    tankEditors,
    saved,
    savedStatus,
    savedError,
    draft,
    draftOrigin,
    draftEdited,
    policy,
    files,
    filesError: chosen.filesError,
    previewFile,
    delimiter,
    records,
    header,
    columns,
    built,
    check,
    readyFiles,
    filesBlocked: chosen.filesBlocked,
    dryRunStatus: dryRun.status,
    dryRunResult: dryRun.result,
    dryRunError: dryRun.error,
    dryRunFile: dryRun.resultFile,
    refreshDryRun: dryRun.refresh,
    phase: sending.phase,
    sentBytes: sending.sentBytes,
    totalBytes: sending.totalBytes,
    progress: sending.progress,
    fileProgress: sending.fileProgress,
    results: sending.results,
    retryingId: sending.retryingId,
    busy: sending.busy,
    history: sending.history,
    historyStatus: sending.historyStatus,
    historyError: sending.historyError,
    start,
    loadTanks,
    selectFarm,
    selectTank,
    loadSaved,
    saveSensorHeight,
    updateDraft,
    resetDraft,
    addFiles,
    removeFile: chosen.removeFile,
    clearFiles: chosen.clearFiles,
    showPreviewOf: chosen.showPreviewOf,
    onProgress: sending.onProgress,
    listen: sending.listen,
    upload: sending.upload,
    retry: sending.retry,
    openResult: sending.openResult,
    dismissResults: sending.dismissResults,
    loadHistory: sending.loadHistory,
    reset,
  };
});
