// Sending logger files and what came of them: the upload with its progress (bytes out, then rows read
// as the server reports them), the results, retries, and the tank's or farm's recent imports. A piece
// of the imports store (src/stores/imports.ts).
import { computed, ref, shallowRef, type Ref } from 'vue';
import type { ImportMapping, ImportPolicy } from '@shared/imports';
import type { ImportProgress, LoggerImport, LoggerImportDetail } from '@shared/schemas';
import * as importsApi from '@/api/imports';
import { errorMessage } from '@/api/http';
import { onServerEvent, whenConnected } from '@/api/socket';
import { i18n } from '@/i18n';
import type { LoadStatus } from './farms';

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

/** What the upload needs from the rest of the store. */
export interface UploadInputs {
  farmId: Ref<number | null>;
  tankId: Ref<number | null>;
  policy: Ref<ImportPolicy>;
  readyFiles: Ref<readonly { file: File }[]>;
  clearFiles: () => void;
  /** A file of the upload was imported with `mapping`: the server saved it for the tank. */
  onSaved: (tankId: number, mapping: ImportMapping) => void;
}

export function useImportUpload(inputs: UploadInputs) {
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
  const history = shallowRef<LoggerImport[]>([]);
  const historyStatus = ref<LoadStatus>('idle');
  const historyError = ref<string | null>(null);
  let historyToken = 0;

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
    const id = inputs.tankId.value;
    if (id === null) throw new Error(i18n.global.t('imports.go.chooseTank'));
    const list = inputs.readyFiles.value.map((f) => f.file);
    if (!list.length) throw new Error(i18n.global.t('imports.go.chooseCsv'));
    phase.value = 'uploading';
    sentBytes.value = 0;
    totalBytes.value = list.reduce((sum, f) => sum + f.size, 0);
    sending.value = list.map((f) => ({ name: f.name, sizeBytes: f.size }));
    progress.value = [];
    await whenConnected(SOCKET_WAIT_MS);
    try {
      const out = await importsApi.uploadLoggerFiles(
        { tankId: id, policy: inputs.policy.value, mapping, files: list },
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
      inputs.clearFiles();
      void loadHistory();
      if (out.some((r) => r.status === 'imported') && inputs.tankId.value === id) inputs.onSaved(id, mapping);
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
    const query = inputs.tankId.value !== null ? { tankId: inputs.tankId.value } : inputs.farmId.value !== null ? { farmId: inputs.farmId.value } : null;
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

  function clearHistory(): void {
    historyToken++;
    history.value = [];
    historyStatus.value = 'idle';
    historyError.value = null;
  }

  function reset(): void {
    phase.value = 'idle';
    sentBytes.value = 0;
    totalBytes.value = 0;
    sending.value = [];
    progress.value = [];
    results.value = [];
    retryingId.value = null;
    clearHistory();
  }

  return {
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
    onProgress,
    listen,
    upload,
    retry,
    openResult,
    dismissResults,
    loadHistory,
    clearHistory,
    reset,
  };
}
