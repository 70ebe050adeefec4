import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { effectScope } from 'vue';
import * as client from 'socket.io-client';
import { BOARD_DELTA_VERSION } from '@shared/schemas';

const fake = vi.hoisted(() => {
  type Handler = (...args: unknown[]) => void;
  class FakeSocket {
    readonly handlers = new Map<string, Handler[]>();
    active = false;
    connected = false;
    connect = vi.fn(() => {
      this.active = true;
    });
    disconnect = vi.fn(() => {
      this.active = false;
      this.connected = false;
    });
    constructor(readonly options: unknown) {}
    on(event: string, handler: Handler) {
      this.handlers.set(event, [...(this.handlers.get(event) ?? []), handler]);
      return this;
    }
    off(event: string, handler: Handler) {
      this.handlers.set(event, (this.handlers.get(event) ?? []).filter((h) => h !== handler));
      return this;
    }
    listenerCount() {
      return [...this.handlers.values()].reduce((n, hs) => n + hs.length, 0);
    }
    /** What the server (or the transport) would make happen. */
    fire(event: string, ...args: unknown[]) {
      if (event === 'connect') this.connected = true;
      if (event === 'disconnect') this.connected = false;
      for (const h of this.handlers.get(event) ?? []) h(...args);
    }
  }
  const made: FakeSocket[] = [];
  return { FakeSocket, made };
});

vi.mock('socket.io-client', () => ({
  io: vi.fn((options: unknown) => {
    const socket = new fake.FakeSocket(options);
    fake.made.push(socket);
    return socket;
  }),
}));

const position = { version: BOARD_DELTA_VERSION, epoch: 'e1', seq: 4 };

async function start() {
  // A fresh module each test: the tab's one shared socket is made on first use.
  const { useBoardSocket } = await import('@/composables/useBoardSocket');
  const onStream = vi.fn();
  const onDelta = vi.fn();
  const scope = effectScope();
  const live = scope.run(() => useBoardSocket({ onStream, onDelta }))!;
  return { live, scope, onStream, onDelta, socket: fake.made.at(-1)! };
}

beforeEach(() => {
  fake.made.length = 0;
  vi.mocked(client.io).mockClear();
  vi.resetModules();
  vi.useFakeTimers();
});
afterEach(() => vi.useRealTimers());

describe('useBoardSocket', () => {
  it('uses the tab\'s one shared connection to this origin on /socket.io with credentials', async () => {
    const { live } = await start();
    const { onFlagsPush } = await import('@/api/flags');
    const stopFlags = onFlagsPush(() => undefined);

    expect(client.io).toHaveBeenCalledTimes(1);
    expect(client.io).toHaveBeenCalledWith({ path: '/socket.io', withCredentials: true, autoConnect: false });
    expect(live.status.value).toBe('connecting');
    stopFlags();
  });

  it('hands the stream position and each delta to the callbacks', async () => {
    const { socket, onStream, onDelta, live } = await start();
    const delta = { ...position, seq: 5, generatedAt: '2026-03-02T10:00:00.000Z', totals: [], farms: [], removedFarmIds: [] };

    socket.fire('connect');
    socket.fire('board:stream', position);
    socket.fire('board:delta', delta);

    expect(live.status.value).toBe('live');
    expect(onStream).toHaveBeenCalledWith(position);
    expect(onDelta).toHaveBeenCalledWith(delta);
    expect(live.lastMessageAt.value).toBeInstanceOf(Date);
  });

  it('reports reconnecting while the connection is lost and live once it is back', async () => {
    const { socket, live } = await start();
    socket.fire('connect');

    socket.fire('disconnect', 'transport close');
    expect(live.status.value).toBe('reconnecting');
    socket.fire('connect');

    expect(live.status.value).toBe('live');
  });

  it('connects again after the server closed the connection', async () => {
    const { socket, live } = await start();
    socket.fire('connect');
    expect(socket.connect).toHaveBeenCalledTimes(1);

    socket.active = false;
    socket.fire('disconnect', 'io server disconnect');
    expect(live.status.value).toBe('reconnecting');
    vi.advanceTimersByTime(1000);

    expect(socket.connect).toHaveBeenCalledTimes(2);
  });

  it('reports offline when the server refuses the connection', async () => {
    const { socket, live } = await start();
    socket.active = false;

    socket.fire('connect_error', new Error('unauthenticated'));

    expect(live.status.value).toBe('offline');
    expect(live.lastError.value).toBe('unauthenticated');
  });

  it('stops listening when its scope is disposed, and the connection closes with its last listener', async () => {
    const { socket, scope, live } = await start();
    socket.fire('connect');
    const { onFlagsPush } = await import('@/api/flags');
    const stopFlags = onFlagsPush(() => undefined);

    scope.stop();
    expect(live.status.value).toBe('offline');
    expect(socket.disconnect).not.toHaveBeenCalled();
    stopFlags();

    expect(socket.disconnect).toHaveBeenCalledTimes(1);
    // Only the shared socket's own reconnect handler is left.
    expect(socket.listenerCount()).toBe(1);
  });
});
