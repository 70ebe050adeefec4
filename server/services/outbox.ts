// The development outbox as a person of an organisation may see it: only mail and texts sent for their
// own organisation, and of that only the kinds their role may read (account mail carries sign-in links).
import { OUTBOX_KINDS_BY_ROLE, type MailKind, type OutboxMessage, type OutboxText, type SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { notFound } from '../errors';
import { deleteOutboxMessages, readOutbox, readOutboxMessage, type CapturedMail } from '../mail/outbox';
import { deleteFakeTexts, readFakeTexts } from '../sms/outbox';

const mayRead = (actor: SessionUser, kind: MailKind) => (OUTBOX_KINDS_BY_ROLE[actor.role] as readonly MailKind[]).includes(kind);

const visibleTo = (actor: SessionUser) => (mail: CapturedMail) => mail.organisationId === actor.organisationId && mayRead(actor, mail.kind);

const dto = ({ organisationId: _org, ...mail }: CapturedMail): OutboxMessage => mail;

/** The actor's captured mail, newest first. */
export async function listOutbox(ctx: AppContext, actor: SessionUser): Promise<OutboxMessage[]> {
  return (await readOutbox(ctx.config.outboxDir)).filter(visibleTo(actor)).map(dto);
}

/**
 * The flag texts the SMS fake received for the actor's organisation, newest first: a text is the
 * organisation's when its queue row (matched by the fake's message id) is. Only for roles that read flag mail.
 */
export async function listOutboxTexts(ctx: AppContext, actor: SessionUser): Promise<OutboxText[]> {
  if (!mayRead(actor, 'flag')) return [];
  const records = readFakeTexts(ctx.config.outboxDir).slice(0, 500);
  if (!records.length) return [];
  const rows = await ctx.db.models.FlagText.findAll({ where: { organisationId: actor.organisationId, providerSid: records.map((r) => r.sid) }, attributes: ['providerSid', 'userId'] });
  const people = new Map((await ctx.db.models.User.findAll({ where: { id: [...new Set(rows.map((r) => r.userId))] }, attributes: ['id', 'name'] })).map((u) => [u.id, u.name]));
  const whose = new Map(rows.map((r) => [r.providerSid!, people.get(r.userId) ?? '']));
  return records.filter((r) => whose.has(r.sid)).slice(0, 200).map((r) => ({ id: r.sid, to: r.to, toName: whose.get(r.sid)!, from: r.from, body: r.body, date: r.date }));
}

/** One attachment of a mail the actor may see (404 for any other mail, whoever's it is). */
export async function outboxAttachment(ctx: AppContext, actor: SessionUser, id: string, index: number) {
  const found = await readOutboxMessage(ctx.config.outboxDir, id);
  if (!found || !visibleTo(actor)(found.mail) || !found.files[index]) throw notFound('Mail attachment');
  const meta = found.mail.attachments[index]!;
  return { filename: meta.filename, contentType: meta.contentType, content: found.files[index] };
}

/** Deletes the actor's visible mail and texts; other organisations' stay. Returns how many went. */
export async function clearOutboxOf(ctx: AppContext, actor: SessionUser): Promise<number> {
  const mine = (await readOutbox(ctx.config.outboxDir)).filter(visibleTo(actor));
  deleteOutboxMessages(ctx.config.outboxDir, mine.map((m) => m.id));
  const texts = await listOutboxTexts(ctx, actor);
  deleteFakeTexts(ctx.config.outboxDir, texts.map((t) => t.id));
  return mine.length + texts.length;
}
