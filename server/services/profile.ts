// A signed-in person's own settings (name, units, how flags reach them): written to their row only, answered as the session user.
import type { ProfileInput, SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { AppError } from '../errors';
import { sessionUserFor } from './auth';

/** Saves the actor's own profile fields and returns the signed-in user as it now reads. */
export async function updateProfile(ctx: AppContext, actor: SessionUser, input: ProfileInput): Promise<SessionUser | null> {
  const user = await ctx.db.models.User.findByPk(actor.id);
  if (!user) return null;
  const phone = input.phone === undefined ? user.phone : input.phone;
  const flagTexts = input.flagTexts ?? user.flagTexts;
  if (flagTexts !== 'off' && !phone) throw new AppError(422, 'phone_required', 'Texts need a mobile number', 'phone');
  // A new number, or texts chosen again, starts afresh after a STOP reply.
  const restarted = phone !== user.phone || (input.flagTexts !== undefined && input.flagTexts !== 'off');
  await user.update({ ...input, ...(restarted ? { textsStoppedAt: null } : {}) });
  return sessionUserFor(ctx, actor.id);
}
