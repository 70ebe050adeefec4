// Tanks: shape and sight-tube settings, calibration versions and contents history (numbered
// versions and the calibration table are in tank-calibrations.ts).
import type { Transaction } from 'sequelize';
import { calibrationVersion, capacityL, heightMm } from '@shared/calibration';
import { defaultExposedToFrost } from '@shared/flags';
import type { SessionUser, Tank as TankDto, TankContentsPeriod as PeriodDto, TankCreateInput, TankUpdateInput } from '@shared/schemas';
import type { AppContext } from '../context';
import { AppError, forbidden, notFound } from '../errors';
import { assertFarmAccess } from './access';
import type { Tank } from '../models';

export function toTankDto(t: Tank): TankDto {
  return {
    id: t.id,
    farmId: t.farmId,
    name: t.name,
    code: t.code,
    contents: t.contents,
    contentsNote: t.contentsNote,
    geometry: t.geometry,
    datumOffsetMm: t.datumOffsetMm,
    outletHeightMm: t.outletHeightMm,
    safeFillLevelMm: t.safeFillLevelMm,
    lowStockL: t.lowStockL,
    specificGravity: t.specificGravity,
    sensorHeightMm: t.sensorHeightMm,
    walkOrder: t.walkOrder,
    exposedToFrost: Boolean(t.exposedToFrost),
    calibrationVersion: t.calibrationVersion,
    heightMm: heightMm(t.geometry),
    capacityL: capacityL(t.geometry),
    archivedAt: t.archivedAt ? t.archivedAt.toISOString() : null,
  };
}

/** Tanks the actor may see, in walking order; optionally of one farm. */
export async function listTanks(ctx: AppContext, actor: SessionUser, opts: { farmId?: number; includeArchived?: boolean } = {}): Promise<TankDto[]> {
  if (opts.farmId !== undefined) await assertFarmAccess(ctx, actor, opts.farmId);
  const tanks = await ctx.db.models.Tank.findAll({
    where: {
      organisationId: actor.organisationId,
      farmId: opts.farmId ?? actor.farmIds,
      ...(opts.includeArchived ? {} : { archivedAt: null }),
    },
    order: [['farmId', 'ASC'], ['walkOrder', 'ASC'], ['name', 'ASC']],
  });
  return tanks.map(toTankDto);
}

/** A tank the actor may see: 404 outside the organisation, 403 on a farm not granted. */
export async function tankFor(ctx: AppContext, actor: SessionUser, id: number): Promise<Tank> {
  const tank = await ctx.db.models.Tank.findOne({ where: { id, organisationId: actor.organisationId } });
  if (!tank) throw notFound('Tank');
  if (!actor.farmIds.includes(tank.farmId)) throw forbidden('You do not have access to this tank');
  return tank;
}

async function codeIsFree(ctx: AppContext, farmId: number, code: string, exceptId?: number) {
  const clash = await ctx.db.models.Tank.findOne({ where: { farmId, code } });
  if (clash && clash.id !== exceptId) throw new AppError(409, 'code_taken', `code: another tank on this farm already uses the code ${code}`, 'code');
}

async function recordCalibration(ctx: AppContext, tank: Tank, transaction: Transaction) {
  await ctx.db.models.TankCalibration.findOrCreate({
    where: { tankId: tank.id, version: tank.calibrationVersion },
    defaults: { organisationId: tank.organisationId, tankId: tank.id, version: tank.calibrationVersion, geometry: tank.geometry, datumOffsetMm: tank.datumOffsetMm },
    transaction,
  });
}

export async function createTank(ctx: AppContext, actor: SessionUser, input: TankCreateInput): Promise<TankDto> {
  await assertFarmAccess(ctx, actor, input.farmId);
  await codeIsFree(ctx, input.farmId, input.code);
  const { Tank, TankContentsPeriod } = ctx.db.models;
  const tank = await ctx.db.sequelize.transaction(async (transaction) => {
    const t = await Tank.create(
      {
        ...input,
        exposedToFrost: input.exposedToFrost ?? defaultExposedToFrost(input.contents),
        organisationId: actor.organisationId,
        safeFillLevelMm: input.safeFillLevelMm ?? heightMm(input.geometry),
        calibrationVersion: calibrationVersion(input.geometry, input.datumOffsetMm),
        archivedAt: null,
      },
      { transaction },
    );
    await recordCalibration(ctx, t, transaction);
    await TankContentsPeriod.create(
      { organisationId: actor.organisationId, tankId: t.id, contents: t.contents, contentsNote: t.contentsNote, specificGravity: t.specificGravity, fromAt: new Date(), toAt: null, changedById: actor.id },
      { transaction },
    );
    return t;
  });
  return toTankDto(tank);
}

/**
 * Updates a tank. A new geometry or datum makes a new calibration version (old readings keep
 * theirs); new contents close the current contents period and open another.
 */
export async function updateTank(ctx: AppContext, actor: SessionUser, id: number, input: TankUpdateInput): Promise<TankDto> {
  const tank = await tankFor(ctx, actor, id);
  if (input.code) await codeIsFree(ctx, tank.farmId, input.code, tank.id);
  const { archived, ...fields } = input;
  const geometry = fields.geometry ?? tank.geometry;
  const top = heightMm(geometry);
  const outlet = fields.outletHeightMm ?? tank.outletHeightMm;
  const safeFill = fields.safeFillLevelMm ?? (fields.geometry ? Math.min(tank.safeFillLevelMm, top) : tank.safeFillLevelMm);
  if (outlet >= top) throw new AppError(400, 'invalid_input', `outletHeightMm: must be below the top of the tank (${Math.round(top)} mm)`, 'outletHeightMm');
  if (safeFill > top) throw new AppError(400, 'invalid_input', `safeFillLevelMm: must be at or below the top of the tank (${Math.round(top)} mm)`, 'safeFillLevelMm');
  if (safeFill <= outlet) throw new AppError(400, 'invalid_input', 'safeFillLevelMm: must be above the outlet height', 'safeFillLevelMm');

  const contentsChanged =
    (fields.contents !== undefined && fields.contents !== tank.contents) ||
    (fields.contentsNote !== undefined && fields.contentsNote !== tank.contentsNote) ||
    (fields.specificGravity !== undefined && fields.specificGravity !== tank.specificGravity);
  const version = calibrationVersion(geometry, fields.datumOffsetMm ?? tank.datumOffsetMm);
  await ctx.db.sequelize.transaction(async (transaction) => {
    await tank.update(
      {
        ...fields,
        safeFillLevelMm: safeFill,
        calibrationVersion: version,
        ...(archived === undefined ? {} : { archivedAt: archived ? (tank.archivedAt ?? new Date()) : null }),
      },
      { transaction },
    );
    await recordCalibration(ctx, tank, transaction);
    if (contentsChanged) {
      const now = new Date();
      const { TankContentsPeriod } = ctx.db.models;
      await TankContentsPeriod.update({ toAt: now }, { where: { tankId: tank.id, toAt: null }, transaction });
      await TankContentsPeriod.create(
        { organisationId: tank.organisationId, tankId: tank.id, contents: tank.contents, contentsNote: tank.contentsNote, specificGravity: tank.specificGravity, fromAt: now, toAt: null, changedById: actor.id },
        { transaction },
      );
    }
  });
  return toTankDto(tank);
}

/** The tank's contents periods, newest first. */
export async function contentsHistory(ctx: AppContext, actor: SessionUser, id: number): Promise<PeriodDto[]> {
  const tank = await tankFor(ctx, actor, id);
  const rows = await ctx.db.models.TankContentsPeriod.findAll({ where: { tankId: tank.id }, order: [['fromAt', 'DESC'], ['id', 'DESC']] });
  const userIds = [...new Set(rows.map((r) => r.changedById).filter((v): v is number => v !== null))];
  const users = new Map((await ctx.db.models.User.findAll({ where: { id: userIds } })).map((u) => [u.id, u.name]));
  return rows.map((r) => ({
    contents: r.contents,
    contentsNote: r.contentsNote,
    specificGravity: r.specificGravity,
    from: r.fromAt.toISOString(),
    to: r.toAt ? r.toAt.toISOString() : null,
    changedBy: (r.changedById && users.get(r.changedById)) || '',
  }));
}
