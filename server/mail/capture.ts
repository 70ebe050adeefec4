// Development and test mail receiver: an SMTP server on 127.0.0.1 that writes each message it
// receives as an .eml file into the outbox folder (server/mail/outbox.ts reads them). Started by
// scripts/tasks.ts and the tests only: never imported by the server itself.
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { randomUUID } from 'node:crypto';
import { SMTPServer } from 'smtp-server';

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
