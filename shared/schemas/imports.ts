import { z } from 'zod';
import { IMPORT_POLICIES, importMappingSchema, type ImportField, type ImportMapping, type ImportPolicy } from '../imports/index';
import { idSchema } from './common';
import type { CheckProblem } from '../check-problems';

/** Where a logger import stands: waiting, running, stored, refused, stopped by an error, or a file imported already. */
export const IMPORT_STATUSES = ['queued', 'importing', 'imported', 'rejected', 'failed', 'duplicate'] as const;
/** An import status. */
export type ImportStatus = (typeof IMPORT_STATUSES)[number];

/** The mapping form field: JSON text in a multipart upload, or an object in a JSON body. */
const mappingField = z
  .unknown()
  .transform((v, ctx) => {
    if (typeof v !== 'string') return v;
    try {
      return JSON.parse(v) as unknown;
    } catch {
      ctx.addIssue({ code: 'custom', message: 'must be the column mapping as JSON text' });
      return z.NEVER;
    }
  })
  .pipe(importMappingSchema);

/** The text fields of POST /api/imports (multipart/form-data, beside the files): tank, policy and mapping JSON. */
export const importUploadSchema = z.object({
  tankId: idSchema,
  policy: z.enum(IMPORT_POLICIES, { error: "must be 'reject-file' or 'valid-rows'" }).default('reject-file'),
  mapping: mappingField,
});
/** The parsed text fields of an upload. */
export type ImportUploadInput = z.infer<typeof importUploadSchema>;

/** Query of POST /api/imports: `dryRun=true` reads and checks every row of every file but stores nothing. */
export const importUploadQuerySchema = z.object({
  dryRun: z.enum(['true', 'false'], { error: "must be 'true' or 'false'" }).optional().transform((v) => v === 'true'),
});

/** Query of GET /api/imports: one tank's or one farm's history, newest first. */
export const importListQuerySchema = z.object({
  tankId: idSchema.optional(),
  farmId: idSchema.optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
});
/** A parsed history query. */
export type ImportListQuery = z.infer<typeof importListQuerySchema>;

/** One refused row (or one problem of it) as stored and downloaded: 1-based physical line of the file. */
export interface ImportRejectedRow {
  line: number;
  field: ImportField;
  column: string;
  value: string;
  reason: string;
  /** The reason as a code of message area `checks` for screens in other languages: in a dry run's answer, not in stored rows. */
  problem?: CheckProblem;
}

/** A logger import as the API returns it; sizes in bytes, counts in rows, times ISO 8601 UTC. */
export interface LoggerImport {
  id: number;
  farmId: number;
  tankId: number;
  tankName: string;
  tankCode: string;
  uploadedById: number | null;
  uploadedBy: string;
  /** The name the browser gave the file: a label only, never a path on the server. */
  originalName: string;
  sizeBytes: number;
  sha256: string;
  mapping: ImportMapping;
  policy: ImportPolicy;
  status: ImportStatus;
  /** The field separator used ("," ";" or "\t"), null before the file was read. */
  delimiter: string | null;
  /** Data rows in the file (blank lines and the header row not counted). */
  rowsTotal: number;
  /** Rows stored as new readings. */
  rowsNew: number;
  /** Good rows whose instant this tank already had a logger reading for from an earlier file (nothing added). */
  rowsDuplicate: number;
  /** Good rows repeating an instant of an earlier row of the same file (stored once). */
  rowsRepeated: number;
  /** Rows refused, each with at least one problem. */
  rowsRejected: number;
  /** Rows read with a notice (a local time that happens twice, read by the order of the rows). */
  noticeCount: number;
  /** Why the file was rejected or failed, or what a duplicate repeats; null when imported cleanly. */
  error: string | null;
  /** For a duplicate: the earlier import of the same file to the same tank. */
  duplicateOfId: number | null;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
}

/** A row read with a remark: its 1-based physical line, the column, the cell text and the remark. */
export interface ImportNoticeRow {
  line: number;
  field: ImportField;
  column: string;
  value: string;
  note: string;
  /** The note as a code of message area `checks`: absent from notices stored before codes were kept. */
  problem?: CheckProblem;
}

/** One import with the first refused rows (the full list is GET /api/imports/:id/rejected.csv) and the first notices. */
export interface LoggerImportDetail extends LoggerImport {
  rejectedPreview: ImportRejectedRow[];
  /** How many problems are stored in all (a row may have more than one). */
  rejectedProblems: number;
  notices: ImportNoticeRow[];
}

/** What importing one file would do, from a dry run over every row of it (POST /api/imports?dryRun=true); nothing is stored. */
export interface ImportDryRun {
  originalName: string;
  sizeBytes: number;
  /** What the import would end as: imported, rejected (refused as a whole) or duplicate (this exact file is in already). */
  status: Extract<ImportStatus, 'imported' | 'rejected' | 'duplicate'>;
  delimiter: string | null;
  rowsTotal: number;
  rowsNew: number;
  rowsDuplicate: number;
  rowsRepeated: number;
  rowsRejected: number;
  noticeCount: number;
  error: string | null;
  duplicateOfId: number | null;
  rejectedPreview: ImportRejectedRow[];
  rejectedProblems: number;
  notices: ImportNoticeRow[];
}

/** A person who may change a tank's setup (its sensor height, say): the organisation's owners and managers. */
export interface TankEditor {
  name: string;
  role: 'owner' | 'manager';
}

/** GET /api/tanks/:id/import-mapping: the mapping the last successful import saved (null before the first), and who may change the tank's setup. */
export interface TankImportSetup {
  saved: SavedImportMapping | null;
  tankEditors: TankEditor[];
}

/** Payload of the socket.io event 'import:progress' sent to the uploader while a file is read, and once at the end. */
export interface ImportProgress {
  importId: number;
  rowsRead: number;
  bytesRead: number;
  totalBytes: number;
  status: ImportStatus;
}

/** The mapping saved for a tank by its last successful import. */
export interface SavedImportMapping {
  tankId: number;
  mapping: ImportMapping;
  policy: ImportPolicy;
  savedAt: string;
  savedBy: string;
}
