// In-process events on ctx.events whose payloads are typed here (the older ones are still untyped),
// and the socket.io server's types, whose events come from the zod schemas in shared/schemas.
import type { Server, Socket } from 'socket.io';
import type { ClientToServerEvents, ServerToClientEvents, SessionUser } from '@shared/schemas';
import type { AppContext } from './context';

/** Farms of one organisation whose board figures changed. */
export interface BoardChange {
  organisationId: number;
  farmIds: number[];
}

export interface TypedEvents {
  /** Readings committed (rounds, corrections, logger imports): the farms' latest readings moved. */
  readings: BoardChange;
  /** Cached use rates refreshed in the background: the farms' days of cover moved. */
  forecasts: BoardChange;
  /** Sessions that ended: one by its id (sign-out), or every session of a user (reset, deactivation). */
  'session-ended': { sid: string } | { userId: number };
}

type Events = Pick<AppContext, 'events'>;

/** Emits a typed in-process event. */
export function emitEvent<K extends keyof TypedEvents>(ctx: Events, name: K, payload: TypedEvents[K]): void {
  ctx.events.emit(name, payload);
}

/** Listens for a typed in-process event; returns the function that stops listening. */
export function onEvent<K extends keyof TypedEvents>(ctx: Events, name: K, listener: (payload: TypedEvents[K]) => void): () => void {
  ctx.events.on(name, listener);
  return () => void ctx.events.off(name, listener);
}

/** What the server keeps on each socket: who opened it and with which session. */
export interface SocketData {
  actor: SessionUser;
  session: SocketSession;
}

/** The session a socket was opened with, and when it ends as far as the socket knows. */
export interface SocketSession {
  sid: string;
  userId: number;
  /** The store row's expiry when last read; HTTP use moves the row's on, so it is read again once this passes. */
  idleEndsAt: number;
  /** signedInAt + the absolute session length. */
  endsAt: number;
  /** When the handshake started checking the session: a session ended after this never gets the socket. */
  checkedAt: number;
}

/** socket.io's server with the event maps of shared/schemas (what the client sends, what the server sends). */
export type RealtimeServer = Server<ClientToServerEvents, ServerToClientEvents, Record<never, never>, SocketData>;
/** One connected socket of that server. */
export type RealtimeSocket = Socket<ClientToServerEvents, ServerToClientEvents, Record<never, never>, SocketData>;
