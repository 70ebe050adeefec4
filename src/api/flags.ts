import type { Flag, FlagKind, ServerEventPayload } from '@shared/schemas';
import { http } from './http';
import { onServerEvent, sharedSocket } from './socket';

/** Which flags GET /api/flags returns: 'active' is open and acknowledged together. */
export type FlagStatusFilter = 'active' | 'open' | 'acknowledged' | 'cleared' | 'all';

export interface FlagListQuery {
  status?: FlagStatusFilter;
  farmId?: number;
  kind?: FlagKind;
  limit?: number;
}

/**
 * What the server pushes whenever one farm's active flags change: all of them, replacing the last push
 * (socket event 'flags:farm', sent to the farm's room, so the tab's one shared connection receives it).
 */
export type FlagsFarmPush = ServerEventPayload<'flags:farm'>;

/** Flags on the user's farms, newest first. */
export function fetchFlags(query: FlagListQuery = {}): Promise<Flag[]> {
  return http.get<Flag[]>('/api/flags', { query: { status: query.status, farmId: query.farmId, kind: query.kind, limit: query.limit } });
}

/** Marks a flag as seen, with what was done; the flag stays active until its condition ends. */
export function acknowledgeFlag(id: number, note: string): Promise<Flag> {
  return http.post<Flag>(`/api/flags/${id}/acknowledge`, { note });
}

/** Ends a temperature flag by hand, saying why (owners and managers); it stays over until a newer temperature meets the rule again. */
export function clearFlag(id: number, note: string): Promise<Flag> {
  return http.post<Flag>(`/api/flags/${id}/clear`, { note });
}

/**
 * Listens for pushed changes of any farm's active flags on the tab's shared connection, and calls
 * `onReconnect` when that connection comes back (pushes sent while it was down are lost).
 * Returns the function that stops listening.
 */
export function onFlagsPush(handler: (push: FlagsFarmPush) => void, onReconnect?: () => void): () => void {
  const manager = sharedSocket().io;
  if (onReconnect) manager.on('reconnect', onReconnect);
  const stop = onServerEvent('flags:farm', handler);
  return () => {
    if (onReconnect) manager.off('reconnect', onReconnect);
    stop();
  };
}
