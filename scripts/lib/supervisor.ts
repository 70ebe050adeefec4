// Keeps the child processes of `npm start` and `npm run dev` running, and stops them all cleanly.
// A child that dies on its own (crash, exit, or a signal such as kill -9, when its exitCode is
// null and its signalCode set) is started again after a back-off, up to a limit; past the limit,
// or for a child that may not be restarted, everything is stopped and the supervisor exits non-zero.
import type { ChildProcess } from 'node:child_process';

export interface ChildSpec {
  name: string;
  start(): ChildProcess;
  /** Start it again when it dies on its own (default true). */
  restart?: boolean;
}

export interface SupervisorOptions {
  children: ChildSpec[];
  /** Restarts allowed per child within `windowMs` (0: never restart). */
  maxRestarts: number;
  /** Run after every child has stopped (database, mail receiver…). */
  cleanup(): Promise<void>;
  /** Called with the exit code when everything has stopped (default: process.exit). */
  exit?(code: number): void;
  log?(line: string): void;
  /** First back-off; it doubles on each restart up to 30 s (default 1 s). */
  backoffMs?: number;
  /** A child that stayed up this long has its restart count cleared (default 10 minutes). */
  windowMs?: number;
}

const alive = (c: ChildProcess) => c.exitCode === null && c.signalCode === null;
const exited = (c: ChildProcess) => (alive(c) ? new Promise<void>((r) => c.once('exit', () => r())) : Promise.resolve());

/** How a child ended, in words. */
export const endedHow = (code: number | null, signal: NodeJS.Signals | null) => (signal ? `was killed by ${signal}` : `exited with code ${code}`);

/** Starts every child and supervises it; returns a function that stops everything (exit code 0). */
export function supervise(opts: SupervisorOptions): (code?: number) => Promise<void> {
  const log = opts.log ?? ((line: string) => console.log(line));
  const exit = opts.exit ?? ((code: number) => process.exit(code));
  const backoffMs = opts.backoffMs ?? 1000;
  const windowMs = opts.windowMs ?? 600_000;
  const running = new Map<ChildSpec, ChildProcess>();
  const timers = new Set<NodeJS.Timeout>();
  let stopping = false;

  const stop = async (code = 0) => {
    if (stopping) return;
    stopping = true;
    for (const t of timers) clearTimeout(t);
    const children = [...running.values()];
    for (const c of children) if (alive(c)) c.kill('SIGTERM');
    await Promise.all(children.map(exited));
    await opts.cleanup();
    exit(code);
  };

  const launch = (spec: ChildSpec, restarts: number) => {
    const child = spec.start();
    const startedAt = Date.now();
    log(`Started the ${spec.name} (process ${child.pid}).`);
    running.set(spec, child);
    child.once('exit', (code, signal) => {
      if (stopping) return;
      const recent = Date.now() - startedAt < windowMs ? restarts : 0;
      if (spec.restart === false || recent >= opts.maxRestarts) {
        log(`The ${spec.name} ${endedHow(code, signal)}; ${spec.restart === false ? 'stopping everything' : `it was restarted ${recent} time(s) already, so everything stops`}.`);
        void stop(code && code > 0 ? code : 1);
        return;
      }
      const wait = Math.min(30_000, backoffMs * 2 ** recent);
      log(`The ${spec.name} ${endedHow(code, signal)}; starting it again in ${(wait / 1000).toFixed(1)} s (restart ${recent + 1} of ${opts.maxRestarts}).`);
      const timer = setTimeout(() => {
        timers.delete(timer);
        if (!stopping) launch(spec, recent + 1);
      }, wait);
      timers.add(timer);
    });
  };

  for (const spec of opts.children) launch(spec, 0);
  process.on('SIGINT', () => void stop(0));
  process.on('SIGTERM', () => void stop(0));
  return stop;
}
