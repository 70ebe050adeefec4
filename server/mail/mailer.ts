// Outgoing mail through nodemailer. In development and tests the SMTP settings point at the
// local capture receiver (server/mail/capture.ts); in production at a real provider.
import nodemailer from 'nodemailer';
import type { MailKind } from '@shared/schemas';
import type { Config } from '../config';

export interface MailMessage {
  /** The organisation the mail is sent for: the development outbox shows it to that organisation only. */
  organisationId: number;
  kind: MailKind;
  to: string;
  subject: string;
  text: string;
  html: string;
  attachments?: { filename: string; content: Buffer | string; contentType: string }[];
}

/** Headers that label a mail for the development outbox (harmless to a real provider). */
export const MAIL_HEADERS = { organisation: 'X-Brimstock-Organisation', kind: 'X-Brimstock-Kind' } as const;

export interface Mailer {
  send(message: MailMessage): Promise<void>;
  close(): void;
}

export function createMailer(config: Pick<Config, 'mail'>): Mailer {
  const { host, port, user, password, from } = config.mail;
  const transport = nodemailer.createTransport({
    host,
    port,
    secure: port === 465,
    ignoreTLS: host === '127.0.0.1' || host === 'localhost',
    auth: user ? { user, pass: password ?? '' } : undefined,
  });
  return {
    async send({ organisationId, kind, ...message }) {
      await transport.sendMail({ from, ...message, headers: { [MAIL_HEADERS.organisation]: String(organisationId), [MAIL_HEADERS.kind]: kind } });
    },
    close: () => transport.close(),
  };
}

/** Escapes text for an HTML mail body. */
export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}
