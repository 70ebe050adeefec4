// Runs a private Redis for several server processes: Debian's redis-server with its own data
// folder, bound to 127.0.0.1 and a port of ours, started and stopped by us (no system service).
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { createClient } from 'redis';

export interface RedisServer {
  port: number;
  url: string;
  /** Stops the server (SHUTDOWN NOSAVE: what it holds is only for the running processes) and waits until it has gone. */
  stop(): Promise<void>;
}

const binary = () => ['/usr/bin/redis-server', '/usr/sbin/redis-server'].find((p) => existsSync(p)) ?? 'redis-server';

async function ping(url: string): Promise<boolean> {
  const client = createClient({ url, socket: { connectTimeout: 500, reconnectStrategy: false } });
  client.on('error', () => undefined);
  try {
    await client.connect();
    await client.ping();
    return true;
  } catch {
    return false;
  } finally {
    if (client.isOpen) client.destroy();
  }
}

/**
 * Starts redis-server with its files in `baseDir/redis` on 127.0.0.1:`port`. A server already
 * answering there (left by an earlier run) is reused.
 */
export async function startRedis(opts: { baseDir: string; port: number }): Promise<RedisServer> {
  const dir = join(resolve(opts.baseDir), 'redis');
  mkdirSync(dir, { recursive: true });
  const url = `redis://127.0.0.1:${opts.port}`;
  const logFile = join(dir, 'redis.log');
  let child: ChildProcess | undefined;
  if (!(await ping(url))) {
    // Nothing is written to disk: the bus, the job claims and the sign-in counts are for the running processes only.
    const args = ['--bind', '127.0.0.1', '--port', String(opts.port), '--dir', dir, '--logfile', logFile, '--pidfile', join(dir, 'redis.pid'), '--daemonize', 'no', '--save', '', '--appendonly', 'no', '--protected-mode', 'yes'];
    child = spawn(binary(), args, { stdio: 'ignore' });
    const started = Date.now();
    while (!(await ping(url))) {
      if (child.exitCode !== null) throw new Error(`redis-server exited while starting; see ${logFile}`);
      if (Date.now() - started > 15_000) throw new Error(`redis-server did not start in 15 s; see ${logFile}`);
      await new Promise((r) => setTimeout(r, 50));
    }
  }
  return {
    port: opts.port,
    url,
    async stop() {
      const client = createClient({ url, socket: { connectTimeout: 1_000, reconnectStrategy: false } });
      client.on('error', () => undefined);
      try {
        await client.connect();
        await client.sendCommand(['SHUTDOWN', 'NOSAVE']).catch(() => undefined);
      } catch {
        child?.kill('SIGTERM');
      } finally {
        if (client.isOpen) client.destroy();
      }
      if (child && child.exitCode === null && child.signalCode === null) await new Promise((r) => child!.once('exit', r));
    },
  };
}
