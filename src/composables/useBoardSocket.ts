import { getCurrentScope, onScopeDispose, ref, shallowRef, type Ref } from 'vue';
import type { BoardStreamPosition, ServerEventPayload } from '@shared/schemas';
import { onServerEvent, sharedSocket } from '@/api/socket';

/** connecting: first connection; live: pushes arrive; reconnecting: lost, trying again; offline: given up or closed. */
export type BoardSocketStatus = 'connecting' | 'live' | 'reconnecting' | 'offline';

export interface UseBoardSocketOptions {
  /** Where the farm set's stream stands, on every (re)connection once the socket is in its rooms: fetch the board then. */
  onStream: (position: BoardStreamPosition) => void;
  /** Each numbered board delta as it arrives (unchecked: the store checks it against the schema). */
  onDelta: (delta: ServerEventPayload<'board:delta'>) => void;
  /** Connect at once (default true); otherwise call open(). */
  immediate?: boolean;
}

export interface UseBoardSocketReturn {
  status: Ref<BoardSocketStatus>;
  /** When the last stream position or delta arrived. */
  lastMessageAt: Ref<Date | null>;
  /** Why the last connection attempt failed, or null. */
  lastError: Ref<string | null>;
  open(): void;
  close(): void;
}

/**
 * The stock board's live feed over the tab's one shared connection (src/api/socket.ts), authenticated
 * by the session cookie (the server picks the farms). Pushes sent while the connection was down are
 * lost, so every connection starts with the stream position and the caller fetches the board then.
 * Stops listening when the calling scope is disposed.
 */
export function useBoardSocket(options: UseBoardSocketOptions): UseBoardSocketReturn {
  const status = ref<BoardSocketStatus>('offline');
  const lastMessageAt = shallowRef<Date | null>(null);
  const lastError = ref<string | null>(null);
  let stops: (() => void)[] = [];

  function open(): void {
    if (stops.length) return;
    const s = sharedSocket();
    status.value = s.connected ? 'live' : 'connecting';
    const onConnect = () => {
      status.value = 'live';
      lastError.value = null;
    };
    const onDisconnect = (reason: string) => {
      status.value = reason === 'io client disconnect' ? 'offline' : 'reconnecting';
    };
    const onConnectError = (err: Error) => {
      lastError.value = err.message;
      // `active` is false when the server refused the connection (signed out): no retry is coming.
      status.value = s.active ? 'reconnecting' : 'offline';
    };
    s.on('connect', onConnect);
    s.on('disconnect', onDisconnect);
    s.on('connect_error', onConnectError);
    stops = [
      () => {
        s.off('connect', onConnect);
        s.off('disconnect', onDisconnect);
        s.off('connect_error', onConnectError);
      },
      onServerEvent('board:stream', (position) => {
        lastMessageAt.value = new Date();
        options.onStream(position);
      }),
      onServerEvent('board:delta', (delta) => {
        lastMessageAt.value = new Date();
        options.onDelta(delta);
      }),
    ];
  }

  function close(): void {
    for (const stop of stops) stop();
    stops = [];
    status.value = 'offline';
  }

  if (options.immediate !== false) open();
  if (getCurrentScope()) onScopeDispose(close);

  return { status, lastMessageAt, lastError, open, close };
}
