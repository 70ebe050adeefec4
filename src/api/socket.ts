import { io, type Socket } from 'socket.io-client';
import type { ImportProgress } from '@shared/schemas';

/** Events the server pushes to one person (its `user:<id>` room) over the shared connection. */
export interface UserServerEvents {
  'import:progress': (payload: ImportProgress) => void;
}

type SharedSocket = Socket<UserServerEvents, Record<string, never>>;

let socket: SharedSocket | null = null;
let listeners = 0;

/**
 * The one socket.io connection of this tab to its own origin, created on first use and
 * authenticated by the session cookie; the server decides which pushes reach it.
 */
export function sharedSocket(): SharedSocket {
  socket ??= io({ path: '/socket.io', withCredentials: true, autoConnect: false });
  return socket;
}

/**
 * Listens for one pushed event; connects while anyone listens and disconnects after the last one
 * stops, so a signed-out tab keeps no connection. Returns the function that stops listening.
 */
export function onServerEvent<E extends keyof UserServerEvents>(event: E, handler: UserServerEvents[E]): () => void {
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
    if (listeners === 0) s.disconnect();
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
