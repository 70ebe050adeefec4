// In-process events on ctx.events whose payloads are typed here; the older ones are still untyped.
import type { AppContext } from './context';

export interface TypedEvents {
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
