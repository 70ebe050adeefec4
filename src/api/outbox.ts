import type { OutboxList, OutboxMessage } from '@shared/schemas';
import { http } from './http';

export type { OutboxMessage };

/** Captured mails of the caller's organisation, newest first; 404 when the server runs without the development mail receiver. */
export async function fetchOutbox(): Promise<OutboxMessage[]> {
  const body = await http.get<OutboxList>('/api/dev/outbox');
  return body.messages;
}

/** Where the browser downloads one attachment of a captured mail. */
export const outboxAttachmentUrl = (id: string, index: number) => `/api/dev/outbox/${encodeURIComponent(id)}/attachments/${index}`;

/** Empties the caller's organisation's part of the outbox. */
export function clearOutbox(): Promise<void> {
  return http.delete('/api/dev/outbox');
}
