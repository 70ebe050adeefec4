// Farms of an organisation, seen through the actor's farm access.
import type { Farm as FarmDto, FarmCreateInput, FarmUpdateInput, SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import type { Farm } from '../models';
import { assertFarmAccess } from './access';

export const toFarmDto = (f: Farm): FarmDto => ({
  id: f.id,
  name: f.name,
  timeZone: f.timeZone,
  location: f.location,
  archivedAt: f.archivedAt ? f.archivedAt.toISOString() : null,
  staleAfterDays: f.staleAfterDays,
  coldCultureC: f.coldCultureC,
  frostRiskC: f.frostRiskC,
  latitude: f.latitude ?? null,
  longitude: f.longitude ?? null,
  frostAheadC: f.frostAheadC,
});

/** Farms the actor may see, by name; archived ones only when asked. */
export async function listFarms(ctx: AppContext, actor: SessionUser, opts: { includeArchived?: boolean } = {}): Promise<FarmDto[]> {
  const farms = await ctx.db.models.Farm.findAll({
    where: { organisationId: actor.organisationId, id: actor.farmIds, ...(opts.includeArchived ? {} : { archivedAt: null }) },
    order: [['name', 'ASC']],
  });
  return farms.map(toFarmDto);
}

export async function getFarm(ctx: AppContext, actor: SessionUser, id: number): Promise<FarmDto> {
  return toFarmDto(await assertFarmAccess(ctx, actor, id));
}

export async function createFarm(ctx: AppContext, actor: SessionUser, input: FarmCreateInput): Promise<FarmDto> {
  const farm = await ctx.db.models.Farm.create({ organisationId: actor.organisationId, ...input, archivedAt: null });
  return toFarmDto(farm);
}

export async function updateFarm(ctx: AppContext, actor: SessionUser, id: number, input: FarmUpdateInput): Promise<FarmDto> {
  const farm = await assertFarmAccess(ctx, actor, id);
  const { archived, ...fields } = input;
  await farm.update({ ...fields, ...(archived === undefined ? {} : { archivedAt: archived ? (farm.archivedAt ?? new Date()) : null }) });
  return toFarmDto(farm);
}
