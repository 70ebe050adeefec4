// Reads the texts the SMS fake (server/sms/fake.ts) recorded: one JSON object per line of texts.jsonl
// in the outbox folder, oldest first.
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

export const TEXTS_FILE = 'texts.jsonl';

/** A text as the fake received it from the SDK. */
export interface FakeTextRecord {
  /** The message id the fake answered with (our queue row keeps it). */
  sid: string;
  to: string;
  from: string;
  body: string;
  /** ISO 8601 instant it was received. */
  date: string;
}

function lines(outboxDir: string): string[] {
  try {
    return readFileSync(join(outboxDir, TEXTS_FILE), 'utf8').split('\n').filter(Boolean);
  } catch {
    return [];
  }
}

/** Every recorded text, newest first (a line that does not parse is skipped). */
export function readFakeTexts(outboxDir: string): FakeTextRecord[] {
  const out: FakeTextRecord[] = [];
  for (const line of lines(outboxDir)) {
    try {
      const r = JSON.parse(line) as FakeTextRecord;
      if (typeof r.sid === 'string' && typeof r.to === 'string' && typeof r.body === 'string') out.push(r);
    } catch {
      // a half-written last line: the next read has it
    }
  }
  return out.reverse();
}

/** Removes the given texts (by message id) from the record; others stay. */
export function deleteFakeTexts(outboxDir: string, sids: string[]): void {
  if (!sids.length) return;
  const gone = new Set(sids);
  const kept = lines(outboxDir).filter((line) => {
    try {
      return !gone.has((JSON.parse(line) as FakeTextRecord).sid);
    } catch {
      return true;
    }
  });
  writeFileSync(join(outboxDir, TEXTS_FILE), kept.map((l) => `${l}\n`).join(''));
}
