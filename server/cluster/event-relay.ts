// In-process events that every server process must hear, not only the one where they happened:
// each is published on the bus when emitted here and emitted here when another process publishes
// it. 'session-ended' closes a signed-out session's live sockets on every process at once.
import type { AppContext } from '../context';
import type { TypedEvents } from '../events';
import { clusterOf } from './index';

/** Events relayed between the processes. */
export const RELAYED_EVENTS = ['session-ended'] as const satisfies readonly (keyof TypedEvents)[];

/** Relays `names` between this process's ctx.events and the bus; returns the function that stops it. */
export function relayEvents(ctx: AppContext, names: readonly (keyof TypedEvents)[] = RELAYED_EVENTS): () => void {
  const { bus } = clusterOf(ctx);
  let fromBus = false;
  const stops: (() => void)[] = [];
  for (const name of names) {
    const topic = `event:${name}`;
    const outward = (payload: unknown) => {
      if (!fromBus) bus.publish(topic, payload);
    };
    ctx.events.on(name, outward);
    const unsubscribe = bus.subscribe(topic, (payload) => {
      // Listeners run synchronously inside emit, so the flag covers exactly this delivery.
      fromBus = true;
      try {
        ctx.events.emit(name, payload);
      } finally {
        fromBus = false;
      }
    });
    stops.push(() => {
      ctx.events.off(name, outward);
      unsubscribe();
    });
  }
  return () => stops.forEach((stop) => stop());
}
