// The development outbox: mail the local receiver caught, as the API answers it.
import type { Role } from './common';

/** What a captured mail is about; decides who of the organisation may read it. */
export type MailKind = 'account' | 'flag' | 'order';

/** One attachment of a captured mail (the bytes come from its own route). */
export interface OutboxAttachment {
  index: number;
  filename: string;
  contentType: string;
  size: number;
}

/** A mail the development mail receiver captured. */
export interface OutboxMessage {
  id: string;
  to: string;
  from: string;
  subject: string;
  kind: MailKind;
  /** ISO 8601 instant the mail was received. */
  date: string;
  text: string;
  html: string;
  attachments: OutboxAttachment[];
}

/** Roles that read which kinds of mail in the outbox: account mail carries sign-in links, so only owners and managers see it. */
export const OUTBOX_KINDS_BY_ROLE = {
  owner: ['account', 'flag', 'order'],
  manager: ['account', 'flag', 'order'],
  buyer: ['order'],
  worker: [],
} as const satisfies Record<Role, readonly MailKind[]>;

/** A flag text the development SMS fake received, with the person it was for. */
export interface OutboxText {
  /** The message id the fake answered with. */
  id: string;
  to: string;
  /** Name of the person the text was for. */
  toName: string;
  from: string;
  body: string;
  /** ISO 8601 instant the fake received it. */
  date: string;
}

/** GET /api/dev/outbox: the captured mails and texts the caller may read, newest first (texts are flag texts: for roles that read flag mail). */
export interface OutboxList {
  messages: OutboxMessage[];
  texts: OutboxText[];
}
