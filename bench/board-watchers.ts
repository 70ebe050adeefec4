// Child process of the board bench: opens the watching socket.io clients (so their parsing does
// not slow the simulated workers' loop), records when each tank's newer reading first reaches
// each client, and afterwards matches those arrivals against the stored readings.
// Driven over the IPC channel by bench/board.ts; never run on its own.
import { io as connect, type Socket } from 'socket.io-client';
import type { BoardDelta, ClientToServerEvents, ServerToClientEvents, StockBoard } from '@shared/schemas';

type FromParent =
  | { type: 'open'; base: string; cookies: string[]; clients: number }
  | { type: 'mark' }
  | { type: 'stop' }
  /** Stored round readings: [tankId, takenAt ms, createdAt ms] (createdAt: server clock, just before the insert). */
  | { type: 'match'; readings: [number, number, number][] };

export type FromWatchers =
  | { type: 'ready'; clients: number; openMs: number }
  | { type: 'failed'; message: string }
  /** bytes: socket.io frames of the deltas received by all clients (JSON text, one byte a character). */
  | { type: 'stopped'; pushes: number; bytes: number; disconnects: number; errors: string[]; cpuMs: number }
  | { type: 'matched'; expected: number; delivered: number; p50Ms: number; p95Ms: number; p99Ms: number; maxMs: number };

interface Client {
  socket: Socket<ServerToClientEvents, ClientToServerEvents>;
  /** Per tank: the newest takenAt seen so far (ms). */
  seen: Map<number, number>;
  /** Per tank: arrivals of a newer takenAt, in order: [takenAt ms, received ms]. */
  arrivals: Map<number, [number, number][]>;
}

const clients: Client[] = [];
let pushes = 0;
let bytes = 0;
let counting = false;
/** GET /api/board once per session cookie: the watchers of one session share its board. */
const boards = new Map<string, Promise<StockBoard>>();
let disconnects = 0;
let stopping = false;
const errors: string[] = [];

const send = (m: FromWatchers) => process.send!(m);

function openClient(base: string, cookie: string): Promise<Client> {
  return new Promise((resolve, reject) => {
    const socket: Client['socket'] = connect(base, { transports: ['websocket'], extraHeaders: { cookie }, reconnection: false, forceNew: true, timeout: 60_000 });
    const client: Client = { socket, seen: new Map(), arrivals: new Map() };
    const note = (tankId: number, takenAt: string | null, at: number, record: boolean) => {
      if (!takenAt) return;
      const t = Date.parse(takenAt);
      if (t <= (client.seen.get(tankId) ?? -Infinity)) return;
      client.seen.set(tankId, t);
      if (!record) return;
      let list = client.arrivals.get(tankId);
      if (!list) client.arrivals.set(tankId, (list = []));
      list.push([t, at]);
    };
    socket.io.on('open', () => {
      socket.io.engine.on('packet', (p: { type: string; data?: unknown }) => {
        if (counting && p.type === 'message' && typeof p.data === 'string' && p.data.includes('"board:delta"')) bytes += p.data.length;
      });
    });
    // In its rooms: the board (as the client would fetch it) is the baseline the deltas move on from.
    socket.once('board:stream', () => {
      let board = boards.get(cookie);
      if (!board) {
        board = fetch(`${base}/api/board`, { headers: { cookie } }).then((r) => r.json() as Promise<StockBoard>);
        boards.set(cookie, board);
      }
      board
        .then((b) => {
          for (const f of b.farms) for (const tile of f.tanks) note(tile.tankId, tile.takenAt, 0, false);
          socket.on('board:delta', (delta: BoardDelta) => {
            const at = Date.now();
            pushes++;
            // A tile's reading time travels when it changed.
            for (const farm of delta.farms) for (const tile of farm.tanks) if (tile.takenAt !== undefined) note(tile.tankId, tile.takenAt, at, true);
          });
          resolve(client);
        })
        .catch(reject);
    });
    socket.on('disconnect', (reason) => {
      if (stopping) return;
      disconnects++;
      if (errors.length < 20) errors.push(`disconnect: ${reason}`);
    });
    socket.once('connect_error', (err) => reject(err));
  });
}

async function open(base: string, cookies: string[], count: number) {
  const started = Date.now();
  // A few at a time, as browsers opening the board would.
  for (let i = 0; i < count; i += 10) {
    const batch = Array.from({ length: Math.min(10, count - i) }, (_, j) => openClient(base, cookies[(i + j) % cookies.length]));
    clients.push(...(await Promise.all(batch)));
  }
  send({ type: 'ready', clients: clients.length, openMs: Date.now() - started });
}

/** For every (reading, client) pair: the first arrival at that client of a takenAt at or after the reading's. */
function match(readings: [number, number, number][]) {
  const byTank = new Map<number, [number, number][]>();
  for (const [tankId, takenAt, createdAt] of readings) {
    let list = byTank.get(tankId);
    if (!list) byTank.set(tankId, (list = []));
    list.push([takenAt, createdAt]);
  }
  for (const list of byTank.values()) list.sort((a, b) => a[0] - b[0]);
  const latencies = new Float64Array(readings.length * clients.length);
  let delivered = 0;
  for (const c of clients) {
    for (const [tankId, list] of byTank) {
      const arrivals = c.arrivals.get(tankId) ?? [];
      let j = 0;
      for (const [takenAt, createdAt] of list) {
        while (j < arrivals.length && arrivals[j][0] < takenAt) j++;
        if (j === arrivals.length) break;
        latencies[delivered++] = arrivals[j][1] - createdAt;
      }
    }
  }
  const got = latencies.subarray(0, delivered).sort();
  // Nearest-rank percentile.
  const pct = (p: number) => (delivered ? got[Math.min(delivered - 1, Math.ceil((p / 100) * delivered) - 1)] : NaN);
  send({ type: 'matched', expected: readings.length * clients.length, delivered, p50Ms: pct(50), p95Ms: pct(95), p99Ms: pct(99), maxMs: delivered ? got[delivered - 1] : NaN });
}

/** CPU used since the parent marked the start of the rounds. */
let cpuAtStart = process.cpuUsage();

process.on('message', (m: FromParent) => {
  if (m.type === 'mark') {
    cpuAtStart = process.cpuUsage();
    pushes = 0;
    counting = true;
  } else if (m.type === 'open') {
    open(m.base, m.cookies, m.clients).catch((err: Error) => send({ type: 'failed', message: err.message }));
  } else if (m.type === 'stop') {
    stopping = true;
    for (const c of clients) c.socket.disconnect();
    const cpu = process.cpuUsage(cpuAtStart);
    send({ type: 'stopped', pushes, bytes, disconnects, errors, cpuMs: (cpu.user + cpu.system) / 1000 });
  } else if (m.type === 'match') {
    match(m.readings);
    process.disconnect();
  }
});
process.on('disconnect', () => process.exit(0));
