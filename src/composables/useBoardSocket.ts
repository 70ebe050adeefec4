import { getCurrentScope, onScopeDispose, ref, shallowRef, type Ref } from 'vue';
import { io, type Socket } from 'socket.io-client';
import type { FarmBoard, StockBoard } from '@shared/schemas';

/** connecting: first connection; live: pushes arrive; reconnecting: lost, trying again; offline: given up or closed. */
export type BoardSocketStatus = 'connecting' | 'live' | 'reconnecting' | 'offline';

interface ServerEvents {
  board: (board: StockBoard) => void;
  'board:farms': (farms: FarmBoard[]) => void;
}
interface ClientEvents {
  'board:resync': () => void;
}
type BoardSocket = Socket<ServerEvents, ClientEvents>;

export interface UseBoardSocketOptions {
  /** The whole board: on every connection, and after each resync. */
  onBoard: (board: StockBoard) => void;
  /** One farm's board, for each farm in a push after readings of those farms are stored. */
  onFarm: (farm: FarmBoard) => void;
  /** Connect at once (default true); otherwise call open(). */
  immediate?: boolean;
  /** socket.io's HTTP path on this origin (default '/socket.io'). */
  path?: string;
  /** Wait before connecting again after the server closed the connection, ms (default 1000). */
  serverCloseDelayMs?: number;
}

export interface UseBoardSocketReturn {
  status: Ref<BoardSocketStatus>;
  /** When the last board or farm push arrived. */
  lastMessageAt: Ref<Date | null>;
  /** Why the last connection attempt failed, or null. */
  lastError: Ref<string | null>;
  open(): void;
  close(): void;
}

/**
 * The stock board's live connection to this origin, authenticated by the session cookie (the server
 * picks the farms). Asks for the whole board again after every reconnect, since pushes sent while
 * the connection was down are lost. Closed when the calling scope is disposed.
 */
export function useBoardSocket(options: UseBoardSocketOptions): UseBoardSocketReturn {
  const status = ref<BoardSocketStatus>('offline');
  const lastMessageAt = shallowRef<Date | null>(null);
  const lastError = ref<string | null>(null);
  let socket: BoardSocket | null = null;
  let connectedBefore = false;
  let retryTimer: ReturnType<typeof setTimeout> | null = null;

  function open(): void {
    if (socket) return;
    status.value = 'connecting';
    const s: BoardSocket = io({ path: options.path ?? '/socket.io', withCredentials: true });
    socket = s;

    s.on('connect', () => {
      status.value = 'live';
      lastError.value = null;
      if (connectedBefore) s.emit('board:resync');
      connectedBefore = true;
    });
    s.on('disconnect', (reason) => {
      if (reason === 'io client disconnect') {
        status.value = 'offline';
        return;
      }
      status.value = 'reconnecting';
      // The server closes a person's sockets when their access changes; socket.io does not come back
      // by itself after that, so connect again and let the server decide what they now see.
      if (reason === 'io server disconnect') {
        retryTimer = setTimeout(() => {
          retryTimer = null;
          s.connect();
        }, options.serverCloseDelayMs ?? 1000);
      }
    });
    s.on('connect_error', (err) => {
      lastError.value = err.message;
      // `active` is false when the server refused the connection (signed out): no retry is coming.
      status.value = s.active ? 'reconnecting' : 'offline';
    });
    s.on('board', (board) => {
      lastMessageAt.value = new Date();
      options.onBoard(board);
    });
    s.on('board:farms', (farms) => {
      lastMessageAt.value = new Date();
      for (const farm of farms) options.onFarm(farm);
    });
  }

  function close(): void {
    if (retryTimer) clearTimeout(retryTimer);
    retryTimer = null;
    if (!socket) return;
    socket.off();
    socket.disconnect();
    socket = null;
    connectedBefore = false;
    status.value = 'offline';
  }

  if (options.immediate !== false) open();
  if (getCurrentScope()) onScopeDispose(close);

  return { status, lastMessageAt, lastError, open, close };
}
