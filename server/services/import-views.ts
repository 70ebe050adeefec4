// Logger imports as the API shows them: the record with its tank and uploader, the first refused rows
// and notices, and the whole list of refused rows as a CSV download produced page by page.
import { Op } from 'sequelize';
import type { LoggerImport as ImportDto, LoggerImportDetail } from '@shared/schemas';
import type { AppContext } from '../context';
import { toCsv } from '../csv';
import type { LoggerImport } from '../models';

/** Refused-row problems a detail response carries; the CSV download has all of them. */
export const REJECTED_PREVIEW = 100;

const iso = (d: Date | null) => (d ? d.toISOString() : null);

/** The records as the API returns them (tank names and uploaders looked up once for all). */
export async function toDtos(ctx: AppContext, rows: LoggerImport[]): Promise<ImportDto[]> {
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
    rowsRepeated: r.rowsRepeated,
    rowsRejected: r.rowsRejected,
    noticeCount: r.noticeCount,
    error: r.error,
    duplicateOfId: r.duplicateOfId,
    createdAt: r.createdAt.toISOString(),
    startedAt: iso(r.startedAt),
    finishedAt: iso(r.finishedAt),
  }));
}

/** An import's problems come from the file it repeats when it is a duplicate. */
export const problemsSourceId = (r: LoggerImport) => r.duplicateOfId ?? r.id;

/** One import with its first refused rows and its notices. */
export async function toDetail(ctx: AppContext, r: LoggerImport): Promise<LoggerImportDetail> {
  const { LoggerImportRejection } = ctx.db.models;
  const sourceId = problemsSourceId(r);
  const [dto] = await toDtos(ctx, [r]);
  const preview = await LoggerImportRejection.findAll({ where: { importId: sourceId }, order: [['id', 'ASC']], limit: REJECTED_PREVIEW });
  return {
    ...dto,
    rejectedPreview: preview.map((p) => ({ line: p.line, field: p.field, column: p.columnLabel, value: p.value, reason: p.reason })),
    rejectedProblems: await LoggerImportRejection.count({ where: { importId: sourceId } }),
    notices: r.notices ?? [],
  };
}

const CSV_FIELDS = ['line', 'field', 'column', 'value', 'reason'];

/**
 * The refused rows of an import as CSV text, produced page by page so a long list is never held
 * whole. Cells are written by toCsv, so a spreadsheet runs none of them as a formula.
 */
export function rejectedRowsChunks(ctx: AppContext, rec: LoggerImport): AsyncIterable<string> {
  const sourceId = problemsSourceId(rec);
  const { LoggerImportRejection } = ctx.db.models;
  async function* chunks() {
    // A byte-order mark so spreadsheet programs read the file as UTF-8 (°C, dashes in reasons).
    // With no data rows papaparse already ends the header line.
    yield `\uFEFF${toCsv({ fields: CSV_FIELDS, data: [] }, { newline: '\r\n' })}`;
    let after = 0;
    for (;;) {
      const page = await LoggerImportRejection.findAll({ where: { importId: sourceId, id: { [Op.gt]: after } }, order: [['id', 'ASC']], limit: 5_000 });
      if (!page.length) return;
      after = page[page.length - 1].id;
      const data = page.map((p) => [p.line, p.field, p.columnLabel, p.value, p.reason]);
      yield `${toCsv({ fields: CSV_FIELDS, data }, { header: false, newline: '\r\n' })}\r\n`;
    }
  }
  return chunks();
}
