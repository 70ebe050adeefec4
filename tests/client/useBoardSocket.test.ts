import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { effectScope } from 'vue';
import * as client from 'socket.io-client';
import { useBoardSocket } from '@/composables/useBoardSocket';
import { makeBoard, makeFarmBoard, makeTile } from './support/tanks';

const fake = vi.hoisted(() => {
  type Handler = (...args: unknown[]) => void;
  class FakeSocket {
    readonly handlers = new Map<string, Handler[]>();
    readonly emitted: unknown[][] = [];
    active = true;
    connect = vi.fn();
    disconnect = vi.fn();
    constructor(readonly options: unknown) {}
    on(event: string, handler: Handler) {
      this.handlers.set(event, [...(this.handlers.get(event) ?? []), handler]);
      return this;
    }
    off() {
      this.handlers.clear();
      return this;
    }
    emit(...args: unknown[]) {
      this.emitted.push(args);
      return this;
    }
    /** What the server (or the transport) would make happen. */
    fire(event: string, ...args: unknown[]) {
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

function start() {
  const onBoard = vi.fn();
  const onFarm = vi.fn();
  const scope = effectScope();
  const live = scope.run(() => useBoardSocket({ onBoard, onFarm, serverCloseDelayMs: 50 }))!;
  return { live, scope, onBoard, onFarm, socket: fake.made.at(-1)! };
}

beforeEach(() => {
  fake.made.length = 0;
  vi.mocked(client.io).mockClear();
  vi.useFakeTimers();
});
afterEach(() => vi.useRealTimers());

describe('useBoardSocket', () => {
  it('connects to this origin on /socket.io with credentials', () => {
    const { live } = start();

    expect(client.io).toHaveBeenCalledWith({ path: '/socket.io', withCredentials: true });
    expect(live.status.value).toBe('connecting');
  });

  it('hands whole boards and farm pushes to the callbacks', () => {
    const { socket, onBoard, onFarm, live } = start();
    const board = makeBoard([]);
    const farm = makeFarmBoard(11, 'Creek site', [makeTile({ tankId: 1, code: 'CS-W1' })]);

    socket.fire('connect');
    socket.fire('board', board);
    socket.fire('board:farms', [farm]);

    expect(live.status.value).toBe('live');
    expect(onBoard).toHaveBeenCalledWith(board);
    expect(onFarm).toHaveBeenCalledWith(farm);
    expect(live.lastMessageAt.value).toBeInstanceOf(Date);
  });

  it('asks for the whole board again on every reconnect, not on the first connection', () => {
    const { socket, live } = start();

    socket.fire('connect');
    expect(socket.emitted).toEqual([]);

    socket.fire('disconnect', 'transport close');
    expect(live.status.value).toBe('reconnecting');
    socket.fire('connect');
    socket.fire('disconnect', 'ping timeout');
    socket.fire('connect');

    expect(socket.emitted).toEqual([['board:resync'], ['board:resync']]);
    expect(live.status.value).toBe('live');
  });

  it('connects again after the server closed the connection', () => {
    const { socket, live } = start();
    socket.fire('connect');

    socket.fire('disconnect', 'io server disconnect');
    expect(live.status.value).toBe('reconnecting');
    expect(socket.connect).not.toHaveBeenCalled();
    vi.advanceTimersByTime(50);

    expect(socket.connect).toHaveBeenCalledTimes(1);
  });

  it('reports offline when the server refuses the connection', () => {
    const { socket, live } = start();
    socket.active = false;

    socket.fire('connect_error', new Error('unauthenticated'));

    expect(live.status.value).toBe('offline');
    expect(live.lastError.value).toBe('unauthenticated');
  });

  it('disconnects when its scope is disposed', () => {
    const { socket, scope, live } = start();
    socket.fire('connect');

    scope.stop();

    expect(socket.disconnect).toHaveBeenCalledTimes(1);
    expect(socket.handlers.size).toBe(0);
    expect(live.status.value).toBe('offline');
  });
});
