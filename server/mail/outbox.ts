// Reads the mail the development receiver (server/mail/capture.ts) left in the outbox folder.
// mailparser is loaded only when the outbox is read, so a production server never loads it.
import { mkdirSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import type { MailKind, OutboxMessage } from '@shared/schemas';
import { MAIL_HEADERS } from './mailer';

/** A captured mail with the organisation it was sent for (null: sent by something else). */
export interface CapturedMail extends OutboxMessage {
  organisationId: number | null;
}

const KINDS: readonly MailKind[] = ['account', 'flag', 'order'];
const FILE_ID = /^[0-9A-Za-z-]+$/;

async function parseMail(file: string) {
  const { simpleParser } = await import('mailparser');
  return simpleParser(readFileSync(file));
}

function headerOf(parsed: Awaited<ReturnType<typeof parseMail>>, name: string): string {
  const value = parsed.headers.get(name.toLowerCase());
  return typeof value === 'string' ? value : '';
}

function toCaptured(id: string, parsed: Awaited<ReturnType<typeof parseMail>>): CapturedMail {
  const to = Array.isArray(parsed.to) ? parsed.to.map((a) => a.text).join(', ') : (parsed.to?.text ?? '');
  const org = Number(headerOf(parsed, MAIL_HEADERS.organisation));
  const kind = headerOf(parsed, MAIL_HEADERS.kind) as MailKind;
  return {
    id,
    organisationId: Number.isInteger(org) && org > 0 ? org : null,
    kind: KINDS.includes(kind) ? kind : 'account',
    to,
    from: parsed.from?.text ?? '',
    subject: parsed.subject ?? '',
    date: (parsed.date ?? new Date()).toISOString(),
    text: parsed.text ?? '',
    html: typeof parsed.html === 'string' ? parsed.html : '',
    attachments: parsed.attachments.map((a, index) => ({ index, filename: a.filename ?? 'attachment', contentType: a.contentType, size: a.size })),
  };
}

function mailFiles(outboxDir: string): string[] {
  try {
    return readdirSync(outboxDir)
      .filter((f) => f.endsWith('.eml'))
      .sort()
      .reverse();
  } catch {
    return [];
  }
}

/** The newest 200 captured messages, newest first. */
export async function readOutbox(outboxDir: string): Promise<CapturedMail[]> {
  const out: CapturedMail[] = [];
  for (const f of mailFiles(outboxDir).slice(0, 200)) out.push(toCaptured(f.replace(/\.eml$/, ''), await parseMail(join(outboxDir, f))));
  return out;
}

/** One captured message with its attachments' bytes, or null when there is no such message. */
export async function readOutboxMessage(outboxDir: string, id: string) {
  if (!FILE_ID.test(id)) return null;
  const file = join(outboxDir, `${id}.eml`);
  let parsed;
  try {
    parsed = await parseMail(file);
  } catch {
    return null;
  }
  return { mail: toCaptured(id, parsed), files: parsed.attachments.map((a) => a.content) };
}

/** Deletes the given captured messages (by id). */
export function deleteOutboxMessages(outboxDir: string, ids: string[]): void {
  for (const id of ids) if (FILE_ID.test(id)) rmSync(join(outboxDir, `${id}.eml`), { force: true });
}

/** Empties the outbox folder. */
export function clearOutbox(outboxDir: string): void {
  rmSync(outboxDir, { recursive: true, force: true });
  mkdirSync(outboxDir, { recursive: true });
}
