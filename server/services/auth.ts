// Sign-in, the session user, and single-use invitation / reset links.
import { Op } from 'sequelize';
import type { SessionUser, TokenInfo } from '@shared/schemas';
import { passwordStrength } from '@shared/passwords';
import { isLanguage, type Language } from '@shared/i18n/languages';
import type { AppContext } from '../context';
import { defer } from '../deferred';
import { AppError } from '../errors';
import { emitEvent } from '../events';
import type { User } from '../models';
import { burnPasswordCheck, checkPassword, hashPassword, hashToken, needsRehash, newToken } from './passwords';
import { escapeHtml } from '../mail/mailer';
import { languageOr, translatorFor } from '../i18n';

/** The session view of a user, or null when the user is gone or inactive. */
export async function sessionUserFor(ctx: AppContext, userId: number): Promise<SessionUser | null> {
  const { User, Organisation, Farm, FarmAccess } = ctx.db.models;
  const user = await User.findByPk(userId);
  if (!user || !user.active || !user.passwordHash) return null;
  const org = await Organisation.findByPk(user.organisationId);
  const farmIds =
    user.role === 'owner' || user.role === 'manager'
      ? (await Farm.findAll({ where: { organisationId: user.organisationId }, attributes: ['id'] })).map((f) => f.id)
      : (await FarmAccess.findAll({ where: { userId: user.id, organisationId: user.organisationId }, attributes: ['farmId'] })).map((a) => a.farmId);
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    organisationId: user.organisationId,
    organisationName: org?.name ?? '',
    organisationCode: org?.code ?? '',
    currency: org?.currency ?? 'EUR',
    unitSystem: user.unitSystem,
    flagMail: user.flagMail,
    phone: user.phone,
    flagTexts: user.flagTexts,
    textsStoppedAt: user.textsStoppedAt?.toISOString() ?? null,
    language: isLanguage(user.language) ? user.language : null,
    farmIds: farmIds.sort((a, b) => a - b),
  };
}

/**
 * Checks e-mail and password; returns the user or throws 401 / 403. An address may have an account
 * in several organisations: the one whose password matches is signed in (the most recently used
 * one when several match). An address with no account costs one check against a dummy hash, as
 * one account does. An old bcrypt hash is replaced by an argon2id one once the password matched.
 */
export async function verifySignIn(ctx: AppContext, email: string, password: string): Promise<User> {
  const accounts = (
    await ctx.db.models.User.findAll({ where: { email }, order: [['lastSignInAt', 'DESC'], ['id', 'ASC']] })
  ).filter((u): u is User & { passwordHash: string } => !!u.passwordHash);
  if (!accounts.length) {
    await burnPasswordCheck(password);
    throw new AppError(401, 'invalid_credentials', 'E-mail or password is wrong');
  }
  // Every account is checked, so the time taken does not tell which one matched.
  const matches: boolean[] = [];
  for (const account of accounts) matches.push(await checkPassword(password, account.passwordHash));
  const matched = accounts.filter((_, i) => matches[i]);
  if (!matched.length) throw new AppError(401, 'invalid_credentials', 'E-mail or password is wrong');
  const user = matched.find((u) => u.active);
  if (!user) throw new AppError(403, 'account_inactive', 'This account has been deactivated; ask the owner of your organisation');
  await user.update({ lastSignInAt: new Date(), ...(needsRehash(user.passwordHash) ? { passwordHash: await hashPassword(password) } : {}) });
  return user;
}

/** Ends every session of a user at once (deactivation, password change). */
export async function endSessionsOf(ctx: AppContext, userId: number): Promise<void> {
  await ctx.db.models.Session.destroy({ where: { userId } });
  emitEvent(ctx, 'session-ended', { userId });
}

/** Ends one session (sign-out): its row goes, and the sockets opened with it close. */
export async function endSession(ctx: AppContext, sid: string): Promise<void> {
  await ctx.db.models.Session.destroy({ where: { sid } });
  emitEvent(ctx, 'session-ended', { sid });
}

/**
 * Makes a single-use link token for a user and mails it, after the answer has gone out; a failure is logged.
 * The mail is in the person's language, else `language` (an invitation: the inviter's), else English.
 */
export function queueTokenMail(ctx: AppContext, user: User, purpose: 'invite' | 'reset', invitedBy?: string, language?: Language | null): void {
  defer(ctx, `${purpose} mail`, () => sendTokenMail(ctx, user, purpose, invitedBy, language));
}

/** Makes a single-use link token for a user and mails it. */
async function sendTokenMail(ctx: AppContext, user: User, purpose: 'invite' | 'reset', invitedBy?: string, fallback?: Language | null): Promise<void> {
  const { AuthToken, Organisation } = ctx.db.models;
  // A newer link replaces any older unused one of the same purpose.
  await AuthToken.update({ usedAt: new Date() }, { where: { userId: user.id, purpose, usedAt: null } });
  const { token, hash } = newToken();
  const ttl = ctx.config.tokenTtlMs[purpose];
  await AuthToken.create({ organisationId: user.organisationId, userId: user.id, purpose, tokenHash: hash, expiresAt: new Date(Date.now() + ttl), usedAt: null });
  const org = await Organisation.findByPk(user.organisationId);
  const link = `${ctx.config.publicUrl}/set-password?token=${token}`;
  const hours = Math.round(ttl / 3_600_000);
  const t = translatorFor(languageOr(user.language, languageOr(fallback)));
  const orgName = org?.name ?? t('mail.account.yourOrganisation');
  const subject = purpose === 'invite' ? t('mail.account.inviteSubject', { organisation: orgName }) : t('mail.account.resetSubject');
  const lead =
    purpose === 'invite'
      ? t('mail.account.inviteLead', { inviter: invitedBy ?? t('mail.account.theOwner'), organisation: orgName, role: t(`words.roles.${user.role}`).toLowerCase() })
      : t('mail.account.resetLead', { organisation: orgName });
  const hello = t('mail.account.hello', { name: user.name });
  const text = `${hello}\n\n${lead}\n\n${t('mail.account.openLink', { hours })}\n${link}\n\n${t('mail.account.ignore')}\n`;
  const html = `<p>${escapeHtml(hello)}</p><p>${escapeHtml(lead)}</p><p><a href="${escapeHtml(link)}">${escapeHtml(t('mail.account.setLink'))}</a> ${escapeHtml(t('mail.account.linkWorks', { hours }))}</p><p>${escapeHtml(t('mail.account.ignore'))}</p>`;
  await ctx.mailer.send({ organisationId: user.organisationId, kind: 'account', to: user.email, subject, text, html });
}

async function liveToken(ctx: AppContext, token: string) {
  const row = await ctx.db.models.AuthToken.findOne({
    where: { tokenHash: hashToken(token), usedAt: null, expiresAt: { [Op.gt]: new Date() } },
  });
  if (!row) throw new AppError(404, 'token_invalid', 'This link is unknown, already used or expired; ask for a new one');
  return row;
}

/** What a link is for, without using it up. */
export async function describeToken(ctx: AppContext, token: string): Promise<TokenInfo> {
  const row = await liveToken(ctx, token);
  const user = await ctx.db.models.User.findByPk(row.userId);
  if (!user) throw new AppError(404, 'token_invalid', 'This link is unknown, already used or expired; ask for a new one');
  return { purpose: row.purpose, email: user.email, name: user.name };
}

/** Throws 422 naming `password` when a new password is easy to guess: the same rule and wording as the password forms (shared/passwords). */
export function assertStrongPassword(password: string, personalInputs: readonly string[]): void {
  const strength = passwordStrength(password, personalInputs);
  if (!strength.acceptable) throw new AppError(422, 'weak_password', `password: ${strength.message}`, 'password');
}

/** Uses a link: sets the password (and name for invitations); returns the user. A password easy to guess is refused with 422 and leaves the link unused. */
export async function setPasswordWithToken(ctx: AppContext, token: string, password: string, name?: string): Promise<User> {
  const { AuthToken, User } = ctx.db.models;
  const link = await liveToken(ctx, token);
  const person = await User.findByPk(link.userId);
  if (!person) throw new AppError(404, 'token_invalid', 'This link is unknown, already used or expired; ask for a new one');
  assertStrongPassword(password, [person.email, person.name, ...(name ? [name] : [])]);
  const hash = await hashPassword(password);
  return ctx.db.sequelize.transaction(async (transaction) => {
    const row = await liveToken(ctx, token);
    // Claim the token atomically so two clicks cannot both use it.
    const [claimed] = await AuthToken.update({ usedAt: new Date() }, { where: { id: row.id, usedAt: null }, transaction });
    if (claimed !== 1) throw new AppError(404, 'token_invalid', 'This link has just been used');
    const user = await User.findByPk(row.userId, { transaction });
    if (!user) throw new AppError(404, 'token_invalid', 'This link is unknown, already used or expired; ask for a new one');
    if (!user.active) throw new AppError(403, 'account_inactive', 'This account has been deactivated; ask the owner of your organisation');
    await user.update({ passwordHash: hash, ...(row.purpose === 'invite' && name ? { name } : {}), lastSignInAt: new Date() }, { transaction });
    await ctx.db.models.Session.destroy({ where: { userId: user.id }, transaction });
    transaction.afterCommit(() => emitEvent(ctx, 'session-ended', { userId: user.id }));
    return user;
  });
}

/**
 * Mails a reset link to every active account of an address (one per organisation), silently
 * nothing for an unknown one. All of it runs after the answer, so the answer takes the same time
 * either way.
 */
export function requestPasswordReset(ctx: AppContext, email: string): void {
  defer(ctx, 'password reset', async () => {
    const users = await ctx.db.models.User.findAll({ where: { email, active: true, passwordHash: { [Op.ne]: null } } });
    for (const user of users) await sendTokenMail(ctx, user, 'reset').catch((err) => ctx.logger.error({ err, userId: user.id }, 'reset mail failed'));
  });
}
