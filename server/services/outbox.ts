// The development outbox as a person of an organisation may see it: only mail sent for their own
// organisation, and of that only the kinds their role may read (account mail carries sign-in links).
import { OUTBOX_KINDS_BY_ROLE, type MailKind, type OutboxMessage, type SessionUser } from '@shared/schemas';
import type { AppContext } from '../context';
import { notFound } from '../errors';
import { deleteOutboxMessages, readOutbox, readOutboxMessage, type CapturedMail } from '../mail/outbox';

const visibleTo = (actor: SessionUser) => (mail: CapturedMail) =>
  mail.organisationId === actor.organisationId && (OUTBOX_KINDS_BY_ROLE[actor.role] as readonly MailKind[]).includes(mail.kind);

const dto = ({ organisationId: _org, ...mail }: CapturedMail): OutboxMessage => mail;

/** The actor's captured mail, newest first. */
export async function listOutbox(ctx: AppContext, actor: SessionUser): Promise<OutboxMessage[]> {
  return (await readOutbox(ctx.config.outboxDir)).filter(visibleTo(actor)).map(dto);
}

/** One attachment of a mail the actor may see (404 for any other mail, whoever's it is). */
export async function outboxAttachment(ctx: AppContext, actor: SessionUser, id: string, index: number) {
  const found = await readOutboxMessage(ctx.config.outboxDir, id);
  if (!found || !visibleTo(actor)(found.mail) || !found.files[index]) throw notFound('Mail attachment');
  const meta = found.mail.attachments[index]!;
  return { filename: meta.filename, contentType: meta.contentType, content: found.files[index] };
}

/** Deletes the actor's visible mail; other organisations' mail stays. Returns how many went. */
export async function clearOutboxOf(ctx: AppContext, actor: SessionUser): Promise<number> {
  const mine = (await readOutbox(ctx.config.outboxDir)).filter(visibleTo(actor));
  deleteOutboxMessages(ctx.config.outboxDir, mine.map((m) => m.id));
  return mine.length;
}
