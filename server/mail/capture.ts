// Development and test mail receiver: an SMTP server on 127.0.0.1 that writes each message it
// receives as an .eml file into the outbox folder, which the development outbox page reads.
import { mkdirSync, writeFileSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { randomUUID } from 'node:crypto';
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';

export interface CapturedMail {
  id: string;
  to: string;
  from: string;
  subject: string;
  date: string;
  text: string;
  html: string;
  attachments: { filename: string; contentType: string; size: number }[];
}

/** Starts the capture receiver; resolves once it listens. */
export async function startMailCapture(opts: { port: number; outboxDir: string }): Promise<{ port: number; close(): Promise<void> }> {
  mkdirSync(opts.outboxDir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    onData(stream, _session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const name = `${new Date().toISOString().replace(/[:.]/g, '-')}-${randomUUID()}.eml`;
        writeFileSync(join(opts.outboxDir, name), Buffer.concat(chunks));
        callback();
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, '127.0.0.1', () => resolve());
  });
  const address = server.server.address();
  const port = typeof address === 'object' && address ? address.port : opts.port;
  return { port, close: () => new Promise<void>((r) => server.close(() => r())) };
}

/** Every captured message, newest first. */
export async function readOutbox(outboxDir: string): Promise<CapturedMail[]> {
  let files: string[];
  try {
    files = readdirSync(outboxDir).filter((f) => f.endsWith('.eml'));
  } catch {
    return [];
  }
  files.sort().reverse();
  const out: CapturedMail[] = [];
  for (const f of files.slice(0, 200)) {
    const parsed = await simpleParser(readFileSync(join(outboxDir, f)));
    const to = Array.isArray(parsed.to) ? parsed.to.map((a) => a.text).join(', ') : (parsed.to?.text ?? '');
    out.push({
      id: f.replace(/\.eml$/, ''),
      to,
      from: parsed.from?.text ?? '',
      subject: parsed.subject ?? '',
      date: (parsed.date ?? new Date()).toISOString(),
      text: parsed.text ?? '',
      html: typeof parsed.html === 'string' ? parsed.html : '',
      attachments: parsed.attachments.map((a) => ({ filename: a.filename ?? 'attachment', contentType: a.contentType, size: a.size })),
    });
  }
  return out;
}

/** Empties the outbox folder. */
export function clearOutbox(outboxDir: string): void {
  rmSync(outboxDir, { recursive: true, force: true });
  mkdirSync(outboxDir, { recursive: true });
}
