// Storing readings: insertReadings for rounds and corrections (each batch in one statement) and
// readingLoader for logger files (LOAD DATA in chunks). Either way the tank's latest reading and
// daily snapshot are kept current in the same transaction, so the board never scans history.
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { readingToVolumes, type ReadingInput } from '@shared/readings';
import type { CorrectionInput, Reading as ReadingDto, RoundEntryResult, RoundSubmitInput, SeriesPoint, SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { AppError, notFound } from '../errors';
import { assertFarmAccess } from '../middleware/access';
import type { Reading, Tank } from '../models';
import { offerLocalInfile, withdrawLocalInfile } from '../local-infile';
import { tankFor } from './tanks';

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

/** The local calendar day (YYYY-MM-DD) of an instant in a time zone. */
const dayFormatters = new Map<string, Intl.DateTimeFormat>();
export function localDay(at: Date, timeZone: string): string {
  let f = dayFormatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' });
    dayFormatters.set(timeZone, f);
  }
  return f.format(at);
}

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
    const day = localDay(r.takenAt, timeZones.get(r.farmId) ?? 'UTC');
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
type SnapshotRow = Pick<NewReading, 'tankId' | 'organisationId' | 'farmId' | 'takenAt' | 'grossL' | 'usableL'> & { day: string };

type LatestRow = Pick<NewReading, 'tankId' | 'organisationId' | 'farmId' | 'takenAt' | 'levelMm' | 'grossL' | 'usableL' | 'temperatureC' | 'source'> & { id: number };

/** Makes each of `rows` (stored readings, one per tank) its tank's latest unless a later one is there already. */
async function upsertLatest(ctx: Pick<AppContext, 'db'>, rows: LatestRow[], transaction: Transaction) {
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
async function upsertDays(ctx: Pick<AppContext, 'db'>, days: SnapshotRow[], transaction: Transaction) {
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

/**
 * The local day of an instant in one time zone, remembered per clock hour: an hour whose first and
 * last millisecond fall on the same local day lies wholly in it (an offset changes at most once in an
 * hour, and a change at midnight still leaves the hour's ends on different days); other hours are
 * worked out per instant. Same answers as localDay, without an Intl call per row.
 */
export function localDayOf(timeZone: string): (ms: number) => string {
  const byHour = new Map<number, string>();
  return (ms) => {
    const hour = Math.floor(ms / 3_600_000);
    let day = byHour.get(hour);
    if (day === undefined) {
      const first = localDay(new Date(hour * 3_600_000), timeZone);
      day = first === localDay(new Date(hour * 3_600_000 + 3_599_999), timeZone) ? first : '';
      if (byHour.size >= 200_000) byHour.clear();
      byHour.set(hour, day);
    }
    return day || localDay(new Date(ms), timeZone);
  };
}

/** What every reading of one logger file shares. */
export interface LoadBase {
  organisationId: number;
  farmId: number;
  tankId: number;
  calibrationVersion: string;
  importId: number;
}

/** One converted logger row: UTC instant (epoch ms), level in mm, volumes in L, temperature in °C or null. */
export interface LoadRow {
  takenAtMs: number;
  levelMm: number;
  grossL: number;
  usableL: number;
  temperatureC: number | null;
}

/** What a finished load did, and where its time went (ms). */
export interface LoadSummary {
  rowsNew: number;
  /** Time the reader stood waiting for the database to take the previous chunk. */
  waitMs: number;
  /** Time MariaDB spent on the LOAD DATA statements (overlaps the reading of the file). */
  loadMs: number;
  snapshotsMs: number;
}

/** Rows per LOAD DATA statement (about 1.5 MB of text); one chunk is loaded while the next is being read. */
export const LOAD_CHUNK_ROWS = 20_000;

const TWO_DIGITS = Array.from({ length: 60 }, (_, i) => String(i).padStart(2, '0'));
const THREE_DIGITS = Array.from({ length: 1000 }, (_, i) => String(i).padStart(3, '0'));

/**
 * A formatter of UTC instants as 'YYYY-MM-DD HH:MM:SS.mmm' for a DATETIME(3) column; the date part is
 * kept per day, so a row costs a few divisions instead of a Date and toISOString (about 10× less).
 */
function sqlInstants(): (ms: number) => string {
  let dayNumber = NaN;
  let dayText = '';
  return (instant) => {
    // A Date drops a fraction of a millisecond the same way (toward zero).
    const ms = Math.trunc(instant);
    const day = Math.floor(ms / 86_400_000);
    if (day !== dayNumber) {
      dayNumber = day;
      dayText = `${new Date(day * 86_400_000).toISOString().slice(0, 10)} `;
    }
    let rest = ms - day * 86_400_000;
    const h = Math.floor(rest / 3_600_000);
    rest -= h * 3_600_000;
    const m = Math.floor(rest / 60_000);
    rest -= m * 60_000;
    const s = Math.floor(rest / 1000);
    return `${dayText}${TWO_DIGITS[h]}:${TWO_DIGITS[m]}:${TWO_DIGITS[s]}.${THREE_DIGITS[rest - s * 1000]}`;
  };
}

/**
 * The bulk insert path of logger imports: the readings of one tank, in any number, streamed into
 * MariaDB with LOAD DATA LOCAL INFILE … IGNORE in chunks inside `transaction` (rows whose natural key
 * exists already, in the table or earlier in the same load, are skipped and not counted as new). While
 * one chunk is being loaded the caller goes on reading the next, so at most two chunks are held. After
 * the last chunk the tank's latest reading and the daily snapshots of the days touched are brought up to
 * date with the stored values, as insertReadings does. `add` returns a promise only when the caller has
 * to wait for the database; `finish` must be called once, after the last row.
 */
export function readingLoader(ctx: Pick<AppContext, 'db'>, base: LoadBase, timeZone: string, transaction: Transaction, chunkRows = LOAD_CHUNK_ROWS) {
  const dayOf = localDayOf(timeZone);
  const sqlInstant = sqlInstants();
  const createdAt = new Date();
  // Rows are written straight into the chunk's bytes (ASCII only), so no row outlives its own add().
  const chunkBytes = chunkRows * 128;
  let buf = Buffer.allocUnsafe(chunkBytes + 512);
  let pos = 0;
  let rowsInChunk = 0;
  let inFlight: Promise<void> | null = null;
  let failure: unknown = null;
  let rowsNew = 0;
  let waitMs = 0;
  let loadMs = 0;
  let newestMs = -Infinity;
  const lastOfDay = new Map<string, number>();

  const send = (data: Buffer) => {
    const started = performance.now();
    const name = offerLocalInfile(data);
    inFlight = ctx.db.sequelize
      .query(
        `LOAD DATA LOCAL INFILE '${name}' IGNORE INTO TABLE readings CHARACTER SET utf8mb4
         FIELDS TERMINATED BY '\\t' ESCAPED BY '\\\\' LINES TERMINATED BY '\\n'
         (takenAt, levelMm, grossL, usableL, temperatureC)
         SET organisationId = ?, farmId = ?, tankId = ?, source = 'logger', revision = 0, calibrationVersion = ?,
             enteredById = NULL, importId = ?, note = '', idempotencyKey = NULL, correctedById = NULL, correctsId = NULL, createdAt = ?`,
        { replacements: [base.organisationId, base.farmId, base.tankId, base.calibrationVersion, base.importId, createdAt], type: QueryTypes.INSERT, transaction },
      )
      .then(
        ([, affected]) => {
          rowsNew += Number(affected);
          loadMs += performance.now() - started;
        },
        (err: unknown) => {
          withdrawLocalInfile(name);
          failure ??= err;
        },
      );
  };
  const settle = async () => {
    if (inFlight) {
      const started = performance.now();
      await inFlight;
      waitMs += performance.now() - started;
      inFlight = null;
    }
    if (failure) throw failure;
  };
  const flush = async () => {
    const data = buf.subarray(0, pos);
    buf = Buffer.allocUnsafe(chunkBytes + 512);
    pos = 0;
    rowsInChunk = 0;
    await settle();
    send(data);
  };

  return {
    /** Queues one row; returns a promise to await when the previous chunk is still being loaded. */
    add(r: LoadRow): Promise<void> | undefined {
      if (failure) return Promise.reject(failure);
      // At most 23 + 4 × 24 + 5 bytes: well inside the 512 bytes kept free past chunkBytes.
      pos += buf.write(`${sqlInstant(r.takenAtMs)}\t${r.levelMm}\t${r.grossL}\t${r.usableL}\t${r.temperatureC === null ? '\\N' : r.temperatureC}\n`, pos, 'latin1');
      rowsInChunk++;
      if (r.takenAtMs > newestMs) newestMs = r.takenAtMs;
      const day = dayOf(r.takenAtMs);
      const last = lastOfDay.get(day);
      if (last === undefined || r.takenAtMs > last) lastOfDay.set(day, r.takenAtMs);
      return rowsInChunk >= chunkRows || pos >= chunkBytes ? flush() : undefined;
    },
    /** Loads what is left, then updates the latest reading and daily snapshots; returns the counts and timings. */
    async finish(): Promise<LoadSummary> {
      if (rowsInChunk) await flush();
      await settle();
      const started = performance.now();
      if (newestMs > -Infinity) await refreshLoadedSnapshots(ctx, base, newestMs, lastOfDay, transaction);
      return { rowsNew, waitMs, loadMs, snapshotsMs: performance.now() - started };
    },
  };
}

/**
 * Latest reading and daily snapshots after a load, from the rows as stored at the instants the file
 * ends each day (the stored row wins over a duplicate in the file, as it does in readings).
 */
async function refreshLoadedSnapshots(ctx: Pick<AppContext, 'db'>, base: LoadBase, newestMs: number, lastOfDay: Map<string, number>, transaction: Transaction) {
  type Stored = { id: number; takenAt: Date; levelMm: number; grossL: number; usableL: number; temperatureC: number | null };
  const storedAt = async (instants: number[]) =>
    ctx.db.sequelize.query<Stored>(
      `SELECT id, takenAt, levelMm, grossL, usableL, temperatureC FROM readings WHERE tankId = ? AND source = 'logger' AND revision = 0 AND takenAt IN (${instants.map(() => '?').join(',')})`,
      { replacements: [base.tankId, ...instants.map((ms) => new Date(ms))], type: QueryTypes.SELECT, transaction },
    );
  const own = { tankId: base.tankId, organisationId: base.organisationId, farmId: base.farmId };
  const [newest] = await storedAt([newestMs]);
  if (newest) await upsertLatest(ctx, [{ ...own, ...newest, takenAt: new Date(newest.takenAt), source: 'logger' }], transaction);
  const days = [...lastOfDay.entries()];
  for (let i = 0; i < days.length; i += 500) {
    const chunk = days.slice(i, i + 500);
    const byMs = new Map((await storedAt(chunk.map(([, ms]) => ms))).map((s) => [new Date(s.takenAt).getTime(), s]));
    const rows: SnapshotRow[] = [];
    for (const [day, ms] of chunk) {
      const s = byMs.get(ms);
      if (s) rows.push({ ...own, day, takenAt: new Date(ms), grossL: s.grossL, usableL: s.usableL });
    }
    await upsertDays(ctx, rows, transaction);
  }
}

/** Recomputes a tank's latest reading and one day's snapshot from the effective readings (after a correction). */
async function rebuildSnapshots(ctx: AppContext, tank: Tank, day: string, timeZone: string, transaction: Transaction) {
  const { Reading, TankLatest, TankDay } = ctx.db.models;
  const latest = await Reading.findOne({ where: { tankId: tank.id, correctedById: null }, order: [['takenAt', 'DESC'], ['id', 'DESC']], transaction });
  if (latest) {
    await TankLatest.upsert(
      { tankId: tank.id, organisationId: tank.organisationId, farmId: tank.farmId, readingId: latest.id, takenAt: latest.takenAt, levelMm: latest.levelMm, grossL: latest.grossL, usableL: latest.usableL, temperatureC: latest.temperatureC, source: latest.source },
      { transaction },
    );
  }
  const ofDay = await Reading.findAll({ where: { tankId: tank.id, correctedById: null }, order: [['takenAt', 'DESC']], limit: 200, transaction });
  const last = ofDay.find((r) => localDay(r.takenAt, timeZone) === day);
  if (last) await TankDay.upsert({ tankId: tank.id, day, organisationId: tank.organisationId, farmId: tank.farmId, takenAt: last.takenAt, grossL: last.grossL, usableL: last.usableL }, { transaction });
}

export const tankSetup = (t: Tank) => ({
  geometry: t.geometry,
  datumOffsetMm: t.datumOffsetMm,
  outletHeightMm: t.outletHeightMm,
  safeFillLevelMm: t.safeFillLevelMm,
  specificGravity: t.specificGravity,
  sensorHeightMm: t.sensorHeightMm ?? undefined,
});

export async function toReadingDto(ctx: AppContext, rows: Reading[]): Promise<ReadingDto[]> {
  const ids = [...new Set(rows.map((r) => r.enteredById).filter((v): v is number => v !== null))];
  const names = new Map((await ctx.db.models.User.findAll({ where: { id: ids }, attributes: ['id', 'name'] })).map((u) => [u.id, u.name]));
  return rows.map((r) => ({
    id: Number(r.id),
    tankId: r.tankId,
    takenAt: r.takenAt.toISOString(),
    levelMm: r.levelMm,
    grossL: r.grossL,
    usableL: r.usableL,
    temperatureC: r.temperatureC,
    source: r.source,
    enteredBy: (r.enteredById && names.get(r.enteredById)) || (r.source === 'logger' ? 'logger file' : ''),
    importId: r.importId,
    note: r.note,
    calibrationVersion: r.calibrationVersion,
    correctedById: r.correctedById ? Number(r.correctedById) : null,
    correctsId: r.correctsId ? Number(r.correctsId) : null,
  }));
}

/**
 * Stores a worker's round: each entry is converted with the same shared function the phone
 * form uses; refused entries are reported with their reason, retried entries as duplicates, and an
 * entry that meets another reading of its tank at the same instant as a conflict (not stored).
 * Idempotency keys are the sender's own: another person's key neither answers nor blocks an entry.
 */
export async function submitRound(ctx: AppContext, actor: SessionUser, input: RoundSubmitInput): Promise<RoundEntryResult[]> {
  const farm = await assertFarmAccess(ctx, actor, input.farmId);
  if (farm.archivedAt) throw new AppError(409, 'farm_archived', 'This farm is archived; restore it before entering readings');
  const takenAt = input.takenAt ? new Date(input.takenAt) : new Date();
  if (takenAt.getTime() > Date.now() + 5 * 60_000) throw new AppError(400, 'invalid_input', 'takenAt: a round cannot be in the future', 'takenAt');
  const { Tank, Reading } = ctx.db.models;
  const tanks = new Map((await Tank.findAll({ where: { farmId: farm.id, organisationId: actor.organisationId } })).map((t) => [t.id, t]));
  const keys = input.entries.map((e) => e.idempotencyKey);
  const earlier = new Map((await Reading.findAll({ where: { idempotencyKey: keys, enteredById: actor.id } })).map((r) => [r.idempotencyKey!, r]));

  const results: RoundEntryResult[] = [];
  const rows: NewReading[] = [];
  const sent: { result: RoundEntryResult; tank: Tank; key: string }[] = [];
  const seenTanks = new Set<number>();
  const seenKeys = new Set<string>();
  for (const e of input.entries) {
    const tank = tanks.get(e.tankId);
    if (!tank) {
      results.push({ tankId: e.tankId, status: 'refused', reason: 'This tank is not on this farm' });
      continue;
    }
    const prior = earlier.get(e.idempotencyKey);
    if (prior) {
      // The sender's key of another tank's reading (perhaps on a farm no longer theirs) gives nothing of that reading back.
      results.push(
        prior.tankId === tank.id
          ? { tankId: e.tankId, status: 'duplicate', reading: (await toReadingDto(ctx, [prior]))[0] }
          : { tankId: e.tankId, status: 'refused', reason: `${tankLabel(tank)}: this entry's key was sent before with a reading of another tank; start a new round and type the reading again` },
      );
      continue;
    }
    if (tank.archivedAt) {
      results.push({ tankId: e.tankId, status: 'refused', reason: 'This tank is archived' });
      continue;
    }
    if (seenTanks.has(tank.id)) {
      results.push({ tankId: e.tankId, status: 'refused', reason: 'This tank appears twice in the round' });
      continue;
    }
    if (seenKeys.has(e.idempotencyKey)) {
      results.push({ tankId: e.tankId, status: 'refused', reason: `${tankLabel(tank)}: this entry's key is used by another entry of the round` });
      continue;
    }
    const v = readingToVolumes(tankSetup(tank), { kind: 'sight-tube', readingMm: e.readingMm } satisfies ReadingInput);
    if (!v.ok) {
      results.push({ tankId: e.tankId, status: 'refused', reason: v.reason });
      continue;
    }
    seenTanks.add(tank.id);
    seenKeys.add(e.idempotencyKey);
    rows.push({
      organisationId: actor.organisationId, farmId: farm.id, tankId: tank.id, takenAt, source: 'round', levelMm: v.levelMm, grossL: v.grossL, usableL: v.usableL,
      temperatureC: e.temperatureC ?? null, calibrationVersion: tank.calibrationVersion, enteredById: actor.id, importId: null, note: e.note, idempotencyKey: e.idempotencyKey,
    });
    const result: RoundEntryResult = { tankId: e.tankId, status: 'stored' };
    results.push(result);
    sent.push({ result, tank, key: e.idempotencyKey });
  }
  if (rows.length) {
    const mine = await ctx.db.sequelize.transaction(async (transaction) => {
      await insertReadings(ctx, rows, new Map([[farm.id, farm.timeZone]]), transaction);
      // What is stored under the sender's keys, this request's rows or a simultaneous retry's. A row
      // missing here was skipped because another reading of its tank holds the same instant.
      return Reading.findAll({ where: { enteredById: actor.id, idempotencyKey: rows.map((r) => r.idempotencyKey!) }, transaction });
    });
    const dtos = await toReadingDto(ctx, mine);
    const byKey = new Map(mine.map((r, i) => [r.idempotencyKey!, { row: r, dto: dtos[i] }]));
    for (const { result, tank, key } of sent) {
      const found = byKey.get(key);
      if (found && found.row.tankId === tank.id) {
        result.reading = found.dto;
        continue;
      }
      // A simultaneous request stored this key with another tank: sending it again would not help.
      result.status = found ? 'refused' : 'conflict';
      result.reason = found
        ? `${tankLabel(tank)}: this entry's key was stored just now with a reading of another tank; start a new round and type the reading again`
        : `${tankLabel(tank)}: not stored, because another reading of this tank is stored for the very same moment; check the tube and send it again to store it at a new time`;
    }
    if (sent.some((s) => s.result.status === 'stored')) ctx.events.emit('readings', { organisationId: actor.organisationId, farmIds: [farm.id] });
  }
  return results;
}

const tankLabel = (tank: Tank) => `${tank.name} (${tank.code})`;

/** Readings of a tank, newest first, corrected ones included (they show the audit trail). */
export async function listReadings(ctx: AppContext, actor: SessionUser, tankId: number, q: { from?: string; to?: string; limit: number }): Promise<ReadingDto[]> {
  const tank = await tankFor(ctx, actor, tankId);
  const rows = await ctx.db.models.Reading.findAll({
    where: { tankId: tank.id, ...(q.from || q.to ? { takenAt: { ...(q.from ? { [Op.gte]: new Date(q.from) } : {}), ...(q.to ? { [Op.lte]: new Date(q.to) } : {}) } } : {}) },
    order: [['takenAt', 'DESC'], ['id', 'DESC']],
    limit: q.limit,
  });
  return toReadingDto(ctx, rows);
}

const BUCKET_SQL: Record<'hour' | 'day' | 'week', string> = {
  hour: "DATE_FORMAT(takenAt, '%Y-%m-%d %H:00:00')",
  day: 'DATE(takenAt)',
  week: 'YEARWEEK(takenAt, 3)',
};

/** The tank's effective level and volume series; bucketed series keep each bucket's last reading (UTC buckets). */
export async function tankSeries(ctx: AppContext, actor: SessionUser, tankId: number, q: { from?: string; to?: string; bucket: 'raw' | 'hour' | 'day' | 'week' }): Promise<SeriesPoint[]> {
  const tank = await tankFor(ctx, actor, tankId);
  const from = q.from ? new Date(q.from) : new Date(Date.now() - 90 * 86_400_000);
  const to = q.to ? new Date(q.to) : new Date();
  const base = 'FROM readings WHERE tankId = ? AND correctedById IS NULL AND takenAt BETWEEN ? AND ?';
  const sql =
    q.bucket === 'raw'
      ? `SELECT takenAt, levelMm, grossL, usableL, temperatureC ${base} ORDER BY takenAt LIMIT 20000`
      : `SELECT r.takenAt, r.levelMm, r.grossL, r.usableL, r.temperatureC FROM readings r JOIN (SELECT MAX(takenAt) AS t ${base} GROUP BY ${BUCKET_SQL[q.bucket]}) b ON r.takenAt = b.t WHERE r.tankId = ? AND r.correctedById IS NULL ORDER BY r.takenAt`;
  const rows = await ctx.db.sequelize.query<{ takenAt: Date; levelMm: number; grossL: number; usableL: number; temperatureC: number | null }>(sql, {
    replacements: q.bucket === 'raw' ? [tank.id, from, to] : [tank.id, from, to, tank.id],
    type: QueryTypes.SELECT,
  });
  return rows.map((r) => ({ t: new Date(r.takenAt).toISOString(), levelMm: r.levelMm, grossL: r.grossL, usableL: r.usableL, temperatureC: r.temperatureC }));
}

/** Replaces a wrong reading by a correction; the original stays, marked as corrected. */
export async function correctReading(ctx: AppContext, actor: SessionUser, readingId: number, input: CorrectionInput): Promise<ReadingDto> {
  const { Reading, Farm } = ctx.db.models;
  const original = await Reading.findOne({ where: { id: readingId, organisationId: actor.organisationId } });
  if (!original) throw notFound('Reading');
  const tank = await tankFor(ctx, actor, original.tankId);
  if (original.correctedById) throw new AppError(409, 'already_corrected', 'This reading has been corrected already; correct the newer one');
  const farm = (await Farm.findByPk(tank.farmId))!;
  // The correction is computed with the calibration the original reading was taken under.
  const cal = await ctx.db.models.TankCalibration.findOne({ where: { tankId: tank.id, version: original.calibrationVersion } });
  const setup = cal ? { ...tankSetup(tank), geometry: cal.geometry, datumOffsetMm: cal.datumOffsetMm } : tankSetup(tank);
  const version = cal ? cal.version : tank.calibrationVersion;
  const v = readingToVolumes(setup, input.levelMm !== undefined ? { kind: 'level', levelMm: input.levelMm } : { kind: 'sight-tube', readingMm: input.readingMm! });
  if (!v.ok) throw new AppError(422, 'reading_out_of_range', `${input.levelMm !== undefined ? 'levelMm' : 'readingMm'}: ${v.reason}`, input.levelMm !== undefined ? 'levelMm' : 'readingMm');
  const created = await ctx.db.sequelize.transaction(async (transaction) => {
    const revision = ((await Reading.max<number, Reading>('revision', { where: { tankId: tank.id, takenAt: original.takenAt, source: 'correction' }, transaction })) ?? 0) + 1;
    const row = await Reading.create(
      {
        organisationId: tank.organisationId, farmId: tank.farmId, tankId: tank.id, takenAt: original.takenAt, source: 'correction', revision, levelMm: v.levelMm, grossL: v.grossL, usableL: v.usableL,
        temperatureC: input.temperatureC === undefined ? original.temperatureC : input.temperatureC, calibrationVersion: version, enteredById: actor.id, importId: null,
        note: input.note, idempotencyKey: null, correctsId: original.id,
      },
      { transaction },
    );
    const [claimed] = await Reading.update({ correctedById: row.id }, { where: { id: original.id, correctedById: null }, transaction });
    if (claimed !== 1) throw new AppError(409, 'already_corrected', 'This reading has just been corrected by someone else');
    await rebuildSnapshots(ctx, tank, localDay(original.takenAt, farm.timeZone), farm.timeZone, transaction);
    return row;
  });
  ctx.events.emit('readings', { organisationId: tank.organisationId, farmIds: [tank.farmId] });
  return (await toReadingDto(ctx, [created]))[0];
}
