// Readings: rounds, corrections, listings and series. Storing is in readings-insert.ts (insertReadings
// for rounds and corrections, each batch in one statement) and readings-loader.ts (readingLoader for
// logger files, LOAD DATA in chunks). Either way the tank's latest reading and daily snapshot are kept
// current in the same transaction, so the board never scans history.
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { readingToVolumes, tankSetupOf, type ReadingInput } from '@shared/readings';
import { farmDayOf } from '@shared/time';
import type { CorrectionInput, Reading as ReadingDto, RoundEntryResult, RoundSubmitInput, SeriesPoint, SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { AppError, notFound } from '../errors';
import { assertFarmAccess } from './access';
import type { Reading, Tank } from '../models';
import { insertReadings, type NewReading } from './readings-insert';
import { calibrationsAt } from './tank-calibrations';
import { tankFor } from './tanks';

export { insertReadings, type NewReading } from './readings-insert';
export { LOAD_CHUNK_ROWS, readingLoader, type LoadBase, type LoadRow, type LoadSummary } from './readings-loader';

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
  const last = ofDay.find((r) => farmDayOf(r.takenAt, timeZone) === day);
  if (last) await TankDay.upsert({ tankId: tank.id, day, organisationId: tank.organisationId, farmId: tank.farmId, takenAt: last.takenAt, grossL: last.grossL, usableL: last.usableL }, { transaction });
}

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
  // A round typed without signal may arrive after the tank was changed: it is worked out with the calibration of its own time.
  const calibrations = await calibrationsAt(ctx, [...tanks.values()], takenAt);

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
    const calibration = calibrations.get(tank.id)!;
    const v = readingToVolumes(calibration.setup, { kind: 'sight-tube', readingMm: e.readingMm } satisfies ReadingInput);
    if (!v.ok) {
      results.push({ tankId: e.tankId, status: 'refused', reason: v.reason, problem: v.problem });
      continue;
    }
    seenTanks.add(tank.id);
    seenKeys.add(e.idempotencyKey);
    rows.push({
      organisationId: actor.organisationId, farmId: farm.id, tankId: tank.id, takenAt, source: 'round', levelMm: v.levelMm, grossL: v.grossL, usableL: v.usableL,
      temperatureC: e.temperatureC ?? null, calibrationVersion: calibration.version, enteredById: actor.id, importId: null, note: e.note, idempotencyKey: e.idempotencyKey,
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

// Day and week points come from tank_days, each tank's last reading of each farm-local day, so a day
// bucket ends at the farm's midnight, not UTC's. Hour buckets are clock hours, the same instant in
// every zone whose offset is a whole number of hours (zones offset by 30 or 45 minutes see them shifted).
const EFFECTIVE = 'r.tankId = ? AND r.correctedById IS NULL';
const SERIES_COLUMNS = 'r.takenAt, r.levelMm, r.grossL, r.usableL, r.temperatureC';
const SERIES_SQL: Record<'raw' | 'hour' | 'day' | 'week', string> = {
  raw: `SELECT ${SERIES_COLUMNS} FROM readings r WHERE ${EFFECTIVE} AND r.takenAt BETWEEN ? AND ? ORDER BY r.takenAt LIMIT 20000`,
  hour: `SELECT ${SERIES_COLUMNS} FROM readings r JOIN (SELECT MAX(takenAt) AS t FROM readings WHERE tankId = ? AND correctedById IS NULL AND takenAt BETWEEN ? AND ? GROUP BY DATE_FORMAT(takenAt, '%Y-%m-%d %H')) b ON r.takenAt = b.t WHERE ${EFFECTIVE} ORDER BY r.takenAt`,
  day: `SELECT ${SERIES_COLUMNS} FROM tank_days d JOIN readings r ON r.takenAt = d.takenAt WHERE d.tankId = ? AND d.takenAt BETWEEN ? AND ? AND ${EFFECTIVE} ORDER BY r.takenAt`,
  week: `SELECT ${SERIES_COLUMNS} FROM readings r JOIN (SELECT MAX(takenAt) AS t FROM tank_days WHERE tankId = ? AND takenAt BETWEEN ? AND ? GROUP BY YEARWEEK(day, 3)) b ON r.takenAt = b.t WHERE ${EFFECTIVE} ORDER BY r.takenAt`,
};

/** The tank's effective level and volume series; bucketed series keep each bucket's last reading (days and ISO weeks are the farm's own). */
export async function tankSeries(ctx: AppContext, actor: SessionUser, tankId: number, q: { from?: string; to?: string; bucket: 'raw' | 'hour' | 'day' | 'week' }): Promise<SeriesPoint[]> {
  const tank = await tankFor(ctx, actor, tankId);
  const from = q.from ? new Date(q.from) : new Date(Date.now() - 90 * 86_400_000);
  const to = q.to ? new Date(q.to) : new Date();
  const rows = await ctx.db.sequelize.query<{ takenAt: Date; levelMm: number; grossL: number; usableL: number; temperatureC: number | null }>(SERIES_SQL[q.bucket], {
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
  const setup = cal ? { ...tankSetupOf(tank), geometry: cal.geometry, datumOffsetMm: cal.datumOffsetMm } : tankSetupOf(tank);
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
    await rebuildSnapshots(ctx, tank, farmDayOf(original.takenAt, farm.timeZone), farm.timeZone, transaction);
    return row;
  });
  ctx.events.emit('readings', { organisationId: tank.organisationId, farmIds: [tank.farmId] });
  return (await toReadingDto(ctx, [created]))[0];
}
