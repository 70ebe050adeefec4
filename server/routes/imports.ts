import { mkdir } from 'node:fs/promises';
import type { NextFunction, Request, Response } from 'express';
import { Router } from 'express';
import multer from 'multer';
import { importListQuerySchema, importUploadQuerySchema, importUploadSchema } from '@shared/schemas';
import type { AppContext } from '../context';
import { AppError } from '../errors';
import { actorOf, requireRole, requireSignIn } from '../middleware/access';
import { dryRunUploads, getImport, importUploads, listImports, rejectedRowsCsv, retryImport, tankImportSetup } from '../services/imports';
import { declaredTypeProblem } from '../services/upload-checks';
import { discardUploads, labelOf, storedNameFor, type UploadedFile } from '../services/upload-files';
import { idParam, parse } from '../validate';

/** Files one upload may carry. */
export const MAX_FILES_PER_UPLOAD = 20;
const FILE_FIELDS = ['files', 'files[]'];

const megabytes = (bytes: number) => `${Number((bytes / 1_048_576).toFixed(2))} MB`;

/** multer with disk storage under generated names; its errors become AppErrors naming the field. */
function receiveFiles(ctx: AppContext) {
  const storage = multer.diskStorage({
    destination: (_req, _file, cb) => {
      mkdir(ctx.config.uploadDir, { recursive: true }).then(
        () => cb(null, ctx.config.uploadDir),
        (err: Error) => cb(err, ''),
      );
    },
    filename: (_req, _file, cb) => cb(null, storedNameFor()),
  });
  const upload = multer({
    storage,
    // Browsers send the file name as UTF-8 without saying so.
    defParamCharset: 'utf8',
    limits: { fileSize: ctx.config.uploadMaxBytes, files: MAX_FILES_PER_UPLOAD, fields: 10, fieldSize: 64 * 1024 },
    // A file declared as an image, archive or document is refused before anything of it is stored.
    fileFilter: (_req, file, cb) => {
      const problem = declaredTypeProblem(file.mimetype);
      if (problem) cb(new AppError(415, 'not_csv', `files: "${labelOf(file.originalname)}" cannot be imported: ${problem}`, 'files'));
      else cb(null, true);
    },
  }).fields(FILE_FIELDS.map((name) => ({ name, maxCount: MAX_FILES_PER_UPLOAD })));
  const limit = `${megabytes(ctx.config.uploadMaxBytes)} (${ctx.config.uploadMaxBytes.toLocaleString('en-US')} bytes)`;
  return (req: Request, res: Response, next: NextFunction) => {
    upload(req, res, (err?: unknown) => {
      if (!err) return next();
      if (err instanceof AppError) return next(err);
      if (err instanceof multer.MulterError) {
        switch (err.code) {
          case 'LIMIT_FILE_SIZE':
            return next(new AppError(413, 'file_too_large', `files: a file is larger than the upload limit of ${limit} per file; split it into smaller files`, 'files'));
          case 'LIMIT_FILE_COUNT':
            return next(new AppError(413, 'too_many_files', `files: at most ${MAX_FILES_PER_UPLOAD} files per upload`, 'files'));
          case 'LIMIT_UNEXPECTED_FILE':
            return next(new AppError(400, 'invalid_input', `files: send the files in the "files" field, not "${err.field ?? ''}"`, 'files'));
          case 'LIMIT_FIELD_VALUE':
            return next(new AppError(400, 'invalid_input', `${err.field ?? 'mapping'}: is too long`, err.field ?? 'mapping'));
          default:
            return next(new AppError(400, 'bad_upload', `The upload could not be read (${err.message})`));
        }
      }
      next(new AppError(400, 'bad_upload', `The upload could not be read (${err instanceof Error ? err.message : String(err)})`));
    });
  };
}

function uploadedFiles(req: Request): UploadedFile[] {
  const byField = (req.files ?? {}) as Record<string, Express.Multer.File[]>;
  return FILE_FIELDS.flatMap((name) => byField[name] ?? []).map((f) => ({ path: f.path, storedName: f.filename, originalName: f.originalname, sizeBytes: f.size }));
}

// Buyers watch stock; workers, managers and owners bring readings in.
const importers = requireRole('owner', 'manager', 'worker');

/** Mounted at /imports: logger-file uploads, dry runs, their results and retries. */
export function importsRouter(ctx: AppContext) {
  const router = Router();
  router.post('/', importers, receiveFiles(ctx), async (req, res) => {
    const files = uploadedFiles(req);
    // Neither a form upload nor a JSON object (plain text, an array, no body): nothing names a field.
    if (!req.is('multipart/form-data') && (typeof req.body !== 'object' || req.body === null || Array.isArray(req.body))) {
      throw new AppError(415, 'bad_upload', 'files: send the CSV files as a multipart/form-data upload (the "files" field, with tankId and mapping beside them)', 'files');
    }
    let input;
    let dryRun: boolean;
    try {
      dryRun = parse(importUploadQuerySchema, req.query).dryRun;
      input = parse(importUploadSchema, req.body);
    } catch (err) {
      await discardUploads(files);
      throw err;
    }
    // A dry run reads every row of every file as the import would, and stores nothing.
    if (dryRun) return void res.json({ dryRun: true, imports: await dryRunUploads(ctx, actorOf(req), input, files) });
    res.status(201).json({ imports: await importUploads(ctx, actorOf(req), input, files) });
  });
  router.get('/', requireSignIn, async (req, res) => {
    res.json(await listImports(ctx, actorOf(req), parse(importListQuerySchema, req.query)));
  });
  router.get('/:id', requireSignIn, async (req, res) => {
    res.json(await getImport(ctx, actorOf(req), idParam(req.params.id, 'Import')));
  });
  router.get('/:id/rejected.csv', requireSignIn, async (req, res) => {
    const { filename, chunks } = await rejectedRowsCsv(ctx, actorOf(req), idParam(req.params.id, 'Import'));
    res.type('text/csv; charset=utf-8').attachment(filename);
    for await (const chunk of chunks) res.write(chunk);
    res.end();
  });
  router.post('/:id/retry', importers, async (req, res) => {
    res.json(await retryImport(ctx, actorOf(req), idParam(req.params.id, 'Import')));
  });
  return router;
}

/** Mounted at /tanks: the import mapping saved on one tank. */
export function tankImportMappingRouter(ctx: AppContext) {
  const router = Router();
  router.get('/:id/import-mapping', requireSignIn, async (req, res) => {
    res.json(await tankImportSetup(ctx, actorOf(req), idParam(req.params.id, 'Tank')));
  });
  return router;
}
