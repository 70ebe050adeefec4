import type { ImportMapping, ImportPolicy } from '@shared/imports';
import type { ImportDryRun, LoggerImport, LoggerImportDetail, SavedImportMapping, TankImportSetup } from '@shared/schemas';
import { http, upload, type UploadOptions } from './http';

/** Largest file one upload may carry, in bytes: the server's default (UPLOAD_MAX_MB=200, in MiB). */
export const UPLOAD_MAX_BYTES = 200 * 1024 * 1024;
/** Files one upload may carry (the server refuses more with 413 too_many_files). */
export const MAX_FILES_PER_UPLOAD = 20;

export interface ImportUpload {
  tankId: number;
  policy: ImportPolicy;
  mapping: ImportMapping;
  files: readonly File[];
}

/**
 * Sends logger files for one tank. The server reads every file before it answers, so the promise
 * settles when all are imported (or refused); progress of that arrives over socket.io meanwhile.
 */
export async function uploadLoggerFiles(input: ImportUpload, options: UploadOptions = {}): Promise<LoggerImportDetail[]> {
  const form = new FormData();
  // Text fields first: they are small, and a server reading the stream meets them before the files.
  form.append('tankId', String(input.tankId));
  form.append('policy', input.policy);
  form.append('mapping', JSON.stringify(input.mapping));
  for (const file of input.files) form.append('files', file, file.name);
  const body = await upload<{ imports: LoggerImportDetail[] }>('/api/imports', form, options);
  return body.imports;
}

/**
 * Sends logger files for a dry run: the server reads and checks every row as the import would and
 * stores nothing; the answer is what the import would do with each file. `signal` cancels it.
 */
export async function dryRunLoggerFiles(input: ImportUpload, signal?: AbortSignal): Promise<ImportDryRun[]> {
  const form = new FormData();
  form.append('tankId', String(input.tankId));
  form.append('policy', input.policy);
  form.append('mapping', JSON.stringify(input.mapping));
  for (const file of input.files) form.append('files', file, file.name);
  const body = await upload<{ imports: ImportDryRun[] }>('/api/imports?dryRun=true', form, { signal });
  return body.imports;
}

/** Recent imports the user may see, newest first: one tank's, or one farm's. */
export function fetchImports(query: { farmId?: number; tankId?: number; limit?: number } = {}): Promise<LoggerImport[]> {
  return http.get<LoggerImport[]>('/api/imports', { query });
}

/** One import with its first refused rows. */
export function fetchImport(importId: number): Promise<LoggerImportDetail> {
  return http.get<LoggerImportDetail>(`/api/imports/${importId}`);
}

/** Runs a failed import again from the file the server kept. */
export function retryImport(importId: number): Promise<LoggerImportDetail> {
  return http.post<LoggerImportDetail>(`/api/imports/${importId}/retry`);
}

/** What the import form needs of a tank: the mapping its last successful import saved (null before the first), and who may change its setup. */
export function fetchImportSetup(tankId: number): Promise<TankImportSetup> {
  return http.get<TankImportSetup>(`/api/tanks/${tankId}/import-mapping`);
}

/** The column mapping the tank's last successful import saved, or null when it has none yet. */
export async function fetchSavedMapping(tankId: number): Promise<SavedImportMapping | null> {
  return (await fetchImportSetup(tankId)).saved;
}

/** The address of an import's refused rows as a CSV download (every problem, not just the first hundred). */
export function rejectedRowsCsvUrl(importId: number): string {
  return `/api/imports/${importId}/rejected.csv`;
}
