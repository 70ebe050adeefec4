// Flags by mail: each person chooses a mail per new flag, a daily summary, or none, for the kinds
// that concern their role on the farms they may see.
import { Op } from 'sequelize';
import { CAUTION_DEFERS } from '@shared/cautions';
import { flagCautionText } from '@shared/flags';
import type { Language } from '@shared/i18n/languages';
import type { FlagKind, Role } from '@shared/schemas';
import type { AppContext } from '../context';
import { escapeHtml } from '../mail/mailer';
import type { Flag, User } from '../models';
import { flagLabelIn, flagMessageIn, languageOr, tr, translatorFor } from '../i18n';

/** The flag kinds each role hears of: workers their farms' stale tanks, buyers reorders, managers and owners all. */
export const KINDS_BY_ROLE: Record<Role, readonly FlagKind[] | 'all'> = { owner: 'all', manager: 'all', worker: ['stale-tank'], buyer: ['reorder-due'] };

const concerns = (role: Role, kind: FlagKind) => KINDS_BY_ROLE[role] === 'all' || (KINDS_BY_ROLE[role] as readonly FlagKind[]).includes(kind);

/** The users of an organisation who may see a farm, with their role. */
async function readersOf(ctx: AppContext, organisationId: number, choice: 'immediate' | 'digest'): Promise<{ user: User; farmIds: Set<number> }[]> {
  const { User, FarmAccess, Farm } = ctx.db.models;
  const users = await User.findAll({ where: { organisationId, active: true, flagMail: choice, passwordHash: { [Op.ne]: null } } });
  const allFarms = (await Farm.findAll({ where: { organisationId }, attributes: ['id'] })).map((f) => f.id);
  const access = await FarmAccess.findAll({ where: { userId: users.map((u) => u.id) } });
  return users.map((user) => ({
    user,
    farmIds: new Set(user.role === 'owner' || user.role === 'manager' ? allFarms : access.filter((a) => a.userId === user.id).map((a) => a.farmId)),
  }));
}

function render(flags: Flag[], farmNames: Map<number, string>, link: string, language: Language) {
  const t = translatorFor(language);
  const caution = (f: Flag) => flagCautionText(f.kind, language);
  const lines = flags.map((f) => `- [${flagLabelIn(f.kind, language)}] ${farmNames.get(f.farmId) ?? ''}: ${flagMessageIn(f.message, language)}${caution(f) ? `\n  ${t('mail.flag.caution', { text: caution(f)! })}` : ''}`);
  const items = flags.map(
    (f) =>
      `<li><strong>${escapeHtml(flagLabelIn(f.kind, language))}</strong> — ${escapeHtml(farmNames.get(f.farmId) ?? '')}: ${escapeHtml(flagMessageIn(f.message, language))}${caution(f) ? `<br><em>${escapeHtml(t('mail.flag.caution', { text: caution(f)! }))}</em>` : ''}</li>`,
  );
  return {
    text: `${lines.join('\n')}\n\n${t('mail.flag.seeText', { link })}\n${CAUTION_DEFERS[language]}\n`,
    html: `<ul>${items.join('')}</ul><p><a href="${escapeHtml(link)}">${escapeHtml(t('mail.flag.seeLink'))}</a></p><p>${escapeHtml(CAUTION_DEFERS[language])}</p>`,
  };
}

async function farmNamesOf(ctx: AppContext, flags: Flag[]) {
  return new Map((await ctx.db.models.Farm.findAll({ where: { id: [...new Set(flags.map((f) => f.farmId))] } })).map((f) => [f.id, f.name]));
}

/** Mails newly raised flags to the people who chose a mail per flag. */
export async function mailRaisedFlags(ctx: AppContext, organisationId: number, raised: Flag[]): Promise<void> {
  if (!raised.length) return;
  const names = await farmNamesOf(ctx, raised);
  for (const { user, farmIds } of await readersOf(ctx, organisationId, 'immediate')) {
    const mine = raised.filter((f) => farmIds.has(f.farmId) && concerns(user.role, f.kind));
    if (!mine.length) continue;
    const language = languageOr(user.language);
    const t = translatorFor(language);
    const body = render(mine, names, `${ctx.config.publicUrl}/flags`, language);
    const subject =
      mine.length === 1 ? t('mail.flag.subjectOne', { kind: flagLabelIn(mine[0].kind, language), message: flagMessageIn(mine[0].message, language) }).slice(0, 180) : t('mail.flag.subjectMany', { n: mine.length });
    await ctx.mailer.send({ organisationId, kind: 'flag', to: user.email, subject, ...body }).catch((err) => ctx.logger.error({ err }, 'flag mail failed'));
  }
}

/** The calendar day (YYYY-MM-DD) and hour (0–23) of an instant in an IANA time zone. */
export function localDayAndHour(at: Date, timeZone: string): { day: string; hour: number } {
  const parts = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', hourCycle: 'h23' }).formatToParts(at);
  const get = (type: string) => parts.find((p) => p.type === type)?.value ?? '';
  return { day: `${get('year')}-${get('month')}-${get('day')}`, hour: Number(get('hour')) };
}

/**
 * Whether a person's daily summary is due: it goes once per local day, on the first sweep at or
 * after the digest hour in the time zone of the first farm they may see.
 */
export function digestDue(now: Date, lastSentAt: Date | null, timeZone: string, digestHour: number): boolean {
  const today = localDayAndHour(now, timeZone);
  if (today.hour < digestHour) return false;
  return !lastSentAt || localDayAndHour(lastSentAt, timeZone).day < today.day;
}

/**
 * Sends each digest reader whose local digest hour has come one summary of the active flags that
 * concern them, once per local day (the sweep calls this every few minutes). Returns how many mails went out.
 */
export async function sendFlagDigests(ctx: AppContext, now = new Date()): Promise<number> {
  const orgs = await ctx.db.models.Organisation.findAll({ attributes: ['id'] });
  let sent = 0;
  for (const org of orgs) {
    const active = await ctx.db.models.Flag.findAll({ where: { organisationId: org.id, activeKey: 1 }, order: [['raisedAt', 'DESC']] });
    if (!active.length) continue;
    const names = await farmNamesOf(ctx, active);
    const zones = new Map((await ctx.db.models.Farm.findAll({ where: { organisationId: org.id }, attributes: ['id', 'timeZone'], order: [['id', 'ASC']] })).map((f) => [f.id, f.timeZone]));
    for (const { user, farmIds } of await readersOf(ctx, org.id, 'digest')) {
      const firstFarm = [...zones.keys()].find((id) => farmIds.has(id));
      if (firstFarm === undefined || !digestDue(now, user.lastDigestAt, zones.get(firstFarm)!, ctx.config.flagDigestHour)) continue;
      const mine = active.filter((f) => farmIds.has(f.farmId) && concerns(user.role, f.kind));
      if (!mine.length) continue;
      const language = languageOr(user.language);
      const body = render(mine, names, `${ctx.config.publicUrl}/flags`, language);
      const subject = tr(language, 'mail.flag.subjectDigest', { n: mine.length }, mine.length);
      await ctx.mailer.send({ organisationId: org.id, kind: 'flag', to: user.email, subject, ...body });
      await user.update({ lastDigestAt: now });
      sent++;
    }
  }
  return sent;
}
