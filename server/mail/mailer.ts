// Outgoing mail through nodemailer. In development and tests the SMTP settings point at the
// local capture receiver (server/mail/capture.ts); in production at a real provider.
import nodemailer from 'nodemailer';
import type { Config } from '../config';

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html: string;
  attachments?: { filename: string; content: Buffer | string; contentType: string }[];
}

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
    async send(message) {
      await transport.sendMail({ from, ...message });
    },
    close: () => transport.close(),
  };
}

/** Escapes text for an HTML mail body. */
export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}
