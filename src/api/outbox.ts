import { http } from './http';

/** A mail the development mail receiver captured. */
export interface OutboxMessage {
  id: string | number;
  to: string;
  from: string;
  subject: string;
  /** ISO 8601 date the mail was received. */
  date: string;
  text: string;
  html: string;
}

/** Captured mails, newest first; 404 when the server runs without the development mail receiver. */
export async function fetchOutbox(): Promise<OutboxMessage[]> {
  const body = await http.get<{ messages: OutboxMessage[] }>('/api/dev/outbox');
  return body.messages;
}

/** Empties the outbox. */
export function clearOutbox(): Promise<void> {
  return http.delete('/api/dev/outbox');
}
