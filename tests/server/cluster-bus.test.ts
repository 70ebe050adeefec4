// The parts of server/cluster that need no Redis: the in-memory bus, slot claims and the event relay.
import { EventEmitter } from 'node:events';
import pino from 'pino';
import { describe, expect, it } from 'vitest';
import { memoryBus } from '../../server/cluster/bus';
import { relayEvents } from '../../server/cluster/event-relay';
import { claimSlot, memoryLock, slotOf } from '../../server/cluster/job-lock';
import type { Cluster } from '../../server/cluster';
import type { AppContext } from '../../server/context';

const logger = pino({ level: 'silent' });
const settle = () => new Promise((r) => setTimeout(r, 5));

/** A context holding only what the relay uses: its events and a cluster whose bus is on `hub`. */
function contextOn(hub: EventEmitter): AppContext {
  const cluster: Cluster = { shared: true, bus: memoryBus(logger, hub), locks: memoryLock(), limitStoreFor: () => undefined, close: async () => undefined };
  return { logger, events: new EventEmitter(), cluster } as unknown as AppContext;
}

describe('memoryBus', () => {
  it('delivers a message to the other buses on its hub but not back to its sender', async () => {
    const hub = new EventEmitter();
    const [a, b, c] = [memoryBus(logger, hub), memoryBus(logger, hub), memoryBus(logger, hub)];
    const heard: string[] = [];
    a.subscribe('t', (m) => heard.push(`a:${JSON.stringify(m)}`));
    b.subscribe('t', (m) => heard.push(`b:${JSON.stringify(m)}`));
    c.subscribe('other', (m) => heard.push(`c:${JSON.stringify(m)}`));
    a.publish('t', { kind: 'users' });
    await settle();
    expect(heard).toEqual(['b:{"kind":"users"}']);
  });

  it('delivers nothing once the subscription is stopped or the bus closed', async () => {
    const hub = new EventEmitter();
    const [a, b] = [memoryBus(logger, hub), memoryBus(logger, hub)];
    const heard: unknown[] = [];
    const stop = b.subscribe('t', (m) => heard.push(m));
    a.publish('t', 1);
    await settle();
    stop();
    a.publish('t', 2);
    await settle();
    expect(heard).toEqual([1]);
  });
});

describe('claimSlot', () => {
  it('lets one claim of a period win and the next period be claimed again', async () => {
    const lock = memoryLock();
    const periodMs = 1_000;
    const t = 1_700_000_000_250; // 250 ms into slot 1,700,000,000
    expect(slotOf(t, periodMs)).toBe(1_700_000_000);
    expect(await claimSlot(lock, 'job', periodMs, t)).toBe(true);
    expect(await claimSlot(lock, 'job', periodMs, t + 700)).toBe(false);
    expect(await claimSlot(lock, 'other-job', periodMs, t + 700)).toBe(true);
    expect(await claimSlot(lock, 'job', periodMs, t + 750)).toBe(true);
  });
});

describe('relayEvents', () => {
  it('emits a session-ended of one process on the others once, without sending it back', async () => {
    const hub = new EventEmitter();
    const [a, b] = [contextOn(hub), contextOn(hub)];
    relayEvents(a);
    relayEvents(b);
    const onA: unknown[] = [];
    const onB: unknown[] = [];
    a.events.on('session-ended', (p) => onA.push(p));
    b.events.on('session-ended', (p) => onB.push(p));
    a.events.emit('session-ended', { sid: 'abc' });
    await settle();
    expect(onA).toEqual([{ sid: 'abc' }]);
    expect(onB).toEqual([{ sid: 'abc' }]);
  });
});
