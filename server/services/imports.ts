// Logger file imports: each uploaded file is checked by content (upload-checks), hashed, and read again
// from disk as a stream through the shared row reader (import-run). Good rows stream in chunks through
// the bulk insert path (readingLoader) inside ONE transaction per file, so a file is all-or-nothing and
// memory stays bounded however long it is. A dry run reads every row the same way and stores nothing.
import { rm, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { UniqueConstraintError, type WhereOptions } from 'sequelize';
import { formatInstant, mappingProblem, type ImportMapping } from '@shared/imports';
import type {
  ImportDryRun,
  ImportListQuery,
  ImportProgress,
  ImportUploadInput,
  LoggerImport as ImportDto,
  LoggerImportDetail,
  SessionUser,
  TankEditor,
  TankImportSetup,
} from '@shared/schemas';
import { tankSetupOf } from '@shared/readings';
import type { AppContext } from '../context';
import { AppError, forbidden, notFound } from '../errors';
import { assertFarmAccess } from './access';
import type { Farm, LoggerImport, Tank } from '../models';
import { dryRunFile, liveImportOf, runImport } from './import-run';
import { REJECTED_PREVIEW, rejectedRowsChunks, toDetail, toDtos } from './import-views';
import { tankFor } from './tanks';
import { assertUploadsReadable } from './upload-checks';
import { discardUploads, labelOf, sha256Of, type UploadedFile } from './upload-files';

export { recoverInterruptedImports } from './import-run';

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
  const problem = mappingProblem(mapping, tankSetupOf(tank));
  if (problem) throw new AppError(422, 'mapping_unfit', problem.message, problem.field);
}

/** What a duplicate of `earlier` says: another upload is running it, or it is in already (with its date in the farm's time). */
function duplicateMessage(earlier: LoggerImport, farm: Farm): string {
  if (earlier.status !== 'imported') return `This file is being imported into this tank by another upload right now (import ${earlier.id}); nothing was added from this one`;
  return `This file was imported into this tank already (import ${earlier.id}, ${formatInstant(earlier.createdAt.getTime(), farm.timeZone)}); nothing was added`;
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
        // The same bytes are on disk already under the earlier import; keep one copy.
        const dup = await LoggerImport.create({
          ...base,
          storedName: earlier.storedName,
          status: 'duplicate',
          delimiter: earlier.delimiter,
          rowsTotal: earlier.rowsTotal,
          rowsNew: 0,
          // Every distinct instant of the file is stored already; repeats inside it stay repeats.
          rowsDuplicate: earlier.rowsNew + earlier.rowsDuplicate,
          rowsRepeated: earlier.rowsRepeated,
          rowsRejected: earlier.rowsRejected,
          noticeCount: earlier.noticeCount,
          notices: earlier.notices,
          error: duplicateMessage(earlier, farm),
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

/**
 * A dry run of an upload: the same checks as importUploads, then every row of every file read and
 * loaded as an import would do it, inside a transaction that is rolled back. Stores nothing (no import
 * record, no readings, no saved mapping) and deletes the uploaded files.
 */
export async function dryRunUploads(ctx: AppContext, actor: SessionUser, input: ImportUploadInput, files: UploadedFile[]): Promise<ImportDryRun[]> {
  try {
    const { tank, farm } = await writableTank(ctx, actor, input.tankId);
    if (!files.length) throw new AppError(400, 'invalid_input', 'files: attach at least one CSV file', 'files');
    assertMappingFits(input.mapping, tank);
    await assertUploadsReadable(files, input.mapping);
    const out: ImportDryRun[] = [];
    for (const f of files) {
      const named = { originalName: labelOf(f.originalName), sizeBytes: f.sizeBytes };
      const earlier = await liveImportOf(ctx, tank.id, await sha256Of(f.path));
      if (earlier) {
        const detail = await toDetail(ctx, earlier);
        out.push({
          ...named,
          status: 'duplicate',
          delimiter: earlier.delimiter,
          rowsTotal: earlier.rowsTotal,
          rowsNew: 0,
          rowsDuplicate: earlier.rowsNew + earlier.rowsDuplicate,
          rowsRepeated: earlier.rowsRepeated,
          rowsRejected: earlier.rowsRejected,
          noticeCount: earlier.noticeCount,
          error: duplicateMessage(earlier, farm),
          duplicateOfId: earlier.id,
          rejectedPreview: detail.rejectedPreview,
          rejectedProblems: detail.rejectedProblems,
          notices: detail.notices,
        });
        continue;
      }
      const run = await dryRunFile(ctx, { filePath: f.path, sizeBytes: f.sizeBytes, mapping: input.mapping, policy: input.policy, tank, farm, importId: 0 }, REJECTED_PREVIEW);
      const o = run.outcome;
      const imported = run.status === 'imported';
      out.push({
        ...named,
        status: run.status,
        delimiter: o.delimiter ?? null,
        rowsTotal: o.rows ?? 0,
        rowsNew: imported ? (o.rowsNew ?? 0) : 0,
        rowsDuplicate: imported ? (o.rowsDuplicate ?? 0) : 0,
        rowsRepeated: imported ? (o.rowsRepeated ?? 0) : 0,
        rowsRejected: o.rejected ?? 0,
        noticeCount: o.noticeCount ?? 0,
        error: run.error,
        duplicateOfId: null,
        rejectedPreview: run.problems.map((p) => ({ line: p.line, field: p.field, column: p.column, value: p.value, reason: p.reason, problem: p.problem })),
        rejectedProblems: run.problemCount,
        notices: o.notices ?? [],
      });
    }
    return out;
  } finally {
    await discardUploads(files);
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

/** The refused rows of an import as a CSV download, page by page. */
export async function rejectedRowsCsv(ctx: AppContext, actor: SessionUser, id: number): Promise<{ filename: string; chunks: AsyncIterable<string> }> {
  const rec = await importFor(ctx, actor, id);
  return { filename: `import-${rec.id}-rejected.csv`, chunks: rejectedRowsChunks(ctx, rec) };
}

/**
 * What the import form needs to know of a tank: the mapping its last successful import saved (null
 * before the first one: no error, it is the usual state of a new tank), and the organisation's active
 * owners and managers, who may change the tank's setup (a worker is told to ask them by name).
 */
export async function tankImportSetup(ctx: AppContext, actor: SessionUser, tankId: number): Promise<TankImportSetup> {
  const tank = await tankFor(ctx, actor, tankId);
  const { TankImportMapping, User } = ctx.db.models;
  const saved = await TankImportMapping.findByPk(tank.id);
  const savedBy = saved?.savedById ? await User.findByPk(saved.savedById, { attributes: ['name'] }) : null;
  const editors = await User.findAll({ where: { organisationId: actor.organisationId, role: ['owner', 'manager'], active: true }, attributes: ['name', 'role', 'passwordHash'], order: [['role', 'ASC'], ['name', 'ASC']] }); // role in the enum's order: owners, then managers
  return {
    saved: saved ? { tankId: tank.id, mapping: saved.mapping, policy: saved.policy, savedAt: saved.savedAt.toISOString(), savedBy: savedBy?.name ?? '' } : null,
    // Someone still to take up an invitation cannot sign in to help yet.
    tankEditors: editors.filter((u) => u.passwordHash !== null).map((u): TankEditor => ({ name: u.name, role: u.role as TankEditor['role'] })),
  };
}
