// Flags by text message: each person with a mobile number chooses a text per new flag, a daily
// summary or none, for the same kinds and farms as their mail (flag-mail.ts). Texts are queued in
// flag_texts (migration 0018), at most SMS_DAILY_CAP per person per UTC day, and a background job
// sends them through the SMS SDK, trying a failed one again after a doubling wait up to SMS_MAX_ATTEMPTS.
import { Op } from 'sequelize';
import type { FlagKind, Role } from '@shared/schemas';
import { startPeriodicJob } from '../cluster/periodic-job';
import type { AppContext } from '../context';
import type { Flag, User } from '../models';
import { isPassingFailure } from '../sms/sender';
import { digestDue, KINDS_BY_ROLE } from './flag-mail';
import { digestText, raisedFlagsText } from './flag-text-body';
import { languageOr } from '../i18n';

const concerns = (role: Role, kind: FlagKind) => KINDS_BY_ROLE[role] === 'all' || (KINDS_BY_ROLE[role] as readonly FlagKind[]).includes(kind);

/** People of an organisation who chose texts this way and have a number, with the farms they may see. */
async function textReadersOf(ctx: AppContext, organisationId: number, choice: 'immediate' | 'digest'): Promise<{ user: User; farmIds: Set<number> }[]> {
  const { User, FarmAccess, Farm } = ctx.db.models;
  const users = await User.findAll({ where: { organisationId, active: true, flagTexts: choice, phone: { [Op.ne]: null }, passwordHash: { [Op.ne]: null } } });
  if (!users.length) return [];
  const allFarms = (await Farm.findAll({ where: { organisationId }, attributes: ['id'] })).map((f) => f.id);
  const access = await FarmAccess.findAll({ where: { userId: users.map((u) => u.id) } });
  return users.map((user) => ({
    user,
    farmIds: new Set(user.role === 'owner' || user.role === 'manager' ? allFarms : access.filter((a) => a.userId === user.id).map((a) => a.farmId)),
  }));
}

/** Midnight UTC that starts the day of `at`: the cap counts texts per person per UTC day. */
export const utcDayStart = (at: Date) => new Date(Date.UTC(at.getUTCFullYear(), at.getUTCMonth(), at.getUTCDate()));

/**
 * Queues one text for a person, or records it as held back when the person already has the day's
 * cap of texts (sent, waiting or failed). Their user row is locked meanwhile, so two flags at once
 * cannot both take the last place.
 */
export async function queueText(ctx: AppContext, user: User, body: string, now = new Date()): Promise<'pending' | 'over-cap'> {
  const { FlagText, User } = ctx.db.models;
  return ctx.db.sequelize.transaction(async (transaction) => {
    await User.findByPk(user.id, { lock: transaction.LOCK.UPDATE, transaction, attributes: ['id'] });
    const today = await FlagText.count({ where: { userId: user.id, status: ['pending', 'sent', 'failed'], createdAt: { [Op.gte]: utcDayStart(now) } }, transaction });
    const status = today >= ctx.config.sms.dailyCap ? 'over-cap' : 'pending';
    await FlagText.create({ organisationId: user.organisationId, userId: user.id, toPhone: user.phone!, body, status, nextAttemptAt: status === 'pending' ? now : null, createdAt: now }, { transaction });
    return status;
  });
}

async function farmNamesOf(ctx: AppContext, flags: Flag[]) {
  return new Map((await ctx.db.models.Farm.findAll({ where: { id: [...new Set(flags.map((f) => f.farmId))] } })).map((f) => [f.id, f.name]));
}

/** Queues a text about newly raised flags for each person who chose a text per flag, then starts sending. */
export async function queueRaisedFlagTexts(ctx: AppContext, organisationId: number, raised: Flag[]): Promise<number> {
  if (!raised.length) return 0;
  let queued = 0;
  const readers = await textReadersOf(ctx, organisationId, 'immediate');
  if (!readers.length) return 0;
  const names = await farmNamesOf(ctx, raised);
  for (const { user, farmIds } of readers) {
    const mine = raised.filter((f) => farmIds.has(f.farmId) && concerns(user.role, f.kind));
    if (mine.length && (await queueText(ctx, user, raisedFlagsText(mine, names, ctx.config.publicUrl, languageOr(user.language)))) === 'pending') queued++;
  }
  if (queued) drainSoon(ctx);
  return queued;
}

/** Queues each digest reader's daily summary text once per local day from the digest hour (as the mail summary). */
export async function queueTextDigests(ctx: AppContext, now = new Date()): Promise<number> {
  let queued = 0;
  for (const org of await ctx.db.models.Organisation.findAll({ attributes: ['id'] })) {
    const readers = await textReadersOf(ctx, org.id, 'digest');
    if (!readers.length) continue;
    const active = await ctx.db.models.Flag.findAll({ where: { organisationId: org.id, activeKey: 1 }, order: [['raisedAt', 'DESC']] });
    if (!active.length) continue;
    const zones = new Map((await ctx.db.models.Farm.findAll({ where: { organisationId: org.id }, attributes: ['id', 'timeZone'], order: [['id', 'ASC']] })).map((f) => [f.id, f.timeZone]));
    for (const { user, farmIds } of readers) {
      const firstFarm = [...zones.keys()].find((id) => farmIds.has(id));
      if (firstFarm === undefined || !digestDue(now, user.lastTextDigestAt, zones.get(firstFarm)!, ctx.config.flagDigestHour)) continue;
      const mine = active.filter((f) => farmIds.has(f.farmId) && concerns(user.role, f.kind));
      if (!mine.length) continue;
      await queueText(ctx, user, digestText(mine, ctx.config.publicUrl, languageOr(user.language)), now);
      await user.update({ lastTextDigestAt: now });
      queued++;
    }
  }
  if (queued) drainSoon(ctx);
  return queued;
}

/** The wait before attempt n + 1 after n failed attempts: SMS_RETRY_SECONDS, doubled each time. */
export const retryDelayMs = (retryMs: number, failedAttempts: number) => retryMs * 2 ** Math.max(0, failedAttempts - 1);

const reasonOf = (err: unknown) => String((err as { message?: unknown } | null)?.message ?? err).slice(0, 300);

/** Records a failed attempt of a text: tried again later while attempts remain and the failure may pass, else failed. */
export async function recordTextFailure(ctx: AppContext, textId: number, reason: string, passing: boolean, now = new Date()): Promise<void> {
  const text = await ctx.db.models.FlagText.findByPk(textId);
  if (!text) return;
  const again = passing && text.attempts < ctx.config.sms.maxAttempts;
  await text.update({ status: again ? 'pending' : 'failed', lastError: reason.slice(0, 300), nextAttemptAt: again ? new Date(now.getTime() + retryDelayMs(ctx.config.sms.retryMs, text.attempts)) : null });
  if (!again) ctx.logger.warn({ textId, attempts: text.attempts }, 'flag text failed for good');
}

/** Sends the texts that are due now; returns how many went. Each row is claimed first, so two servers never send one twice. */
async function drainOnce(ctx: AppContext, now: Date): Promise<number> {
  const { FlagText, User } = ctx.db.models;
  const due = await FlagText.findAll({ where: { status: 'pending', nextAttemptAt: { [Op.lte]: now } }, order: [['nextAttemptAt', 'ASC'], ['id', 'ASC']], limit: 50 });
  let sent = 0;
  for (const text of due) {
    const [claimed] = await FlagText.update(
      { attempts: text.attempts + 1, nextAttemptAt: new Date(now.getTime() + 5 * 60_000) },
      { where: { id: text.id, status: 'pending', attempts: text.attempts } },
    );
    if (!claimed) continue;
    const user = await User.findByPk(text.userId, { attributes: ['id', 'phone', 'flagTexts', 'active'] });
    // Texts turned off, the number changed or the person gone since it was queued: it is not sent.
    if (!user || !user.active || user.flagTexts === 'off' || user.phone !== text.toPhone) {
      await text.destroy();
      continue;
    }
    try {
      const { sid } = await ctx.texts.send({ to: text.toPhone, body: text.body, statusCallback: `${ctx.config.publicUrl}/api/texts/status` });
      await FlagText.update({ status: 'sent', providerSid: sid, sentAt: new Date(), nextAttemptAt: null, lastError: null }, { where: { id: text.id } });
      sent++;
    } catch (err) {
      await recordTextFailure(ctx, text.id, reasonOf(err), isPassingFailure(err), now);
    }
  }
  return sent;
}

const draining = new WeakMap<AppContext, Promise<number>>();

/** Sends every text that is due (one run at a time per server; a call during a run waits for it, then runs again). */
export function drainTextQueue(ctx: AppContext, now?: Date): Promise<number> {
  const run = (draining.get(ctx) ?? Promise.resolve(0)).catch(() => 0).then(() => drainOnce(ctx, now ?? new Date()));
  draining.set(ctx, run);
  return run;
}

function drainSoon(ctx: AppContext): void {
  void drainTextQueue(ctx).catch((err) => ctx.logger.error({ err }, 'sending flag texts failed'));
}

/**
 * Background job beside the flag rules: due texts every `everyMs`, daily summaries every `digestEveryMs`;
 * of several server processes one runs each period's turn (server/cluster/periodic-job.ts). Returns a stop function.
 */
export function attachTextQueue(ctx: AppContext, opts: { everyMs?: number; digestEveryMs?: number } = {}): () => void {
  const stopSending = startPeriodicJob(ctx, { name: 'text-send', periodMs: opts.everyMs ?? 5_000, work: () => drainTextQueue(ctx) });
  const stopDigests = startPeriodicJob(ctx, { name: 'text-digest', periodMs: opts.digestEveryMs ?? 10 * 60_000, work: () => queueTextDigests(ctx) });
  return () => {
    stopSending();
    stopDigests();
  };
}
