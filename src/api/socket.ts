import { io, type Socket } from 'socket.io-client';
import type { ClientToServerEvents, ServerToClientEvents } from '@shared/schemas';

/** The tab's socket, typed by the event map of shared/schemas/board-delta.ts. */
export type SharedSocket = Socket<ServerToClientEvents, ClientToServerEvents>;
/** The events the server sends. */
export type ServerEventName = keyof ServerToClientEvents;

/** Wait before connecting again after the server closed the connection, ms. */
export const SERVER_CLOSE_RETRY_MS = 1000;

let socket: SharedSocket | null = null;
let listeners = 0;
let retryTimer: ReturnType<typeof setTimeout> | null = null;

/**
 * The one socket.io connection of this tab to its own origin (the board, flags and import progress
 * all share it), created on first use and authenticated by the session cookie; the server decides
 * which pushes reach it.
 */
export function sharedSocket(): SharedSocket {
  if (socket) return socket;
  const s: SharedSocket = io({ path: '/socket.io', withCredentials: true, autoConnect: false });
  // The server closes a person's sockets when their access changes; socket.io does not come back by
  // itself after that, so connect again (while anyone listens) and let the server decide what they now see.
  s.on('disconnect', (reason) => {
    if (reason !== 'io server disconnect') return;
    if (retryTimer) clearTimeout(retryTimer);
    retryTimer = setTimeout(() => {
      retryTimer = null;
      if (listeners > 0 && !s.active) s.connect();
    }, SERVER_CLOSE_RETRY_MS);
  });
  socket = s;
  return s;
}

/**
 * Listens for one pushed event; connects while anyone listens and disconnects after the last one
 * stops, so a signed-out tab keeps no connection. Returns the function that stops listening.
 */
export function onServerEvent<E extends ServerEventName>(event: E, handler: ServerToClientEvents[E]): () => void {
  const s = sharedSocket();
  s.on(event, handler as never);
  listeners++;
  // Not `active` means no connection and no retry pending (never opened, closed, or refused while signed out).
  if (!s.active) s.connect();
  let stopped = false;
  return () => {
    if (stopped) return;
    stopped = true;
    s.off(event, handler as never);
    listeners--;
    if (listeners === 0) {
      if (retryTimer) clearTimeout(retryTimer);
      retryTimer = null;
      s.disconnect();
    }
  };
}

/** Resolves true once the shared connection is up; false after `timeoutMs`, or at once when nobody listens (pushes are then missed, never needed). */
export function whenConnected(timeoutMs: number): Promise<boolean> {
  const s = sharedSocket();
  if (s.connected) return Promise.resolve(true);
  if (!s.active) return Promise.resolve(false);
  return new Promise((resolve) => {
    const done = (ok: boolean) => {
      clearTimeout(timer);
      s.off('connect', onConnect);
      resolve(ok);
    };
    const onConnect = () => done(true);
    const timer = setTimeout(() => done(false), timeoutMs);
    s.on('connect', onConnect);
  });
}
