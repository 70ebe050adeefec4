import type { OutboxList, OutboxMessage, OutboxText } from '@shared/schemas';
import { http } from './http';

export type { OutboxList, OutboxMessage, OutboxText };

/** Captured mails and flag texts of the caller's organisation, newest first; 404 when the server runs without the development receivers. */
export function fetchOutboxList(): Promise<OutboxList> {
  return http.get<OutboxList>('/api/dev/outbox');
}

/** Captured mails of the caller's organisation, newest first; 404 when the server runs without the development mail receiver. */
export async function fetchOutbox(): Promise<OutboxMessage[]> {
  return (await fetchOutboxList()).messages;
}

/** Where the browser downloads one attachment of a captured mail. */
export const outboxAttachmentUrl = (id: string, index: number) => `/api/dev/outbox/${encodeURIComponent(id)}/attachments/${index}`;

/** Empties the caller's organisation's part of the outbox (mails and texts). */
export function clearOutbox(): Promise<void> {
  return http.delete('/api/dev/outbox');
}
