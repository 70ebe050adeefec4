// What comes back from the SMS service: replies to our number (STOP turns texts off for it) and
// delivery reports, both signed with the account's auth token; and the failures a person's Profile shows.
import twilio from 'twilio';
import { Op } from 'sequelize';
import { mobileE164, type SessionUser, type TextFailure } from '@shared/schemas';
import type { AppContext } from '../context';
import { AppError } from '../errors';
import { recordTextFailure } from './flag-texts';

/**
 * Opt-out words a reply may consist of. Common practice of SMS senders (the CTIA's keyword list,
 * recalled from memory; no copy at hand): the service itself also stops texts on these.
 */
export const STOP_WORDS = ['STOP', 'STOPALL', 'UNSUBSCRIBE', 'CANCEL', 'END', 'QUIT'] as const;

/** Refuses (403) a webhook call whose signature is not the service's over our public URL of the path and the form fields. */
export function assertServiceSignature(ctx: AppContext, path: string, signature: string | undefined, params: Record<string, string>): void {
  const token = ctx.config.sms.credentials?.authToken;
  if (!token || !signature || !twilio.validateRequest(token, signature, `${ctx.config.publicUrl}${path}`, params)) {
    throw new AppError(403, 'bad_signature', 'This request is not signed by the SMS service');
  }
}

/** Handles a reply: STOP (and its kin) turns texts off for every person with that number and drops their waiting texts. Returns how many people. */
export async function handleInboundText(ctx: AppContext, params: Record<string, string>): Promise<number> {
  const from = mobileE164(params.From ?? '');
  const word = (params.Body ?? '').trim().toUpperCase();
  if (!from || !(STOP_WORDS as readonly string[]).includes(word)) return 0;
  const { User, FlagText } = ctx.db.models;
  const people = await User.findAll({ where: { phone: from }, attributes: ['id'] });
  if (!people.length) return 0;
  const ids = people.map((p) => p.id);
  await User.update({ flagTexts: 'off', textsStoppedAt: new Date() }, { where: { id: ids } });
  await FlagText.destroy({ where: { userId: ids, status: 'pending' } });
  ctx.logger.info({ users: ids.length }, 'texts stopped by a reply');
  return ids.length;
}

/** Handles a delivery report: delivered is noted; failed or undelivered counts as a failed attempt (tried again while attempts remain). */
export async function handleTextStatus(ctx: AppContext, params: Record<string, string>): Promise<void> {
  const text = params.MessageSid ? await ctx.db.models.FlagText.findOne({ where: { providerSid: params.MessageSid } }) : null;
  if (!text) return;
  if (params.MessageStatus === 'delivered') await text.update({ deliveredAt: new Date() });
  else if (params.MessageStatus === 'failed' || params.MessageStatus === 'undelivered') {
    await recordTextFailure(ctx, text.id, `Not delivered (${params.MessageStatus}${params.ErrorCode ? `, error ${params.ErrorCode}` : ''})`, true);
  }
}

/** The actor's texts of the last 7 days that failed after every attempt, newest first. */
export async function textFailuresOf(ctx: AppContext, actor: SessionUser): Promise<TextFailure[]> {
  const rows = await ctx.db.models.FlagText.findAll({
    where: { userId: actor.id, status: 'failed', updatedAt: { [Op.gte]: new Date(Date.now() - 7 * 86_400_000) } },
    order: [['updatedAt', 'DESC']],
    limit: 20,
  });
  return rows.map((t) => ({ id: t.id, to: t.toPhone, body: t.body, attempts: t.attempts, reason: t.lastError ?? '', at: t.updatedAt.toISOString() }));
}
