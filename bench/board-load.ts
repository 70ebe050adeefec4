// Load generators of the board bench and their CPU statistics: autocannon on the board, workers posting rounds while sockets watch.
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import autocannon from 'autocannon';
import type { BenchFigure } from './calibration';
import type { FromWatchers } from './board-watchers';
import { FARMS, TANKS_PER_FARM, WATCHER_SESSIONS, WORKERS, log, pool, serverTimings, signIn, sleep, type BenchTank, type buildFixture, type Session } from './board-setup';

const WATCHERS = 200;
const BOARD_CONNECTIONS = 50;
const BOARD_SECONDS = 20;
const ROUND_SECONDS = 30;
/** A worker's pause between two rounds (ms); override with BENCH_BOARD_THINK_MS. */
const THINK_MS = Number(process.env.BENCH_BOARD_THINK_MS ?? 1000);

const BOARD_P99_MS = 50;
const PUSH_P95_MS = 250;

const root = resolve(import.meta.dirname, '..');

/** CPU seconds used so far by a process (from /proc) and by this one, with the wall clock. */
function cpuNow(pid: number | undefined) {
  let server = NaN;
  try {
    // Fields 14 and 15 of /proc/<pid>/stat: user and system time in clock ticks (100 a second on Linux).
    const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
    server = (Number(fields[11]) + Number(fields[12])) / 100;
  } catch {
    // Not Linux, or the process is gone: the share prints as NaN.
  }
  const self = process.cpuUsage();
  return { server, self: (self.user + self.system) / 1e6, wall: performance.now() / 1000 };
}

/** Per cent of one core each used between two `cpuNow` readings. */
function cpuShares(from: ReturnType<typeof cpuNow>, to: ReturnType<typeof cpuNow>) {
  const wallS = to.wall - from.wall;
  return { wallS, server: (100 * (to.server - from.server)) / wallS, self: (100 * (to.self - from.self)) / wallS };
}

/** (a) autocannon against the board data endpoint (`encodings`: which of the two ways of asking; both by default). */
export async function boardLoad(base: string, manager: Session, server: ChildProcess, opts: { encodings?: ('gzip' | 'identity')[] } = {}): Promise<BenchFigure[]> {
  const serverPid = server.pid;
  const figures: BenchFigure[] = [];
  const asked = opts.encodings ?? ['gzip', 'identity'];
  // As a browser asks (gzip accepted), then uncompressed, as a plain HTTP client would.
  for (const [encoding, how] of ([['gzip, deflate, br', 'gzip, as browsers ask'], ['identity', 'uncompressed']] as const).filter(([e]) => asked.includes(e === 'identity' ? 'identity' : 'gzip'))) {
    const opts = { url: `${base}/api/board`, headers: { cookie: manager.cookie, 'accept-encoding': encoding } };
    // Warm-up, not a figure: one connection shows what a single request costs with no queueing.
    const single = await autocannon({ ...opts, connections: 1, duration: 5 });
    log(`board (${how}) warm-up, 1 connection: ${single.requests.total} requests, ${single.latency.p50} ms p50, ${single.latency.p99} ms p99, ${Math.round(single.throughput.average / 1024)} kB/s`);
    await serverTimings(server);
    const cpuFrom = cpuNow(serverPid);
    const r = await autocannon({ ...opts, connections: BOARD_CONNECTIONS, duration: BOARD_SECONDS });
    const cpu = cpuShares(cpuFrom, cpuNow(serverPid));
    const inside = (await serverTimings(server))['board-request'];
    log(`CPU during that run (2 cores = 200 %): server ${cpu.server.toFixed(0)} %, autocannon (this process) ${cpu.self.toFixed(0)} %; server CPU per request ${((10 * cpu.server * cpu.wallS) / r.requests.total).toFixed(2)} ms`);
    const label = `GET /api/board (manager, ${FARMS * TANKS_PER_FARM} tanks, ${how}), ${BOARD_CONNECTIONS} connections, ${BOARD_SECONDS} s`;
    const failed = r.non2xx + r.errors + r.timeouts;
    log(`board (${how}): ${r.requests.total} requests, ${r.latency.p50} ms p50, ${r.latency.p99} ms p99, ${r.requests.average} req/s, ${Math.round(r.throughput.average / 1024)} kB/s, ${failed} failed`);
    log(`board (${how}) inside the server (request in to answer written): ${inside?.count ?? 0} requests, p50 ${inside?.p50Ms.toFixed(2)} ms, p99 ${inside?.p99Ms.toFixed(2)} ms, max ${inside?.maxMs.toFixed(1)} ms`);
    figures.push(
      { name: `${label}: p50 latency`, value: r.latency.p50, unit: 'ms', target: BOARD_P99_MS, pass: 'below', ok: r.latency.p50 < BOARD_P99_MS },
      { name: `${label}: p99 latency`, value: r.latency.p99, unit: 'ms', target: BOARD_P99_MS, pass: 'below', ok: r.latency.p99 < BOARD_P99_MS },
      { name: `${label}: p99 inside the server (request in to answer written)`, value: inside?.p99Ms ?? NaN, unit: 'ms', target: BOARD_P99_MS, pass: 'below', ok: (inside?.p99Ms ?? Infinity) < BOARD_P99_MS },
      // 50 connections each answered within 50 ms means at least 50 / 0.05 s = 1,000 requests a second.
      { name: `${label}: throughput (target follows from the p99 target: ${BOARD_CONNECTIONS} / ${BOARD_P99_MS} ms)`, value: r.requests.average, unit: 'req/s', target: (BOARD_CONNECTIONS * 1000) / BOARD_P99_MS, pass: 'above', ok: r.requests.average > (BOARD_CONNECTIONS * 1000) / BOARD_P99_MS },
      { name: `${label}: non-2xx, errors and timeouts of ${r.requests.total.toLocaleString('en-US')} requests`, value: failed, unit: 'requests', target: 1, pass: 'below', ok: failed < 1 },
    );
  }
  return figures;
}

export function watchersProcess() {
  const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'bench/board-watchers.ts')], { cwd: root, stdio: ['ignore', 'inherit', 'inherit', 'ipc'] });
  const waitFor = <T extends FromWatchers['type']>(type: T) =>
    new Promise<Extract<FromWatchers, { type: T }>>((ok, fail) => {
      const onMessage = (m: FromWatchers) => {
        if (m.type === 'failed') fail(new Error(`watchers: ${m.message}`));
        else if (m.type === type) ok(m as Extract<FromWatchers, { type: T }>);
        else return;
        child.off('message', onMessage);
      };
      child.on('message', onMessage);
      child.once('exit', (code) => fail(new Error(`watchers exited with ${code}`)));
    });
  return { child, waitFor, send: (m: object) => child.send(m) };
}

/** (b) workers posting rounds while sockets watch the board. */
export async function roundLoad(base: string, fx: Awaited<ReturnType<typeof buildFixture>>, storedRounds: () => Promise<{ count: number; rows: [number, number, number][] }>, watchers: ReturnType<typeof watchersProcess>, server: ChildProcess): Promise<BenchFigure[]> {
  const serverPid = server.pid;
  const managerSessions = await pool(fx.managers.slice(1, 1 + WATCHER_SESSIONS), 4, (email) => signIn(base, email));
  watchers.send({ type: 'open', base, cookies: managerSessions.map((s) => s.cookie), clients: WATCHERS });
  const ready = await watchers.waitFor('ready');
  log(`${ready.clients} watching sockets open in ${(ready.openMs / 1000).toFixed(1)} s`);
  const workerSessions = await pool(fx.workers, 4, async (w) => ({ ...w, session: await signIn(base, w.email) }));
  log(`${workerSessions.length} workers signed in`);

  const tanksOfFarm = new Map<number, BenchTank[]>();
  for (const t of fx.tanks) tanksOfFarm.set(t.farmId, [...(tanksOfFarm.get(t.farmId) ?? []), t]);
  // Each worker walks half of a farm's tanks; levels start at the tank's latest logger reading and
  // fall 3–19 mm a round, refilling to near safe fill when they reach 300 mm.
  const levels = new Map(fx.tanks.map((t) => [t.id, fx.latest.get(t.id) ?? t.safeFillLevelMm / 2]));
  let acknowledged = 0;
  let rounds = 0;
  const errors: string[] = [];
  let errorCount = 0;
  const fail = (msg: string) => {
    errorCount++;
    if (errors.length < 10) errors.push(msg);
  };
  const deadline = Date.now() + ROUND_SECONDS * 1000;
  await serverTimings(server);
  const cpuFrom = cpuNow(serverPid);
  watchers.send({ type: 'mark' });
  const roundMs: number[] = [];
  await Promise.all(workerSessions.map(async (w, wi) => {
    const farmId = fx.farmIds[w.farmIndex];
    const mine = tanksOfFarm.get(farmId)!.filter((_, i) => i % 2 === w.half);
    await sleep((wi * THINK_MS) / WORKERS); // spread the first rounds out
    while (Date.now() < deadline) {
      const entries = mine.map((t) => {
        let level = levels.get(t.id)! - (3 + ((t.id * 13 + rounds) % 17));
        if (level < 300) level = t.safeFillLevelMm - 20;
        levels.set(t.id, level);
        return { tankId: t.id, readingMm: Math.round(level), temperatureC: 15, idempotencyKey: randomBytes(16).toString('hex') };
      });
      const t0 = performance.now();
      try {
        const res = await fetch(`${base}/api/rounds`, {
          method: 'POST',
          headers: { 'content-type': 'application/json', cookie: w.session.cookie, 'x-csrf-token': w.session.csrf },
          body: JSON.stringify({ farmId, entries }),
        });
        const body = (await res.json()) as { results?: { status: string; reason?: string }[] };
        roundMs.push(performance.now() - t0);
        rounds++;
        if (res.status !== 201) fail(`round answered ${res.status}: ${JSON.stringify(body).slice(0, 200)}`);
        for (const r of body.results ?? []) {
          if (r.status === 'stored') acknowledged++;
          else fail(`entry ${r.status}${r.reason ? `: ${r.reason}` : ''}`);
        }
      } catch (err) {
        fail(`round failed: ${(err as Error).message}`);
      }
      await sleep(THINK_MS);
    }
  }));
  // Let the last gathered pushes (100 ms window) go out before the watchers stop.
  await sleep(2000);
  const cpu = cpuShares(cpuFrom, cpuNow(serverPid));
  const push = (await serverTimings(server))['board-push'];
  watchers.send({ type: 'stop' });
  const stopped = await watchers.waitFor('stopped');
  const stored = await storedRounds();
  watchers.send({ type: 'match', readings: stored.rows });
  const matched = await watchers.waitFor('matched');
  roundMs.sort((a, b) => a - b);
  const roundP95 = roundMs.length ? roundMs[Math.ceil(0.95 * roundMs.length) - 1] : NaN;
  log(`rounds: ${rounds} posted (p95 answer ${roundP95.toFixed(0)} ms), ${acknowledged} readings acknowledged, ${stored.count} stored; ${stopped.pushes.toLocaleString('en-US')} pushes received; ${matched.delivered.toLocaleString('en-US')} of ${matched.expected.toLocaleString('en-US')} reading arrivals; latency p50 ${matched.p50Ms} ms, p95 ${matched.p95Ms} ms, p99 ${matched.p99Ms} ms, max ${matched.maxMs} ms`);
  const bytesPerS = stopped.bytes / cpu.wallS;
  log(`pushed: ${stopped.pushes.toLocaleString('en-US')} deltas received, ${(stopped.bytes / 1e6).toFixed(1)} MB in ${cpu.wallS.toFixed(1)} s (${(bytesPerS / 1e6).toFixed(2)} MB/s to all ${ready.clients} sockets, ${(bytesPerS / ready.clients / 1024).toFixed(1)} kB/s each)`);
  log(`server's own share (event after the commit to the delta handed to socket.io, ${push?.count ?? 0} deltas): p50 ${push?.p50Ms.toFixed(1)} ms, p95 ${push?.p95Ms.toFixed(1)} ms, p99 ${push?.p99Ms.toFixed(1)} ms, max ${push?.maxMs.toFixed(1)} ms`);
  log(`CPU while the rounds ran (${cpu.wallS.toFixed(1)} s, 2 cores = 200 %): server ${cpu.server.toFixed(0)} %, workers (this process) ${cpu.self.toFixed(0)} %, watchers ${((100 * stopped.cpuMs) / 1000 / cpu.wallS).toFixed(0)} %`);
  for (const e of [...errors, ...stopped.errors]) log(`error: ${e}`);
  const label = `${WORKERS} workers posting rounds for ${ROUND_SECONDS} s (${THINK_MS} ms between rounds) while ${ready.clients} sockets watch`;
  const lost = Math.abs(acknowledged - stored.count);
  const undelivered = matched.expected - matched.delivered;
  return [
    { name: `${label}: errors (failed rounds, refused or duplicate entries, socket disconnects)`, value: errorCount + stopped.disconnects, unit: 'errors', target: 1, pass: 'below', ok: errorCount + stopped.disconnects < 1 },
    { name: `${label}: |acknowledged − stored| readings (${acknowledged.toLocaleString('en-US')} acknowledged, ${stored.count.toLocaleString('en-US')} stored, ${rounds} rounds)`, value: lost, unit: 'readings', target: 1, pass: 'below', ok: lost < 1 && acknowledged > 0 },
    { name: `${label}: stored readings that never reached a watching socket (of ${matched.expected.toLocaleString('en-US')} reading × socket pairs)`, value: undelivered, unit: 'arrivals', target: 1, pass: 'below', ok: undelivered < 1 },
    { name: `${label}: p50 from a reading's insert (server clock) to its delta reaching a watching socket`, value: matched.p50Ms, unit: 'ms', target: PUSH_P95_MS, pass: 'below', ok: matched.p50Ms < PUSH_P95_MS },
    { name: `${label}: p95 from a reading's insert (server clock) to its delta reaching a watching socket`, value: matched.p95Ms, unit: 'ms', target: PUSH_P95_MS, pass: 'below', ok: matched.p95Ms < PUSH_P95_MS },
    { name: `${label}: p99 from a reading's insert (server clock) to its delta reaching a watching socket`, value: matched.p99Ms, unit: 'ms', target: PUSH_P95_MS, pass: 'below', ok: matched.p99Ms < PUSH_P95_MS },
    { name: `${label}: server's own share, p95 from the event after the commit to the delta handed to socket.io`, value: push?.p95Ms ?? NaN, unit: 'ms', target: PUSH_P95_MS, pass: 'below', ok: (push?.p95Ms ?? Infinity) < PUSH_P95_MS },
  ];
}
