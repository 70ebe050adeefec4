// Brews: batches made in a tank. Each input used becomes a use movement on that input's stock,
// in the same transaction as the brew, so a brew never takes stock that is not there, and a batch
// larger than the tank's free space below its safe fill line is refused before anything is stored.
import { Op } from 'sequelize';
import { batchFit, batchOverText, batchVolumeL } from '@shared/mixing';
import type { Brew as BrewDto, BrewCreateInput, BrewUpdateInput, SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { AppError, forbidden, notFound } from '../errors';
import type { Brew, Tank } from '../models';
import { recordMovement } from './inventory';
import { tankFor, updateTank } from './tanks';

async function toDtos(ctx: AppContext, brews: Brew[]): Promise<BrewDto[]> {
  if (!brews.length) return [];
  const { Tank, Farm, User, StockMovement, Input, BrewTemperature, Reading } = ctx.db.models;
  const ids = brews.map((b) => b.id);
  const tanks = new Map((await Tank.findAll({ where: { id: [...new Set(brews.map((b) => b.tankId))] } })).map((t) => [t.id, t]));
  const farms = new Map((await Farm.findAll({ where: { id: [...new Set(brews.map((b) => b.farmId))] } })).map((f) => [f.id, f.name]));
  const users = new Map((await User.findAll({ where: { id: [...new Set(brews.map((b) => b.createdById).filter((v): v is number => v !== null))] } })).map((u) => [u.id, u.name]));
  const uses = await StockMovement.findAll({ where: { brewId: ids } });
  const inputs = new Map((await Input.findAll({ where: { id: [...new Set(uses.map((u) => u.inputId))] } })).map((i) => [i.id, i]));
  const temps = await BrewTemperature.findAll({ where: { brewId: ids }, order: [['at', 'ASC']] });
  const out: BrewDto[] = [];
  for (const b of brews) {
    const tank = tanks.get(b.tankId);
    // A culture's round temperatures since the brew began count as its log too.
    const readings = b.kind === 'culture'
      ? await Reading.findAll({ where: { tankId: b.tankId, correctedById: null, temperatureC: { [Op.ne]: null }, takenAt: { [Op.gte]: b.startedAt } }, attributes: ['takenAt', 'temperatureC'], order: [['takenAt', 'ASC']], limit: 500 })
      : [];
    const temperatures = [
      ...temps.filter((t) => t.brewId === b.id).map((t) => ({ at: t.at.toISOString(), temperatureC: t.temperatureC, source: 'brew' as const })),
      ...readings.map((r) => ({ at: r.takenAt.toISOString(), temperatureC: r.temperatureC!, source: 'reading' as const })),
    ].sort((x, y) => x.at.localeCompare(y.at));
    out.push({
      id: b.id, farmId: b.farmId, farmName: farms.get(b.farmId) ?? '', tankId: b.tankId, tankName: tank?.name ?? '', tankCode: tank?.code ?? '', kind: b.kind, name: b.name, status: b.status,
      startedAt: b.startedAt.toISOString(), readyAt: b.readyAt ? b.readyAt.toISOString() : null, waterL: b.waterL, dilution: b.dilution, notes: b.notes, createdBy: (b.createdById && users.get(b.createdById)) || '',
      inputs: uses.filter((u) => u.brewId === b.id).map((u) => ({ inputId: u.inputId, inputName: inputs.get(u.inputId)?.name ?? '', unit: inputs.get(u.inputId)?.unit ?? '', quantity: u.quantity })),
      temperatures,
    });
  }
  return out;
}

async function brewFor(ctx: AppContext, actor: SessionUser, id: number) {
  const brew = await ctx.db.models.Brew.findOne({ where: { id, organisationId: actor.organisationId } });
  if (!brew) throw notFound('Brew');
  if (!actor.farmIds.includes(brew.farmId)) throw forbidden('You do not have access to this farm');
  return brew;
}

export async function listBrews(ctx: AppContext, actor: SessionUser, q: { farmId?: number; tankId?: number; status?: string }): Promise<BrewDto[]> {
  const brews = await ctx.db.models.Brew.findAll({
    where: { organisationId: actor.organisationId, farmId: q.farmId ? [q.farmId].filter((f) => actor.farmIds.includes(f)) : actor.farmIds, ...(q.tankId ? { tankId: q.tankId } : {}), ...(q.status ? { status: q.status } : {}) },
    order: [['startedAt', 'DESC'], ['id', 'DESC']],
    limit: 200,
  });
  return toDtos(ctx, brews);
}

/**
 * Refuses with 422 naming waterL a batch (water plus inputs counted by volume) larger than the tank's
 * free space by its latest reading before the start; without such a reading there is nothing to measure.
 */
async function assertBatchFits(ctx: AppContext, actor: SessionUser, tank: Tank, body: BrewCreateInput, startedAt: Date): Promise<void> {
  const latest = await ctx.db.models.TankLatest.findByPk(tank.id);
  const inputIds = [...new Set(body.inputs.map((l) => l.inputId))];
  const units = new Map((await ctx.db.models.Input.findAll({ where: { id: inputIds, organisationId: actor.organisationId }, attributes: ['id', 'unit'] })).map((i) => [i.id, i.unit]));
  const batchL = batchVolumeL(body.waterL, body.inputs.map((l) => ({ quantity: l.quantity, unit: units.get(l.inputId) ?? '' })));
  const fit = batchFit({
    geometry: tank.geometry,
    safeFillLevelMm: tank.safeFillLevelMm,
    latest: latest ? { grossL: latest.grossL, takenAt: latest.takenAt.toISOString() } : null,
    startedAt: startedAt.toISOString(),
    batchL,
  });
  if (fit.verdict === 'over') throw new AppError(422, 'batch_over_free_space', `waterL: ${batchOverText(fit)}`, 'waterL');
}

/** Logs a brew and the use of each input in one transaction; the tank's contents follow the brew. */
export async function createBrew(ctx: AppContext, actor: SessionUser, body: BrewCreateInput): Promise<BrewDto> {
  const tank = await tankFor(ctx, actor, body.tankId);
  const startedAt = body.startedAt ? new Date(body.startedAt) : new Date();
  if (startedAt.getTime() > Date.now() + 5 * 60_000) throw new AppError(400, 'invalid_input', 'startedAt: a brew cannot start in the future', 'startedAt');
  if (body.readyAt && new Date(body.readyAt) < startedAt) throw new AppError(400, 'invalid_input', 'readyAt: must be after the start', 'readyAt');
  await assertBatchFits(ctx, actor, tank, body, startedAt);
  const brew = await ctx.db.sequelize.transaction(async (transaction) => {
    const b = await ctx.db.models.Brew.create(
      { organisationId: actor.organisationId, farmId: tank.farmId, tankId: tank.id, kind: body.kind, name: body.name, status: 'brewing', startedAt, readyAt: body.readyAt ? new Date(body.readyAt) : null, waterL: body.waterL, dilution: body.dilution, notes: body.notes, createdById: actor.id },
      { transaction },
    );
    for (const [i, line] of body.inputs.entries()) {
      const input = await ctx.db.models.Input.findOne({ where: { id: line.inputId, organisationId: actor.organisationId }, transaction });
      if (!input || input.farmId !== tank.farmId) throw new AppError(422, 'wrong_farm', `inputs.${i}.inputId: not an input stocked on this tank's farm`, `inputs.${i}.inputId`);
      try {
        await recordMovement(ctx, actor, input.id, { kind: 'use', quantity: line.quantity, at: startedAt.toISOString(), reason: `Brew: ${body.name}` }, { brewId: b.id, transaction });
      } catch (err) {
        if (err instanceof AppError && err.field === 'quantity') throw new AppError(err.status, err.code, `inputs.${i}.quantity: ${err.message.replace(/^quantity: /, '')}`, `inputs.${i}.quantity`);
        throw err;
      }
    }
    return b;
  });
  if (body.inputs.length) ctx.events.emit('stock', { organisationId: actor.organisationId, farmIds: [tank.farmId] });
  if (tank.contents !== body.kind || tank.contentsNote !== body.name) await updateTank(ctx, actor, tank.id, { contents: body.kind, contentsNote: body.name.slice(0, 120) });
  return (await toDtos(ctx, [brew]))[0];
}

export async function updateBrew(ctx: AppContext, actor: SessionUser, id: number, body: BrewUpdateInput): Promise<BrewDto> {
  const brew = await brewFor(ctx, actor, id);
  await brew.update({ ...(body.status ? { status: body.status } : {}), ...(body.readyAt !== undefined ? { readyAt: body.readyAt ? new Date(body.readyAt) : null } : {}), ...(body.notes !== undefined ? { notes: body.notes } : {}) });
  // A brew that ends no longer speaks for its tank's temperature.
  if (body.status) ctx.events.emit('brew-temperature', { organisationId: actor.organisationId, farmIds: [brew.farmId] });
  return (await toDtos(ctx, [brew]))[0];
}

/** Logs a temperature of a working brew (°C). */
export async function logBrewTemperature(ctx: AppContext, actor: SessionUser, id: number, body: { temperatureC: number; at?: string }): Promise<BrewDto> {
  const brew = await brewFor(ctx, actor, id);
  await ctx.db.models.BrewTemperature.create({ brewId: brew.id, at: body.at ? new Date(body.at) : new Date(), temperatureC: body.temperatureC, byUserId: actor.id });
  // The flag rules read a working brew's newest temperature as its tank's (cold culture, frost risk).
  ctx.events.emit('brew-temperature', { organisationId: actor.organisationId, farmIds: [brew.farmId] });
  return (await toDtos(ctx, [brew]))[0];
}
