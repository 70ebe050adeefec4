// The load balancer in front of several server processes: Debian's haproxy with a configuration
// we write into the data folder, listening on the app's address and port. A browser stays on one
// process (balance source: by its address), which socket.io's polling transport needs.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';

export interface HaproxyOptions {
  baseDir: string;
  host: string;
  port: number;
  /** The server processes, each on 127.0.0.1. */
  serverPorts: number[];
  /** 'source' (default): one client address to one process, as browsers need; 'roundrobin': request by request (the bench, whose clients share one address and use WebSockets only). */
  balance?: 'source' | 'roundrobin';
}

export interface Haproxy {
  configFile: string;
  child: ChildProcess;
  /** Stops haproxy and waits until it has gone. */
  stop(): Promise<void>;
}

const binary = () => ['/usr/sbin/haproxy', '/usr/bin/haproxy'].find((p) => existsSync(p)) ?? 'haproxy';

/** haproxy.cfg for the processes: health-checked on /api/health, one client address to one process, sockets kept open. */
export function haproxyConfig(opts: Omit<HaproxyOptions, 'baseDir'>): string {
  const servers = opts.serverPorts.map((p, i) => `  server app${i + 1} 127.0.0.1:${p} check inter 2s fall 2 rise 1`);
  return [
    '# Written by npm start (scripts/lib/haproxy.ts) on every start; changes here are lost.',
    'global',
    '  maxconn 4096',
    '',
    'defaults',
    '  mode http',
    '  option forwardfor',
    '  option http-server-close',
    // A process that died is found by the health check within seconds; until then a request that
    // cannot connect to it is tried again on another process rather than answered with a 503.
    '  retries 3',
    '  option redispatch 1',
    '  timeout connect 5s',
    '  timeout client 60s',
    '  timeout server 300s',
    // Live sockets stay open for hours; uploads of big logger files take minutes.
    '  timeout tunnel 12h',
    '  timeout http-request 60s',
    '',
    'frontend app',
    `  bind ${opts.host}:${opts.port}`,
    '  default_backend servers',
    '',
    'backend servers',
    ...(opts.balance === 'roundrobin' ? ['  balance roundrobin'] : ['  balance source', '  hash-type consistent']),
    '  option httpchk GET /api/health',
    '  http-check expect status 200',
    ...servers,
    '',
  ].join('\n');
}

/** Writes `baseDir/haproxy/haproxy.cfg`, checks it with `haproxy -c` and runs haproxy in the foreground. */
export async function startHaproxy(opts: HaproxyOptions): Promise<Haproxy> {
  const dir = join(resolve(opts.baseDir), 'haproxy');
  mkdirSync(dir, { recursive: true });
  const configFile = join(dir, 'haproxy.cfg');
  writeFileSync(configFile, haproxyConfig(opts));
  const check = spawnSync(binary(), ['-c', '-q', '-f', configFile], { encoding: 'utf8' });
  if (check.status !== 0) throw new Error(`haproxy refused ${configFile}:\n${check.stdout}${check.stderr}`);
  const child = spawn(binary(), ['-db', '-f', configFile], { stdio: ['ignore', 'ignore', 'pipe'] });
  let errText = '';
  child.stderr!.on('data', (chunk: Buffer) => {
    errText = (errText + chunk.toString()).slice(-5_000);
  });
  // haproxy binds at once or exits: give it a moment to do either.
  await new Promise((r) => setTimeout(r, 300));
  if (child.exitCode !== null) throw new Error(`haproxy exited while starting:\n${errText}`);
  return {
    configFile,
    child,
    async stop() {
      if (child.exitCode !== null || child.signalCode !== null) return;
      const gone = new Promise((r) => child.once('exit', r));
      child.kill('SIGTERM');
      await gone;
    },
  };
}
