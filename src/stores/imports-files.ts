// The files chosen on the Logger files screen: each one's first bytes read and checked, and which one
// the preview shows. A piece of the imports store (src/stores/imports.ts), not a store of its own.
import { computed, ref, shallowRef } from 'vue';
import * as importsApi from '@/api/imports';
import { errorMessage } from '@/api/http';
import { formatBytes } from '@/components/imports/importLabels';
import { i18n } from '@/i18n';
import { readFileHead, type FileHead } from '@/components/imports/importPreview';

/** A file picked for upload, with its first bytes once read and why it cannot go, if it cannot. */
export interface ChosenFile {
  key: string;
  file: File;
  head: FileHead | null;
  problem: string | null;
}

const fileKey = (f: File) => `${f.name}|${f.size}|${f.lastModified}`;

/** The chosen files and their preview; `afterRead` runs once newly added files have been read. */
export function useChosenFiles(afterRead: () => void) {
  const files = shallowRef<ChosenFile[]>([]);
  const filesError = ref<string | null>(null);
  const previewKey = ref<string | null>(null);
  const previewFile = computed(() => files.value.find((f) => f.key === previewKey.value && f.head && !f.problem) ?? files.value.find((f) => f.head && !f.problem) ?? null);
  const readyFiles = computed(() => files.value.filter((f) => f.head && !f.problem));
  const filesBlocked = computed(() => !!filesError.value || files.value.some((f) => f.problem || !f.head));

  function checkCount(list: ChosenFile[]): void {
    filesError.value =
      list.length > importsApi.MAX_FILES_PER_UPLOAD ? i18n.global.t('imports.files.tooMany', { max: importsApi.MAX_FILES_PER_UPLOAD, extra: list.length - importsApi.MAX_FILES_PER_UPLOAD }) : null;
  }

  function replaceFile(key: string, change: Partial<ChosenFile>): void {
    files.value = files.value.map((f) => (f.key === key ? { ...f, ...change } : f));
  }

  /** Adds files to the upload; each is checked for size and content, and the first good one previewed. */
  async function addFiles(picked: readonly File[]): Promise<void> {
    const known = new Set(files.value.map((f) => f.key));
    const added: ChosenFile[] = [];
    for (const file of picked) {
      const key = fileKey(file);
      if (known.has(key)) continue;
      known.add(key);
      let problem: string | null = null;
      if (file.size === 0) problem = i18n.global.t('imports.files.empty');
      else if (file.size > importsApi.UPLOAD_MAX_BYTES) problem = i18n.global.t('imports.files.tooBig', { size: formatBytes(file.size), limit: formatBytes(importsApi.UPLOAD_MAX_BYTES) });
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
            replaceFile(f.key, { problem: i18n.global.t('imports.files.unreadable', { error: errorMessage(e) }) });
          }
        }),
    );
    afterRead();
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

  return { files, filesError, previewFile, readyFiles, filesBlocked, addFiles, removeFile, clearFiles, showPreviewOf };
}
