// Logger file imports: each uploaded file is checked by content, hashed, and then read again from
// disk as a stream, record by record, through the shared row reader. Good rows stream in chunks through
// the bulk insert path (readingLoader) inside ONE transaction per file, so a file is all-or-nothing
// and memory stays bounded however long it is. Refused rows are stored apart (outside that
// transaction) so they survive a rolled-back file and can be downloaded.
import { createHash, randomUUID } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { rm, stat } from 'node:fs/promises';
import { join } from 'node:path';
import Papa from 'papaparse';
import { Op, UniqueConstraintError, type Transaction, type WhereOptions } from 'sequelize';
import {
  createImportReader,
  csvParseOptions,
  delimiterCandidates,
  mappingProblem,
  stripBom,
  type FieldDelimiter,
  type ImportMapping,
  type ImportProblem,
  type LineBreak,
} from '@shared/imports';
import type { ImportListQuery, ImportProgress, ImportStatus, ImportUploadInput, LoggerImport as ImportDto, LoggerImportDetail, SavedImportMapping, SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { AppError, forbidden, notFound } from '../errors';
import { assertFarmAccess } from '../middleware/access';
import type { Farm, LoggerImport, Tank } from '../models';
import { readingLoader, tankSetup } from './readings';
import { assertUploadsReadable, readHead } from './upload-checks';
import { tankFor } from './tanks';

/** Records per parsed batch: the file is paused while a batch is checked, converted and queued for loading. */
export const READING_BATCH_ROWS = 2_500;
const REJECTION_BATCH_ROWS = 2_000;
/** At most this often a progress event goes to the uploader (plus one at the start and one at the end). */
export const PROGRESS_INTERVAL_MS = 250;
/** Refused-row problems a detail response carries; the CSV download has all of them. */
const REJECTED_PREVIEW = 100;

/** A file multer stored: where it is, the generated name, and the label the browser gave it. */
export interface UploadedFile {
  path: string;
  storedName: string;
  originalName: string;
  sizeBytes: number;
}

/** A generated stored name (the upload's own name is never part of a path). */
export const storedNameFor = () => `${randomUUID()}.csv`;

/** A name from the browser made safe to show: no control characters, at most 255 characters. */
export function labelOf(originalName: string): string {
  const clean = originalName.replace(/[\u0000-\u001f\u007f]/g, '').trim();
  return (clean || 'upload.csv').slice(0, 255);
}

/** Deletes uploaded files that no import refers to. */
export async function discardUploads(files: UploadedFile[]): Promise<void> {
  await Promise.all(files.map((f) => rm(f.path, { force: true })));
}

async function sha256Of(path: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(path)) hash.update(chunk as Buffer);
  return hash.digest('hex');
}

/**
 * The field separator and record separator to read the file with: the mapping's separator or papaparse's
 * guess among the allowed ones, and papaparse's guess of the line ending, both from the first bytes. Both
 * are then given to the streaming parse, so every chunk is read alike and line numbers can be counted.
 */
function chooseLayout(head: Uint8Array, mapping: ImportMapping): { delimiter: FieldDelimiter; newline: LineBreak } {
  const candidates = delimiterCandidates(mapping);
  const text = stripBom(Buffer.from(head).toString('utf8'));
  const meta = Papa.parse<string[]>(text, { ...(candidates.length === 1 ? { delimiter: candidates[0] } : { delimitersToGuess: candidates }), preview: 50, skipEmptyLines: 'greedy' }).meta;
  const delimiter = candidates.includes(meta.delimiter as FieldDelimiter) ? (meta.delimiter as FieldDelimiter) : candidates[0];
  const newline = (['\n', '\r\n', '\r'] as const).find((n) => n === meta.linebreak) ?? '\n';
  return { delimiter, newline };
}

/**
 * The records of a CSV file in batches of up to `size`, read as a stream: papaparse is paused (and the
 * file with it) while a batch is being stored, so at most about one batch and one read chunk are held.
 */
function csvRecords(path: string, options: ReturnType<typeof csvParseOptions>, size: number) {
  // utf8 on the read stream: its decoder keeps multi-byte characters whole across chunk boundaries.
  const input = createReadStream(path, { encoding: 'utf8', highWaterMark: 256 * 1024 });
  async function* batches(): AsyncGenerator<string[][]> {
    let batch: string[][] = [];
    let handle: Papa.Parser | null = null;
    let held = false;
    let done = false;
    let failure: unknown = null;
    let wake: (() => void) | null = null;
    const signal = () => {
      const w = wake;
      wake = null;
      w?.();
    };
    Papa.parse<string[]>(input, {
      ...options,
      step: (r, p) => {
        handle = p;
        batch.push(r.data);
        if (batch.length >= size) {
          held = true;
          p.pause();
          input.pause();
          signal();
        }
      },
      complete: () => {
        done = true;
        signal();
      },
      error: (err) => {
        failure = err;
        done = true;
        signal();
      },
    });
    try {
      for (;;) {
        if (failure) throw failure;
        if (batch.length >= size || (done && batch.length)) {
          const out = batch;
          batch = [];
          yield out;
          if (held) {
            held = false;
            (handle as Papa.Parser | null)?.resume();
            // Resuming may have filled the next batch at once; the file stays paused then.
            if (!held) input.resume();
          }
          continue;
        }
        if (done) return;
        await new Promise<void>((r) => (wake = r));
      }
    } finally {
      if (!done) (handle as Papa.Parser | null)?.abort();
      input.destroy();
    }
  }
  return { batches: batches(), bytesRead: () => input.bytesRead };
}

const iso = (d: Date | null) => (d ? d.toISOString() : null);

async function toDtos(ctx: AppContext, rows: LoggerImport[]): Promise<ImportDto[]> {
  const { Tank, User } = ctx.db.models;
  const tankIds = [...new Set(rows.map((r) => r.tankId))];
  const userIds = [...new Set(rows.map((r) => r.uploadedById).filter((v): v is number => v !== null))];
  const tanks = new Map((await Tank.findAll({ where: { id: tankIds }, attributes: ['id', 'name', 'code'] })).map((t) => [t.id, t]));
  const users = new Map((await User.findAll({ where: { id: userIds }, attributes: ['id', 'name'] })).map((u) => [u.id, u.name]));
  return rows.map((r) => ({
    id: r.id,
    farmId: r.farmId,
    tankId: r.tankId,
    tankName: tanks.get(r.tankId)?.name ?? '',
    tankCode: tanks.get(r.tankId)?.code ?? '',
    uploadedById: r.uploadedById,
    uploadedBy: (r.uploadedById && users.get(r.uploadedById)) || '',
    originalName: r.originalName,
    sizeBytes: Number(r.sizeBytes),
    sha256: r.sha256,
    mapping: r.mapping,
    policy: r.policy,
    status: r.status,
    delimiter: r.delimiter,
    rowsTotal: r.rowsTotal,
    rowsNew: r.rowsNew,
    rowsDuplicate: r.rowsDuplicate,
    rowsRejected: r.rowsRejected,
    error: r.error,
    duplicateOfId: r.duplicateOfId,
    createdAt: r.createdAt.toISOString(),
    startedAt: iso(r.startedAt),
    finishedAt: iso(r.finishedAt),
  }));
}

/** An import's problems come from the file it repeats when it is a duplicate. */
const problemsSourceId = (r: LoggerImport) => r.duplicateOfId ?? r.id;

async function toDetail(ctx: AppContext, r: LoggerImport): Promise<LoggerImportDetail> {
  const { LoggerImportRejection } = ctx.db.models;
  const sourceId = problemsSourceId(r);
  const [dto] = await toDtos(ctx, [r]);
  const preview = await LoggerImportRejection.findAll({ where: { importId: sourceId }, order: [['id', 'ASC']], limit: REJECTED_PREVIEW });
  return {
    ...dto,
    rejectedPreview: preview.map((p) => ({ line: p.line, field: p.field, column: p.columnLabel, value: p.value, reason: p.reason })),
    rejectedProblems: await LoggerImportRejection.count({ where: { importId: sourceId } }),
  };
}

/** An import the actor may see: 404 outside the organisation, 403 on a farm not granted. */
async function importFor(ctx: AppContext, actor: SessionUser, id: number): Promise<LoggerImport> {
  const rec = await ctx.db.models.LoggerImport.findOne({ where: { id, organisationId: actor.organisationId } });
  if (!rec) throw notFound('Import');
  if (!actor.farmIds.includes(rec.farmId)) throw forbidden('You do not have access to this import');
  return rec;
}

async function writableTank(ctx: AppContext, actor: SessionUser, tankId: number): Promise<{ tank: Tank; farm: Farm }> {
  const tank = await tankFor(ctx, actor, tankId);
  const farm = (await ctx.db.models.Farm.findByPk(tank.farmId))!;
  if (farm.archivedAt) throw new AppError(409, 'farm_archived', 'This farm is archived; restore it before importing readings');
  if (tank.archivedAt) throw new AppError(409, 'tank_archived', 'This tank is archived; restore it before importing readings');
  return { tank, farm };
}

function assertMappingFits(mapping: ImportMapping, tank: Tank) {
  const problem = mappingProblem(mapping, tankSetup(tank));
  if (problem) throw new AppError(422, 'mapping_unfit', problem.message, problem.field);
}

/** A file refused as a whole (bad rows under reject-file, empty, a mapped column missing): its transaction rolls back. */
class FileRefused extends Error {}

const clip = (s: string, n: number) => (s.length > n ? `${s.slice(0, n - 1)}…` : s);

/**
 * Reads the stored file of `rec` and imports it under its policy, updating the record as it goes and
 * pushing progress to `userId`. Never throws for a bad file: the outcome is the record's status.
 */
async function runImport(ctx: AppContext, rec: LoggerImport, tank: Tank, farm: Farm, userId: number, from: ImportStatus): Promise<void> {
  const { LoggerImport, LoggerImportRejection, TankImportMapping } = ctx.db.models;
  let claimed: number;
  try {
    [claimed] = await LoggerImport.update(
      { status: 'importing', startedAt: new Date(), finishedAt: null, error: null, rowsTotal: 0, rowsNew: 0, rowsDuplicate: 0, rowsRejected: 0 },
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

  const filePath = join(ctx.config.uploadDir, rec.storedName);
  const mapping = rec.mapping;
  const layout = chooseLayout(await readHead(filePath).catch(() => new Uint8Array()), mapping);
  const reader = createImportReader({ mapping, tank: tankSetup(tank), nowMs: Date.now(), newline: layout.newline });
  let bytesRead = 0;
  let lastPush = 0;
  const push = (status: ImportStatus, force = false) => {
    const now = Date.now();
    if (!force && now - lastPush < PROGRESS_INTERVAL_MS) return;
    lastPush = now;
    const payload: ImportProgress = { importId: rec.id, rowsRead: reader.counts.rows, bytesRead: Math.min(bytesRead, rec.sizeBytes), totalBytes: rec.sizeBytes, status };
    ctx.events.emit('user-event', { userId, event: 'import:progress', payload });
  };
  push('importing', true);

  const { delimiter, newline } = layout;
  let rowsNew = 0;
  let rowsGood = 0;
  const timings: Record<string, number> = {};
  const started = performance.now();

  const body = async (transaction: Transaction) => {
    // Good rows stream into the readings table in chunks while the file is still being read.
    const loader = readingLoader(ctx, { organisationId: tank.organisationId, farmId: tank.farmId, tankId: tank.id, calibrationVersion: tank.calibrationVersion, importId: rec.id }, farm.timeZone, transaction);
    let problems: ImportProblem[] = [];
    // Outside the file's transaction: the list of refused rows must outlive a rolled-back file.
    const flushProblems = async () => {
      if (problems.length) {
        await LoggerImportRejection.bulkCreate(
          problems.map((p) => ({ importId: rec.id, line: p.line, field: p.field, columnLabel: clip(p.column, 120), value: clip(p.value, 200), reason: clip(p.reason, 400) })),
        );
      }
      problems = [];
    };

    const source = csvRecords(filePath, csvParseOptions(delimiter, newline), READING_BATCH_ROWS);
    let fatal: string | null = null;
    read: for await (const records of source.batches) {
      for (const cells of records) {
        const r = reader.feed(cells);
        if (r.kind === 'reading') {
          rowsGood++;
          // Under reject-file the first bad row dooms the file: stop inserting, keep reading to report every bad row.
          if (rec.policy === 'valid-rows' || reader.counts.rejected === 0) {
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
      bytesRead = source.bytesRead();
      push('importing');
    }
    await flushProblems();
    const end = fatal ? { ok: false as const, reason: fatal } : reader.end();
    if (!end.ok) throw new FileRefused(end.reason);
    const { rows, rejected } = reader.counts;
    if (rowsGood === 0) throw new FileRefused(`None of the ${rows.toLocaleString('en-US')} rows could be imported; see the refused rows`);
    if (rejected > 0 && rec.policy === 'reject-file') {
      throw new FileRefused(`${rejected.toLocaleString('en-US')} of ${rows.toLocaleString('en-US')} rows have problems, so nothing from this file was imported (policy: reject the whole file)`);
    }
    timings.readMs = performance.now() - started;
    const loaded = await loader.finish();
    rowsNew = loaded.rowsNew;
    Object.assign(timings, { waitForDatabaseMs: loaded.waitMs, loadStatementsMs: loaded.loadMs, snapshotsMs: loaded.snapshotsMs });
    await rec.update({ status: 'imported', delimiter, rowsTotal: rows, rowsNew, rowsDuplicate: rowsGood - rowsNew, rowsRejected: rejected, finishedAt: new Date() }, { transaction });
    await TankImportMapping.upsert({ tankId: tank.id, organisationId: tank.organisationId, mapping, policy: rec.policy, savedById: rec.uploadedById, savedAt: new Date() }, { transaction });
  };

  try {
    await ctx.db.sequelize.transaction(body);
    timings.totalMs = performance.now() - started;
    ctx.logger.info({ importId: rec.id, rows: reader.counts.rows, rowsNew, timings }, 'logger import finished');
  } catch (err) {
    try {
      await rec.reload();
      const counts = { delimiter, rowsTotal: reader.counts.rows, rowsNew: 0, rowsDuplicate: 0, rowsRejected: reader.counts.rejected, finishedAt: new Date() };
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
  push(rec.status, true);
  if (rec.status === 'imported' && rec.rowsNew > 0) ctx.events.emit('readings', { organisationId: tank.organisationId, farmIds: [tank.farmId] });
}

/**
 * Imports each uploaded file into one tank, one after the other. The request is refused as a whole
 * (and every file deleted) when the tank, the mapping or any file's content is unusable; otherwise
 * each file gets an import record whose status says what happened to it.
 */
export async function importUploads(ctx: AppContext, actor: SessionUser, input: ImportUploadInput, files: UploadedFile[]): Promise<LoggerImportDetail[]> {
  const pending = new Set(files);
  try {
    const { tank, farm } = await writableTank(ctx, actor, input.tankId);
    if (!files.length) throw new AppError(400, 'invalid_input', 'files: attach at least one CSV file', 'files');
    assertMappingFits(input.mapping, tank);
    await assertUploadsReadable(files, input.mapping);
    const { LoggerImport } = ctx.db.models;
    const done: LoggerImport[] = [];
    for (const f of files) {
      const sha256 = await sha256Of(f.path);
      const base = { organisationId: tank.organisationId, farmId: tank.farmId, tankId: tank.id, uploadedById: actor.id, originalName: labelOf(f.originalName), sizeBytes: f.sizeBytes, sha256, mapping: input.mapping, policy: input.policy };
      // The look-up finds an earlier live import of the same bytes; two uploads at the same moment may both
      // miss it, and then the unique live-file index lets only one insert through and the other sees it.
      let earlier: LoggerImport | null = null;
      let rec: LoggerImport | null = null;
      for (let attempt = 0; attempt < 3 && !earlier && !rec; attempt++) {
        earlier = await liveImportOf(ctx, tank.id, sha256);
        if (earlier) break;
        try {
          rec = await LoggerImport.create({ ...base, storedName: f.storedName, status: 'queued', delimiter: null, error: null, duplicateOfId: null, startedAt: null, finishedAt: null });
        } catch (err) {
          if (!(err instanceof UniqueConstraintError)) throw err;
        }
      }
      if (earlier) {
        const running = earlier.status !== 'imported';
        // The same bytes are on disk already under the earlier import; keep one copy.
        const dup = await LoggerImport.create({
          ...base,
          storedName: earlier.storedName,
          status: 'duplicate',
          delimiter: earlier.delimiter,
          rowsTotal: earlier.rowsTotal,
          rowsNew: 0,
          rowsDuplicate: earlier.rowsNew + earlier.rowsDuplicate,
          rowsRejected: earlier.rowsRejected,
          error: running
            ? `This file is being imported into this tank by another upload right now (import ${earlier.id}); nothing was added from this one`
            : `This file was imported into this tank already (import ${earlier.id}, ${earlier.createdAt.toISOString().slice(0, 10)}); nothing was added`,
          duplicateOfId: earlier.id,
          startedAt: null,
          finishedAt: new Date(),
        });
        await rm(f.path, { force: true });
        pending.delete(f);
        ctx.events.emit('user-event', { userId: actor.id, event: 'import:progress', payload: { importId: dup.id, rowsRead: 0, bytesRead: dup.sizeBytes, totalBytes: dup.sizeBytes, status: 'duplicate' } satisfies ImportProgress });
        done.push(dup);
        continue;
      }
      if (!rec) throw new AppError(409, 'import_busy', `files: "${labelOf(f.originalName)}" is being uploaded by someone else at this moment; try again shortly`, 'files');
      pending.delete(f);
      await runImport(ctx, rec, tank, farm, actor.id, 'queued');
      done.push(rec);
    }
    return Promise.all(done.map((r) => toDetail(ctx, r)));
  } finally {
    await discardUploads([...pending]);
  }
}

/** Runs a failed import again from its stored file, with the mapping and policy it was uploaded with. */
export async function retryImport(ctx: AppContext, actor: SessionUser, id: number): Promise<LoggerImportDetail> {
  const rec = await importFor(ctx, actor, id);
  if (rec.status !== 'failed') throw new AppError(409, 'not_failed', `Only a failed import can be retried; this one is ${rec.status}`);
  const { tank, farm } = await writableTank(ctx, actor, rec.tankId);
  assertMappingFits(rec.mapping, tank);
  const present = await stat(join(ctx.config.uploadDir, rec.storedName)).then(
    () => true,
    () => false,
  );
  if (!present) throw new AppError(410, 'file_missing', 'The stored file of this import is gone, so it cannot be retried; upload the file again');
  await runImport(ctx, rec, tank, farm, actor.id, 'failed');
  return toDetail(ctx, rec);
}

/** Imports the actor may see, newest first; optionally of one farm or one tank. */
export async function listImports(ctx: AppContext, actor: SessionUser, q: ImportListQuery): Promise<ImportDto[]> {
  const where: WhereOptions<LoggerImport> = { organisationId: actor.organisationId, farmId: actor.farmIds };
  if (q.farmId !== undefined) {
    const farm = await assertFarmAccess(ctx, actor, q.farmId);
    Object.assign(where, { farmId: farm.id });
  }
  if (q.tankId !== undefined) {
    const tank = await tankFor(ctx, actor, q.tankId);
    Object.assign(where, { tankId: tank.id });
  }
  const rows = await ctx.db.models.LoggerImport.findAll({ where, order: [['createdAt', 'DESC'], ['id', 'DESC']], limit: q.limit });
  return toDtos(ctx, rows);
}

/** One import with the first refused rows. */
export async function getImport(ctx: AppContext, actor: SessionUser, id: number): Promise<LoggerImportDetail> {
  return toDetail(ctx, await importFor(ctx, actor, id));
}

const CSV_FIELDS = ['line', 'field', 'column', 'value', 'reason'];

/**
 * The refused rows of an import as CSV text, produced page by page so a long list is never held
 * whole. Cells that a spreadsheet would run as a formula (= + - @ first) are escaped.
 */
export async function rejectedRowsCsv(ctx: AppContext, actor: SessionUser, id: number): Promise<{ filename: string; chunks: AsyncIterable<string> }> {
  const rec = await importFor(ctx, actor, id);
  const sourceId = problemsSourceId(rec);
  const { LoggerImportRejection } = ctx.db.models;
  async function* chunks() {
    // A byte-order mark so spreadsheet programs read the file as UTF-8 (°C, dashes in reasons).
    // With no data rows papaparse already ends the header line.
    yield `\uFEFF${Papa.unparse({ fields: CSV_FIELDS, data: [] }, { newline: '\r\n' })}`;
    let after = 0;
    for (;;) {
      const page = await LoggerImportRejection.findAll({ where: { importId: sourceId, id: { [Op.gt]: after } }, order: [['id', 'ASC']], limit: 5_000 });
      if (!page.length) return;
      after = page[page.length - 1].id;
      const data = page.map((p) => [p.line, p.field, p.columnLabel, p.value, p.reason]);
      yield `${Papa.unparse({ fields: CSV_FIELDS, data }, { header: false, escapeFormulae: true, newline: '\r\n' })}\r\n`;
    }
  }
  return { filename: `import-${rec.id}-rejected.csv`, chunks: chunks() };
}

/** The mapping saved for a tank by its last successful import, or a 404. */
export async function savedMapping(ctx: AppContext, actor: SessionUser, tankId: number): Promise<SavedImportMapping> {
  const tank = await tankFor(ctx, actor, tankId);
  const saved = await ctx.db.models.TankImportMapping.findByPk(tank.id);
  if (!saved) throw new AppError(404, 'no_mapping', 'No column mapping is saved for this tank yet; it is saved by the first successful import');
  const user = saved.savedById ? await ctx.db.models.User.findByPk(saved.savedById, { attributes: ['name'] }) : null;
  return { tankId: tank.id, mapping: saved.mapping, policy: saved.policy, savedAt: saved.savedAt.toISOString(), savedBy: user?.name ?? '' };
}

/** The live (queued, importing or imported) import of these bytes into this tank, if any. */
function liveImportOf(ctx: AppContext, tankId: number, sha256: string): Promise<LoggerImport | null> {
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
    ctx.db.models.LoggerImport.update({ status: 'failed', error: DATABASE_LOST, rowsNew: 0, rowsDuplicate: 0, finishedAt: new Date() }, { where: { id, status: ['queued', 'importing'] } }).then(
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
