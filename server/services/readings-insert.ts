// insertReadings for rounds, corrections and the demo, and the tank_latest/tank_days upserts the loader shares.
import { QueryTypes, type Transaction } from 'sequelize';
import { farmDayOf } from '@shared/time';
import type { AppContext } from '../context';

export interface NewReading {
  organisationId: number;
  farmId: number;
  tankId: number;
  takenAt: Date;
  source: 'round' | 'logger' | 'correction';
  revision?: number;
  levelMm: number;
  grossL: number;
  usableL: number;
  temperatureC: number | null;
  calibrationVersion: string;
  enteredById: number | null;
  importId: number | null;
  note: string;
  idempotencyKey: string | null;
}

const COLUMNS = ['organisationId', 'farmId', 'tankId', 'takenAt', 'source', 'revision', 'levelMm', 'grossL', 'usableL', 'temperatureC', 'calibrationVersion', 'enteredById', 'importId', 'note', 'idempotencyKey', 'createdAt'] as const;

/**
 * Inserts readings in one multi-row INSERT IGNORE (rows whose natural key or idempotency key
 * exists already are skipped), then brings tank_latest and tank_days up to date.
 * Returns how many rows were new.
 */
export async function insertReadings(ctx: Pick<AppContext, 'db'>, rows: NewReading[], timeZones: Map<number, string>, transaction: Transaction): Promise<number> {
  if (!rows.length) return 0;
  const now = new Date();
  const placeholders = `(${COLUMNS.map(() => '?').join(',')})`;
  const values: unknown[] = [];
  for (const r of rows) values.push(r.organisationId, r.farmId, r.tankId, r.takenAt, r.source, r.revision ?? 0, r.levelMm, r.grossL, r.usableL, r.temperatureC, r.calibrationVersion, r.enteredById, r.importId, r.note, r.idempotencyKey, now);
  const [, affected] = await ctx.db.sequelize.query(`INSERT IGNORE INTO readings (${COLUMNS.join(',')}) VALUES ${rows.map(() => placeholders).join(',')}`, {
    replacements: values,
    type: QueryTypes.INSERT,
    transaction,
  });
  await refreshSnapshots(ctx, rows, timeZones, transaction);
  return Number(affected);
}

/** Updates each touched tank's latest reading and the daily snapshots of the days touched. */
async function refreshSnapshots(ctx: Pick<AppContext, 'db'>, rows: NewReading[], timeZones: Map<number, string>, transaction: Transaction) {
  const newestByTank = new Map<number, NewReading>();
  const lastByDay = new Map<string, SnapshotRow>();
  for (const r of rows) {
    const cur = newestByTank.get(r.tankId);
    if (!cur || r.takenAt > cur.takenAt) newestByTank.set(r.tankId, r);
    const day = farmDayOf(r.takenAt, timeZones.get(r.farmId) ?? 'UTC');
    const key = `${r.tankId}|${day}`;
    const prev = lastByDay.get(key);
    if (!prev || r.takenAt > prev.takenAt) lastByDay.set(key, { ...r, day });
  }
  // The stored rows (they may have existed already) supply the ids: one look-up for every tank.
  // In tank order, so rounds that share tanks lock their rows in the same order.
  const newest = [...newestByTank.values()].sort((a, b) => a.tankId - b.tankId);
  const stored = await ctx.db.sequelize.query<{ id: number; tankId: number; takenAt: Date; source: string; revision: number }>(
    `SELECT id, tankId, takenAt, source, revision FROM readings WHERE ${newest.map(() => '(tankId = ? AND takenAt = ? AND source = ? AND revision = ?)').join(' OR ')}`,
    { replacements: newest.flatMap((r) => [r.tankId, r.takenAt, r.source, r.revision ?? 0]), type: QueryTypes.SELECT, transaction },
  );
  const idOf = new Map(stored.map((row) => [`${row.tankId}|${new Date(row.takenAt).getTime()}|${row.source}|${row.revision}`, row.id]));
  const latest = newest.flatMap((r) => {
    const id = idOf.get(`${r.tankId}|${r.takenAt.getTime()}|${r.source}|${r.revision ?? 0}`);
    return id === undefined ? [] : [{ ...r, id }];
  });
  await upsertLatest(ctx, latest, transaction);
  await upsertDays(ctx, [...lastByDay.values()], transaction);
}

/** What a snapshot row needs of a reading. */
export type SnapshotRow = Pick<NewReading, 'tankId' | 'organisationId' | 'farmId' | 'takenAt' | 'grossL' | 'usableL'> & { day: string };

type LatestRow = Pick<NewReading, 'tankId' | 'organisationId' | 'farmId' | 'takenAt' | 'levelMm' | 'grossL' | 'usableL' | 'temperatureC' | 'source'> & { id: number };

/** Makes each of `rows` (stored readings, one per tank) its tank's latest unless a later one is there already. */
export async function upsertLatest(ctx: Pick<AppContext, 'db'>, rows: LatestRow[], transaction: Transaction) {
  if (!rows.length) return;
  // Assignments run left to right in MariaDB, so takenAt is updated last.
  await ctx.db.sequelize.query(
    `INSERT INTO tank_latest (tankId, organisationId, farmId, readingId, takenAt, levelMm, grossL, usableL, temperatureC, source)
     VALUES ${rows.map(() => '(?,?,?,?,?,?,?,?,?,?)').join(',')}
     ON DUPLICATE KEY UPDATE
       readingId = IF(VALUES(takenAt) >= takenAt, VALUES(readingId), readingId),
       levelMm = IF(VALUES(takenAt) >= takenAt, VALUES(levelMm), levelMm),
       grossL = IF(VALUES(takenAt) >= takenAt, VALUES(grossL), grossL),
       usableL = IF(VALUES(takenAt) >= takenAt, VALUES(usableL), usableL),
       temperatureC = IF(VALUES(takenAt) >= takenAt, VALUES(temperatureC), temperatureC),
       source = IF(VALUES(takenAt) >= takenAt, VALUES(source), source),
       takenAt = GREATEST(VALUES(takenAt), takenAt)`,
    { replacements: rows.flatMap((r) => [r.tankId, r.organisationId, r.farmId, r.id, r.takenAt, r.levelMm, r.grossL, r.usableL, r.temperatureC, r.source]), type: QueryTypes.INSERT, transaction },
  );
}

/** Makes each row its day's snapshot unless a later reading of that day is there already (500 days a statement). */
export async function upsertDays(ctx: Pick<AppContext, 'db'>, days: SnapshotRow[], transaction: Transaction) {
  for (let i = 0; i < days.length; i += 500) {
    const chunk = days.slice(i, i + 500);
    await ctx.db.sequelize.query(
      `INSERT INTO tank_days (tankId, day, organisationId, farmId, takenAt, grossL, usableL) VALUES ${chunk.map(() => '(?,?,?,?,?,?,?)').join(',')}
       ON DUPLICATE KEY UPDATE
         grossL = IF(VALUES(takenAt) >= takenAt, VALUES(grossL), grossL),
         usableL = IF(VALUES(takenAt) >= takenAt, VALUES(usableL), usableL),
         takenAt = GREATEST(VALUES(takenAt), takenAt)`,
      { replacements: chunk.flatMap((d) => [d.tankId, d.day, d.organisationId, d.farmId, d.takenAt, d.grossL, d.usableL]), type: QueryTypes.INSERT, transaction },
    );
  }
}
