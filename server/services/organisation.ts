// The signed-in person's organisation: its short code (order numbers) and currency (money figures).
import type { OrganisationSettings, OrganisationSettingsInput, SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { AppError, notFound } from '../errors';
import { peekOrderNumber } from './order-numbers';

export async function getOrganisation(ctx: AppContext, actor: SessionUser): Promise<OrganisationSettings> {
  const org = await ctx.db.models.Organisation.findByPk(actor.organisationId);
  if (!org) throw notFound('Organisation');
  return { id: org.id, name: org.name, code: org.code, currency: org.currency, nextOrderNumber: await peekOrderNumber(ctx, org.id, org.code) };
}

/** Owners change the code (unique across organisations) or the currency; orders already made keep their numbers. */
export async function updateOrganisation(ctx: AppContext, actor: SessionUser, input: OrganisationSettingsInput): Promise<OrganisationSettings> {
  const org = await ctx.db.models.Organisation.findByPk(actor.organisationId);
  if (!org) throw notFound('Organisation');
  const codeTaken = () => new AppError(409, 'code_taken', `code: ${input.code} is used by another organisation; choose other letters`, 'code');
  if (input.code !== undefined && input.code !== org.code) {
    const other = await ctx.db.models.Organisation.findOne({ where: { code: input.code }, attributes: ['id'] });
    if (other) throw codeTaken();
  }
  try {
    await org.update({ ...(input.code !== undefined ? { code: input.code } : {}), ...(input.currency !== undefined ? { currency: input.currency } : {}) });
  } catch (err) {
    // Another organisation took the same letters between the check and the write.
    if ((err as { name?: string })?.name === 'SequelizeUniqueConstraintError') throw codeTaken();
    throw err;
  }
  return getOrganisation(ctx, actor);
}
