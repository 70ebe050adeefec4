// The server's dry run of the previewed file: every row read and checked as the import will read it,
// nothing stored. It runs again (after a short pause, the one before cancelled) whenever the file, the
// mapping, the policy or the tank changes, so the counts and line messages the preview shows are the
// ones the import will give. A piece of the imports store (src/stores/imports.ts).
import { ref, shallowRef, watch, type Ref } from 'vue';
import type { ImportMapping, ImportPolicy } from '@shared/imports';
import type { ImportDryRun } from '@shared/schemas';
import * as importsApi from '@/api/imports';
import { errorMessage } from '@/api/http';
import type { LoadStatus } from './farms';

/** How long the form must stay unchanged before the file is sent for a dry run, ms. */
export const DRY_RUN_PAUSE_MS = 400;

/** What the dry run needs: the tank, the file, the mapping (when complete) and the policy. */
export interface DryRunInputs {
  tankId: Ref<number | null>;
  file: Ref<File | null>;
  mapping: Ref<ImportMapping | null>;
  policy: Ref<ImportPolicy>;
}

/** The dry run's state; `refresh` runs it at once (after an import, say). */
export function useDryRun(inputs: DryRunInputs) {
  const status = ref<LoadStatus>('idle');
  const result = shallowRef<ImportDryRun | null>(null);
  const error = ref<string | null>(null);
  /** The file the result is about (a result for another file is never shown). */
  const resultFile = shallowRef<File | null>(null);
  let timer: ReturnType<typeof setTimeout> | null = null;
  let running: AbortController | null = null;

  const cancel = () => {
    if (timer) clearTimeout(timer);
    timer = null;
    running?.abort();
    running = null;
  };

  async function run(): Promise<void> {
    cancel();
    const tankId = inputs.tankId.value;
    const file = inputs.file.value;
    const mapping = inputs.mapping.value;
    if (tankId === null || !file || !mapping) {
      status.value = 'idle';
      result.value = null;
      error.value = null;
      resultFile.value = null;
      return;
    }
    const controller = new AbortController();
    running = controller;
    status.value = 'loading';
    error.value = null;
    try {
      const [found] = await importsApi.dryRunLoggerFiles({ tankId, policy: inputs.policy.value, mapping, files: [file] }, controller.signal);
      if (running !== controller) return;
      result.value = found ?? null;
      resultFile.value = file;
      status.value = 'ready';
    } catch (e) {
      if (running !== controller) return;
      result.value = null;
      error.value = errorMessage(e);
      status.value = 'error';
    } finally {
      if (running === controller) running = null;
    }
  }

  watch(
    () => [inputs.tankId.value, inputs.file.value, inputs.mapping.value ? JSON.stringify(inputs.mapping.value) : null, inputs.policy.value] as const,
    () => {
      cancel();
      if (inputs.tankId.value === null || !inputs.file.value || !inputs.mapping.value) return void run();
      status.value = 'loading';
      timer = setTimeout(() => void run(), DRY_RUN_PAUSE_MS);
    },
  );

  function reset(): void {
    cancel();
    status.value = 'idle';
    result.value = null;
    error.value = null;
    resultFile.value = null;
  }

  return { status, result, error, resultFile, refresh: run, reset };
}
