// The bus tells the other server processes that something kept in memory changed, so they drop
// their copy (signed-in users and sessions, kept boards…). A message goes to every process but
// the one that sent it: the sender has handled its own change already. Without REDIS_URL the bus
// lives in memory; bus instances share a hub only when given the same one (tests).
import { EventEmitter } from 'node:events';
import { randomUUID } from 'node:crypto';
import type { Logger } from 'pino';
import type { RedisConnection } from './redis';

export type BusHandler = (body: unknown) => void;

export interface Bus {
  /** Sends `body` (JSON-serialisable) on `topic` to the other processes; never throws. */
  publish(topic: string, body: unknown): void;
  /** Calls `handler` with each body another process publishes on `topic`; returns the function that stops it. */
  subscribe(topic: string, handler: BusHandler): () => void;
  close(): Promise<void>;
}

interface Envelope {
  origin: string;
  topic: string;
  body: unknown;
}

/** Local handlers by topic, fed with the envelopes of other origins. */
class Handlers {
  readonly origin = randomUUID();
  private readonly byTopic = new Map<string, Set<BusHandler>>();

  constructor(private readonly logger: Logger) {}

  add(topic: string, handler: BusHandler): () => void {
    if (!this.byTopic.has(topic)) this.byTopic.set(topic, new Set());
    this.byTopic.get(topic)!.add(handler);
    return () => void this.byTopic.get(topic)?.delete(handler);
  }

  deliver(envelope: Envelope): void {
    if (envelope.origin === this.origin) return;
    for (const handler of this.byTopic.get(envelope.topic) ?? []) {
      try {
        handler(envelope.body);
      } catch (err) {
        this.logger.error({ err, topic: envelope.topic }, 'a bus handler failed');
      }
    }
  }
}

/** A bus in this process's memory: instances given the same `hub` hear each other. */
export function memoryBus(logger: Logger, hub: EventEmitter = new EventEmitter()): Bus {
  const handlers = new Handlers(logger);
  const listener = (envelope: Envelope) => handlers.deliver(envelope);
  hub.on('message', listener);
  return {
    publish: (topic, body) => {
      const envelope: Envelope = { origin: handlers.origin, topic, body: JSON.parse(JSON.stringify(body ?? null)) };
      // Delivered after the current work, as Redis would.
      queueMicrotask(() => hub.emit('message', envelope));
    },
    subscribe: (topic, handler) => handlers.add(topic, handler),
    close: async () => void hub.off('message', listener),
  };
}

/** The Redis channel every message of the bus goes through. */
export const BUS_CHANNEL = 'brimstock:bus';

/** A bus over Redis pub/sub: `publisher` sends, a second connection (its duplicate) listens. */
export async function redisBus(publisher: RedisConnection, logger: Logger): Promise<Bus> {
  const handlers = new Handlers(logger);
  const subscriber = publisher.duplicate();
  subscriber.on('error', () => undefined); // logged through the publisher's connection
  await subscriber.connect();
  await subscriber.subscribe(BUS_CHANNEL, (text) => {
    try {
      handlers.deliver(JSON.parse(text) as Envelope);
    } catch (err) {
      logger.warn({ err }, 'an unreadable bus message was ignored');
    }
  });
  return {
    publish: (topic, body) => {
      const envelope: Envelope = { origin: handlers.origin, topic, body };
      publisher.publish(BUS_CHANNEL, JSON.stringify(envelope)).catch((err: unknown) => logger.warn({ err, topic }, 'a bus message could not be sent'));
    },
    subscribe: (topic, handler) => handlers.add(topic, handler),
    close: async () => {
      await subscriber.unsubscribe(BUS_CHANNEL).catch(() => undefined);
      subscriber.destroy();
    },
  };
}
