import { readOutbox, type CapturedMail } from '../../server/mail/outbox';

/** Waits for a captured mail to `to` (the receiver writes files asynchronously). */
export async function waitForMail(outboxDir: string, to: string, timeoutMs = 5_000): Promise<CapturedMail> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const found = (await readOutbox(outboxDir)).find((m) => m.to.includes(to));
    if (found) return found;
    if (Date.now() > until) throw new Error(`no mail to ${to} within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

/** The set-password token in a mail's text. */
export function tokenFrom(mail: CapturedMail): string {
  const m = /set-password\?token=([A-Za-z0-9_-]+)/.exec(mail.text);
  if (!m) throw new Error(`no set-password link in mail "${mail.subject}"`);
  return m[1];
}
