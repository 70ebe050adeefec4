// Starts the real server (server/index.ts) as a child process and waits for its ready line. The
// browser tests, the fault tests and the benches all drive the server this way.
import { spawn, type ChildProcess } from 'node:child_process';
import { join, resolve } from 'node:path';

const root = resolve(import.meta.dirname, '../..');

/**
 * True for the server's ready line: the pino record server/index.ts logs with `event: 'ready'` once it
 * listens ("Brimstock is ready: open …"); any other line, JSON or not, is not it.
 */
export function isReadyLine(line: string): boolean {
  if (!line.startsWith('{')) return false;
  try {
    const record = JSON.parse(line) as { event?: unknown; msg?: unknown };
    return record.event === 'ready' && typeof record.msg === 'string' && record.msg.startsWith('Brimstock is ready');
  } catch {
    return false;
  }
}

export interface ServerProcessOptions {
  env: Record<string, string>;
  /** Options for the server's node, before the script (`--cpu-prof`…). */
  nodeArgs?: string[];
  /** Each line the server prints on standard output. */
  onLine?: (line: string) => void;
  /** Keep standard error for `stderr()` instead of passing it through (default: pass through). */
  captureStderr?: boolean;
  /** Open an IPC channel to the server (the board bench asks it for its own timings over it). */
  ipc?: boolean;
  timeoutMs?: number;
}

export interface ServerProcess {
  child: ChildProcess;
  /** The last 20,000 characters of standard error, when captured. */
  stderr(): string;
}

/** The server's process once it has printed its ready line; rejects when it exits or stays silent first. */
export function startServerProcess(opts: ServerProcessOptions): Promise<ServerProcess> {
  const timeoutMs = opts.timeoutMs ?? 60_000;
  const child = spawn(process.execPath, [...(opts.nodeArgs ?? []), '--import', 'tsx', join(root, 'server/index.ts')], {
    cwd: root,
    env: opts.env,
    stdio: ['ignore', 'pipe', opts.captureStderr ? 'pipe' : 'inherit', ...(opts.ipc ? (['ipc'] as const) : [])],
  });
  let errText = '';
  child.stderr?.on('data', (chunk: Buffer) => {
    errText = (errText + chunk.toString()).slice(-20_000);
  });
  const started: ServerProcess = { child, stderr: () => errText };
  return new Promise((ok, fail) => {
    let ready = false;
    let rest = '';
    const timer = setTimeout(() => fail(new Error(`server did not start in ${timeoutMs / 1000} s:\n${errText}`)), timeoutMs);
    child.stdout!.on('data', (chunk: Buffer) => {
      const lines = (rest + chunk.toString()).split('\n');
      rest = lines.pop()!;
      for (const line of lines) {
        opts.onLine?.(line);
        if (!ready && isReadyLine(line)) {
          ready = true;
          clearTimeout(timer);
          ok(started);
        }
      }
    });
    child.once('exit', (code, signal) => {
      clearTimeout(timer);
      if (!ready) fail(new Error(`server exited while starting (${code ?? signal}):\n${errText}`));
    });
  });
}
