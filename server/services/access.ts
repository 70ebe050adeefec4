// The farm scope every service query goes through: one check, so a farm of another organisation is
// never confirmed to exist and a farm not granted is refused the same way everywhere.
import type { SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { AppError, forbidden } from '../errors';

/**
 * Checks that the actor may see a farm: 404 when it does not exist in the actor's organisation
 * (other organisations' rows are never confirmed to exist), 403 when it exists but is not granted.
 */
export async function assertFarmAccess(ctx: AppContext, actor: SessionUser, farmId: number) {
  const farm = await ctx.db.models.Farm.findOne({ where: { id: farmId, organisationId: actor.organisationId } });
  if (!farm) throw new AppError(404, 'not_found', 'Farm not found');
  if (!actor.farmIds.includes(farm.id)) throw forbidden('You do not have access to this farm');
  return farm;
}
