// Reading one stored logger file through the shared row reader and loading its good rows: for real
// (one transaction per file, the outcome kept on the import record) or as a dry run (the same reading
// and the same load inside a transaction that is rolled back, so the counts are the ones an import
// would have). Plus the bookkeeping for imports cut off by a crash or a lost database.
import { join } from 'node:path';
import { UniqueConstraintError, type Transaction } from 'sequelize';
import { createImportReader, csvParseOptions, refusedFileReason, type ImportMapping, type ImportNotice, type ImportPolicy, type ImportProblem } from '@shared/imports';
import { tankSetupOf } from '@shared/readings';
import type { ImportProgress, ImportStatus } from '@shared/schemas';
import type { AppContext } from '../context';
import { AppError } from '../errors';
import type { Farm, LoggerImport, Tank } from '../models';
import { chooseLayout, csvRecords, READING_BATCH_ROWS } from './import-csv';
import { readingLoader, type LoadSummary } from './readings';
import { readHead } from './upload-checks';

const REJECTION_BATCH_ROWS = 2_000;
/** At most this often a progress event goes to the uploader (plus one at the start and one at the end). */
export const PROGRESS_INTERVAL_MS = 250;
/** Notices an import keeps (and a detail or a dry run carries); the count covers all of them. */
export const NOTICES_KEPT = 100;

/** A file refused as a whole (bad rows under reject-file, empty, a mapped column missing): its transaction rolls back. */
export class FileRefused extends Error {}

export const clip = (s: string, n: number) => (s.length > n ? `${s.slice(0, n - 1)}…` : s);

/** One file to read: where it is, how to read it, into which tank. */
export interface FileToRead {
  filePath: string;
  sizeBytes: number;
  mapping: ImportMapping;
  policy: ImportPolicy;
  tank: Tank;
  farm: Farm;
  /** The import the loaded readings belong to (0 in a dry run, whose rows are rolled back). */
  importId: number;
}

/** What reading a file found; the counts are also known (as far as read) when it was refused. */
export interface FileOutcome {
  delimiter: string;
  rows: number;
  rowsNew: number;
  /** Good rows whose instant an earlier file stored already. */
  rowsDuplicate: number;
  /** Good rows repeating an instant of this file. */
  rowsRepeated: number;
  rejected: number;
  noticeCount: number;
  notices: ImportNotice[];
  timings: Record<string, number>;
}

/** Hooks of one read: refused rows go to `problems` in batches, progress as the file is read. */
export interface ReadHooks {
  problems(batch: ImportProblem[]): Promise<void>;
  progress?(rowsRead: number, bytesRead: number): void;
}

/**
 * Reads the file record by record and streams its good rows into the readings table inside
 * `transaction`. Throws FileRefused (with `partial` counts set) when the file as a whole cannot be
 * imported under its policy; the caller rolls back then.
 */
export async function readFileInto(ctx: AppContext, file: FileToRead, hooks: ReadHooks, transaction: Transaction, partial: Partial<FileOutcome> = {}): Promise<FileOutcome> {
  const { tank, farm, mapping, policy } = file;
  const layout = chooseLayout(await readHead(file.filePath).catch(() => new Uint8Array()), mapping);
  const reader = createImportReader({ mapping, tank: tankSetupOf(tank), nowMs: Date.now(), newline: layout.newline, displayTimeZone: farm.timeZone });
  const { delimiter, newline } = layout;
  const notices: ImportNotice[] = [];
  let rowsGood = 0;
  const started = performance.now();
  const loader = readingLoader(ctx, { organisationId: tank.organisationId, farmId: tank.farmId, tankId: tank.id, calibrationVersion: tank.calibrationVersion, importId: file.importId }, farm.timeZone, transaction);
  let problems: ImportProblem[] = [];
  const flushProblems = async () => {
    if (problems.length) await hooks.problems(problems);
    problems = [];
  };
  const keep = () => Object.assign(partial, { delimiter, rows: reader.counts.rows, rejected: reader.counts.rejected, noticeCount: reader.counts.noticed, notices });

  const source = csvRecords(file.filePath, csvParseOptions(delimiter, newline), READING_BATCH_ROWS);
  let fatal: string | null = null;
  read: for await (const records of source.batches) {
    for (const cells of records) {
      const r = reader.feed(cells);
      if (r.kind === 'reading') {
        rowsGood++;
        if (r.notice && notices.length < NOTICES_KEPT) notices.push(r.notice);
        // Under reject-file the first bad row dooms the file: stop inserting, keep reading to report every bad row.
        if (policy === 'valid-rows' || reader.counts.rejected === 0) {
          const wait = loader.add(r.reading);
          if (wait) await wait;
        }
      } else if (r.kind === 'rejected') {
        problems.push(...r.problems);
        if (problems.length >= REJECTION_BATCH_ROWS) await flushProblems();
      } else if (r.kind === 'fatal') {
        fatal = r.reason;
        break read;
      }
    }
    hooks.progress?.(reader.counts.rows, source.bytesRead());
  }
  await flushProblems();
  keep();
  const end = fatal ? { ok: false as const, reason: fatal } : reader.end();
  if (!end.ok) throw new FileRefused(end.reason);
  const { rows, rejected } = reader.counts;
  if (rowsGood === 0) throw new FileRefused(`None of the ${rows.toLocaleString('en-GB')} rows could be imported; see the refused rows`);
  if (rejected > 0 && policy === 'reject-file') throw new FileRefused(refusedFileReason(rejected, rows));
  const readMs = performance.now() - started;
  const loaded: LoadSummary = await loader.finish();
  const rowsRepeated = reader.repeatedInFile();
  return {
    delimiter,
    rows,
    rowsNew: loaded.rowsNew,
    rowsDuplicate: rowsGood - rowsRepeated - loaded.rowsNew,
    rowsRepeated,
    rejected,
    noticeCount: reader.counts.noticed,
    notices,
    timings: { readMs, waitForDatabaseMs: loaded.waitMs, loadStatementsMs: loaded.loadMs, snapshotsMs: loaded.snapshotsMs },
  };
}

/**
 * Reads the stored file of `rec` and imports it under its policy, updating the record as it goes and
 * pushing progress to `userId`. Never throws for a bad file: the outcome is the record's status.
 */
export async function runImport(ctx: AppContext, rec: LoggerImport, tank: Tank, farm: Farm, userId: number, from: ImportStatus): Promise<void> {
  const { LoggerImport, LoggerImportRejection, TankImportMapping } = ctx.db.models;
  let claimed: number;
  try {
    [claimed] = await LoggerImport.update(
      { status: 'importing', startedAt: new Date(), finishedAt: null, error: null, rowsTotal: 0, rowsNew: 0, rowsDuplicate: 0, rowsRepeated: 0, rowsRejected: 0, noticeCount: 0, notices: null },
      { where: { id: rec.id, status: from } },
    );
  } catch (err) {
    // The unique live-file index: the same bytes were imported into this tank (or are being) under another record.
    if (!(err instanceof UniqueConstraintError)) throw err;
    const live = await liveImportOf(ctx, rec.tankId, rec.sha256);
    throw new AppError(409, 'already_imported', `This file was imported into this tank since${live ? ` (import ${live.id})` : ''}, so it is not run again`);
  }
  if (!claimed) throw new AppError(409, 'import_busy', 'This import is being run already');
  await rec.reload();
  await LoggerImportRejection.destroy({ where: { importId: rec.id } });

  let lastPush = 0;
  let rowsRead = 0;
  let bytesRead = 0;
  const push = (status: ImportStatus, force = false) => {
    const now = Date.now();
    if (!force && now - lastPush < PROGRESS_INTERVAL_MS) return;
    lastPush = now;
    const payload: ImportProgress = { importId: rec.id, rowsRead, bytesRead: Math.min(bytesRead, rec.sizeBytes), totalBytes: rec.sizeBytes, status };
    ctx.events.emit('user-event', { userId, event: 'import:progress', payload });
  };
  push('importing', true);

  const file: FileToRead = { filePath: join(ctx.config.uploadDir, rec.storedName), sizeBytes: rec.sizeBytes, mapping: rec.mapping, policy: rec.policy, tank, farm, importId: rec.id };
  const hooks: ReadHooks = {
    // Outside the file's transaction: the list of refused rows must outlive a rolled-back file.
    problems: async (batch) => {
      await LoggerImportRejection.bulkCreate(
        batch.map((p) => ({ importId: rec.id, line: p.line, field: p.field, columnLabel: clip(p.column, 120), value: clip(p.value, 200), reason: clip(p.reason, 400) })),
      );
    },
    progress: (rows, bytes) => {
      rowsRead = rows;
      bytesRead = bytes;
      push('importing');
    },
  };
  const partial: Partial<FileOutcome> = {};
  const started = performance.now();
  let outcome: FileOutcome | null = null;
  try {
    await ctx.db.sequelize.transaction(async (transaction) => {
      const o = await readFileInto(ctx, file, hooks, transaction, partial);
      await rec.update(
        { status: 'imported', delimiter: o.delimiter, rowsTotal: o.rows, rowsNew: o.rowsNew, rowsDuplicate: o.rowsDuplicate, rowsRepeated: o.rowsRepeated, rowsRejected: o.rejected, noticeCount: o.noticeCount, notices: o.notices, finishedAt: new Date() },
        { transaction },
      );
      await TankImportMapping.upsert({ tankId: tank.id, organisationId: tank.organisationId, mapping: rec.mapping, policy: rec.policy, savedById: rec.uploadedById, savedAt: new Date() }, { transaction });
      outcome = o;
    });
    const o = outcome as FileOutcome | null;
    ctx.logger.info({ importId: rec.id, rows: o?.rows, rowsNew: o?.rowsNew, timings: { ...o?.timings, totalMs: performance.now() - started } }, 'logger import finished');
  } catch (err) {
    try {
      await rec.reload();
      const counts = {
        delimiter: partial.delimiter ?? null,
        rowsTotal: partial.rows ?? 0,
        rowsNew: 0,
        rowsDuplicate: 0,
        rowsRepeated: 0,
        rowsRejected: partial.rejected ?? 0,
        noticeCount: partial.noticeCount ?? 0,
        notices: partial.notices ?? null,
        finishedAt: new Date(),
      };
      if (err instanceof FileRefused) {
        await rec.update({ status: 'rejected', error: clip(err.message, 500), ...counts });
      } else {
        ctx.logger.error({ err, importId: rec.id }, 'logger import failed');
        const why = err instanceof Error ? err.message : String(err);
        await rec.update({ status: 'failed', error: clip(`The import stopped (${why}); nothing from this file was kept. Retry it.`, 500), ...counts });
      }
    } catch (bookkeeping) {
      // The database itself is gone (the file's transaction died with its connection): the record still
      // says importing, so it is marked failed as soon as the database answers again.
      ctx.logger.error({ err, bookkeeping, importId: rec.id }, 'logger import cut off: the database stopped answering');
      markFailedWhenBack(ctx, rec.id, rec.sizeBytes, userId);
      throw new AppError(503, 'database_down', 'The database stopped answering while this file was being imported; nothing from it was kept. It will be marked failed once the database is back, and can then be retried.');
    }
  }
  rowsRead = rec.rowsTotal;
  bytesRead = rec.sizeBytes;
  push(rec.status, true);
  if (rec.status === 'imported' && rec.rowsNew > 0) ctx.events.emit('readings', { organisationId: tank.organisationId, farmIds: [tank.farmId] });
}

/** A dry run's findings: the outcome as an import would have it, the first refused rows and how many problems in all. */
export interface DryRunOutcome {
  status: 'imported' | 'rejected';
  error: string | null;
  outcome: Partial<FileOutcome>;
  problems: ImportProblem[];
  problemCount: number;
}

/**
 * Reads the file exactly as an import would (the same reader, the same load into the readings table)
 * inside a transaction that is always rolled back, so nothing is stored and the counts agree with a
 * later import of the same file, unless other readings arrive in between.
 */
export async function dryRunFile(ctx: AppContext, file: FileToRead, keepProblems: number): Promise<DryRunOutcome> {
  const problems: ImportProblem[] = [];
  let problemCount = 0;
  const hooks: ReadHooks = {
    problems: async (batch) => {
      problemCount += batch.length;
      for (const p of batch) if (problems.length < keepProblems) problems.push(p);
    },
  };
  const partial: Partial<FileOutcome> = {};
  const transaction = await ctx.db.sequelize.transaction();
  try {
    const outcome = await readFileInto(ctx, file, hooks, transaction, partial);
    return { status: 'imported', error: null, outcome, problems, problemCount };
  } catch (err) {
    if (!(err instanceof FileRefused)) throw err;
    return { status: 'rejected', error: clip(err.message, 500), outcome: partial, problems, problemCount };
  } finally {
    await transaction.rollback();
  }
}

/** The live (queued, importing or imported) import of these bytes into this tank, if any. */
export function liveImportOf(ctx: AppContext, tankId: number, sha256: string): Promise<LoggerImport | null> {
  return ctx.db.models.LoggerImport.findOne({ where: { tankId, sha256, status: ['queued', 'importing', 'imported'] }, order: [['id', 'ASC']] });
}

const INTERRUPTED = 'The server stopped while this file was being imported; nothing from it was kept. Retry it.';
const DATABASE_LOST = 'The database stopped answering while this file was being imported; nothing from it was kept. Retry it.';
/** How long a cut-off import is retried for being marked failed; after that the next start-up marks it. */
const MARK_FAILED_FOR_MS = 15 * 60_000;

/**
 * Marks an import failed once the database answers again, trying every few seconds (the timers do not
 * keep the process alive), and tells its uploader. For an import cut off because the database went away.
 */
function markFailedWhenBack(ctx: AppContext, id: number, sizeBytes: number, userId: number): void {
  const until = Date.now() + MARK_FAILED_FOR_MS;
  let delay = 250;
  const attempt = () => {
    ctx.db.models.LoggerImport.update({ status: 'failed', error: DATABASE_LOST, rowsNew: 0, rowsDuplicate: 0, rowsRepeated: 0, finishedAt: new Date() }, { where: { id, status: ['queued', 'importing'] } }).then(
      ([marked]) => {
        if (!marked) return;
        ctx.logger.warn({ importId: id }, 'logger import cut off by the database marked failed');
        ctx.events.emit('user-event', { userId, event: 'import:progress', payload: { importId: id, rowsRead: 0, bytesRead: 0, totalBytes: sizeBytes, status: 'failed' } satisfies ImportProgress });
      },
      () => {
        if (Date.now() > until) return;
        delay = Math.min(delay * 2, 2_000);
        setTimeout(attempt, delay).unref();
      },
    );
  };
  setTimeout(attempt, delay).unref();
}

/**
 * Marks imports left 'queued' or 'importing' by a stopped server as failed (their transaction was rolled
 * back with the connection), so they can be retried. Call once at start-up; returns how many were marked.
 */
export async function recoverInterruptedImports(ctx: AppContext): Promise<number> {
  const [count] = await ctx.db.models.LoggerImport.update(
    { status: 'failed', error: INTERRUPTED, finishedAt: new Date() },
    { where: { status: ['queued', 'importing'] } },
  );
  return count;
}
