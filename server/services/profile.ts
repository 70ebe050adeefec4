// A signed-in person's own settings (name, units): written to their row only, answered as the session user.
import type { ProfileInput, SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { sessionUserFor } from './auth';

/** Saves the actor's own profile fields and returns the signed-in user as it now reads. */
export async function updateProfile(ctx: AppContext, actor: SessionUser, input: ProfileInput): Promise<SessionUser | null> {
  await ctx.db.models.User.update(input, { where: { id: actor.id } });
  return sessionUserFor(ctx, actor.id);
}
