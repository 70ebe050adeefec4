// A tank's calibrations, numbered 1, 2, 3… in the order they were made, and its calibration table
// by sight-tube reading. Readings keep the key of the calibration they were stored with.
import { buildTubeReadingTable, heightMm, MAX_TABLE_ROWS } from '@shared/calibration';
import { tankSetupOf, type TankSetup } from '@shared/readings';
import type { CalibrationTableDto, SessionUser, TankCalibrationVersion } from '@shared/schemas';
import { convert } from '@shared/units';
import type { AppContext } from '../context';
import { AppError } from '../errors';
import type { Tank } from '../models';
import { tankFor } from './tanks';

/**
 * Every calibration of the tank, oldest first, numbered by the order they were made (creation time,
 * then row id for two made in one second). The tank's current one is marked; should it have no stored
 * row (data from before calibrations were kept), it is listed last with the tank's own time.
 */
export async function versionsOf(ctx: AppContext, tank: Tank): Promise<TankCalibrationVersion[]> {
  const rows = await ctx.db.models.TankCalibration.findAll({ where: { tankId: tank.id }, order: [['createdAt', 'ASC'], ['id', 'ASC']] });
  const list = rows.map((r, i) => ({
    number: i + 1,
    key: r.version,
    createdAt: r.createdAt.toISOString(),
    current: r.version === tank.calibrationVersion,
    geometry: r.geometry,
    datumOffsetMm: r.datumOffsetMm,
  }));
  if (!list.some((v) => v.current)) {
    list.push({ number: list.length + 1, key: tank.calibrationVersion, createdAt: tank.updatedAt.toISOString(), current: true, geometry: tank.geometry, datumOffsetMm: tank.datumOffsetMm });
  }
  return list;
}

/** The tank's calibrations with their numbers, oldest first. */
export async function calibrationVersions(ctx: AppContext, actor: SessionUser, id: number): Promise<TankCalibrationVersion[]> {
  return versionsOf(ctx, await tankFor(ctx, actor, id));
}

/**
 * The current calibration table every `step` of tube reading (mm for metric, inches for US), with the
 * level above the floor and the volume of each row in those units.
 */
export async function calibrationTable(ctx: AppContext, actor: SessionUser, id: number, opts: { step: number; unit: 'metric' | 'us' }): Promise<CalibrationTableDto> {
  const tank = await tankFor(ctx, actor, id);
  const lengthUnit = opts.unit === 'us' ? 'in' : 'mm';
  const volumeUnit = opts.unit === 'us' ? 'usgal' : 'L';
  const stepMm = convert(opts.step, lengthUnit, 'mm');
  if (heightMm(tank.geometry) / stepMm > MAX_TABLE_ROWS) {
    throw new AppError(400, 'invalid_input', `step: too small for this tank (more than ${MAX_TABLE_ROWS.toLocaleString('en-US')} rows)`, 'step');
  }
  if (tank.datumOffsetMm > heightMm(tank.geometry)) {
    throw new AppError(422, 'invalid_input', 'datumOffsetMm: the tube’s zero mark is above the top of the tank, so the tube can show no level; set the zero mark’s height again', 'datumOffsetMm');
  }
  const current = (await versionsOf(ctx, tank)).find((v) => v.current)!;
  const rows = buildTubeReadingTable(tank.geometry, tank.datumOffsetMm, stepMm);
  return {
    tankId: tank.id,
    number: current.number,
    calibratedAt: current.createdAt,
    lengthUnit,
    volumeUnit,
    datumOffset: convert(tank.datumOffsetMm, 'mm', lengthUnit),
    rows: rows.map((r) => ({ reading: convert(r.readingMm, 'mm', lengthUnit), level: convert(r.levelMm, 'mm', lengthUnit), volume: convert(r.volumeL, 'L', volumeUnit) })),
  };
}

/**
 * The calibration each tank had at `at`: its current one, unless that was made after `at` (a round typed
 * without signal and sent after someone changed the tank), then the newest one made at or before `at`.
 */
export async function calibrationsAt(ctx: AppContext, tanks: Tank[], at: Date): Promise<Map<number, { setup: TankSetup; version: string }>> {
  const rows = tanks.length ? await ctx.db.models.TankCalibration.findAll({ where: { tankId: tanks.map((t) => t.id) }, order: [['createdAt', 'ASC'], ['id', 'ASC']] }) : [];
  const out = new Map<number, { setup: TankSetup; version: string }>();
  for (const tank of tanks) {
    const own = rows.filter((r) => r.tankId === tank.id);
    const current = own.find((r) => r.version === tank.calibrationVersion);
    const then = current && current.createdAt > at ? own.filter((r) => r.createdAt <= at).at(-1) : undefined;
    out.set(
      tank.id,
      then ? { setup: { ...tankSetupOf(tank), geometry: then.geometry, datumOffsetMm: then.datumOffsetMm }, version: then.version } : { setup: tankSetupOf(tank), version: tank.calibrationVersion },
    );
  }
  return out;
}
