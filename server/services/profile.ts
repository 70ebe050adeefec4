// A signed-in person's own settings (name, units, language, how flags reach them): written to their row only, answered as the session user.
import type { Language } from '@shared/i18n/languages';
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

/** Stores `language` (the browser's, at sign-in) as the person's language when they have none yet; a choice made stays. */
export async function adoptBrowserLanguage(ctx: AppContext, userId: number, language: Language): Promise<void> {
  await ctx.db.models.User.update({ language }, { where: { id: userId, language: null } });
}
