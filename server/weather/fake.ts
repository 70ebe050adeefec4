// Development and test stand-in for the hourly forecast service: a node:http server on 127.0.0.1
// that answers GET /v1/forecast like the real one, from a scenario file in samples/weather moved to
// start at today's midnight (UTC) by the fake's clock (the machine's, or one a test gives it), so the
// demo's frost is always the coming night, before dawn tomorrow: inside the 48 hours the frost check
// looks at whatever the time of day. Started by scripts/tasks.ts and the tests only, like the mail
// receiver; never imported by the server itself.
// PUT /fake/scenario { "name": … } switches what it answers: a file's name, or down (503),
// slow (the default forecast after slowMs), garbage (200 with text that is no forecast); GET /fake/requests lists what was asked.
import { createServer } from 'node:http';
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';

/** What the fake answers besides a scenario file. */
export const FAKE_FAULTS = ['down', 'slow', 'garbage'] as const;
/** The scenario the fake starts with: the demo farm's frost before dawn tomorrow. */
export const DEFAULT_WEATHER_SCENARIO = 'frost-tomorrow';

const samplesDir = resolve(import.meta.dirname, '../../samples/weather');

/** A scenario file's hours moved by whole days so that its first hour is today's midnight, UTC (`nowMs` says when today is). */
export function shiftedScenario(name: string, nowMs: number): Record<string, unknown> {
  const doc = JSON.parse(readFileSync(join(samplesDir, `${name}.json`), 'utf8')) as { hourly: { time: string[] }; [k: string]: unknown };
  const first = Date.parse(`${doc.hourly.time[0]}Z`);
  const today = Math.floor(nowMs / 86_400_000) * 86_400_000;
  const shift = today - Math.floor(first / 86_400_000) * 86_400_000;
  const time = doc.hourly.time.map((t) => new Date(Date.parse(`${t}Z`) + shift).toISOString().slice(0, 16));
  const { about: _about, ...answer } = doc;
  return { ...answer, hourly: { ...doc.hourly, time } };
}

/** Starts the fake forecast service (`clock` in epoch ms, default the machine's); resolves once it listens (port 0 picks a free one). */
export async function startFakeWeather(opts: { port: number; scenario?: string; slowMs?: number; clock?: () => number }): Promise<{ port: number; url: string; close(): Promise<void> }> {
  let scenario = opts.scenario ?? DEFAULT_WEATHER_SCENARIO;
  const requests: { at: string; latitude: string | null; longitude: string | null; scenario: string }[] = [];
  const timers = new Set<NodeJS.Timeout>();
  const known = (name: string) => (FAKE_FAULTS as readonly string[]).includes(name) || (/^[a-z0-9-]+$/.test(name) && existsSync(join(samplesDir, `${name}.json`)));
  const server = createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://fake');
    const send = (status: number, body: unknown, type = 'application/json') => {
      if (res.destroyed) return;
      res.writeHead(status, { 'content-type': type });
      res.end(typeof body === 'string' ? body : JSON.stringify(body));
    };
    if (url.pathname === '/fake/scenario' && req.method === 'PUT') {
      let text = '';
      req.on('data', (c: Buffer) => (text += c.toString('utf8')));
      req.on('end', () => {
        const name = (() => {
          try {
            return String((JSON.parse(text) as { name?: unknown }).name ?? '');
          } catch {
            return '';
          }
        })();
        if (!known(name)) return send(400, { error: `unknown scenario "${name}": a file in samples/weather or one of ${FAKE_FAULTS.join(', ')}` });
        scenario = name;
        send(200, { scenario });
      });
      return;
    }
    if (url.pathname === '/fake/requests' && req.method === 'GET') return send(200, { scenario, requests });
    if (url.pathname !== '/v1/forecast' || req.method !== 'GET') return send(404, { error: true, reason: 'Not found' });
    const latitude = url.searchParams.get('latitude');
    const longitude = url.searchParams.get('longitude');
    // One reading of the clock per request: the hours it answers and the time it logs agree.
    const nowMs = (opts.clock ?? Date.now)();
    requests.push({ at: new Date(nowMs).toISOString(), latitude, longitude, scenario });
    const lat = Number(latitude);
    const lon = Number(longitude);
    if (latitude === null || longitude === null || !Number.isFinite(lat) || !Number.isFinite(lon) || Math.abs(lat) > 90 || Math.abs(lon) > 180) {
      return send(400, { error: true, reason: 'latitude and longitude must be numbers within range' });
    }
    if (scenario === 'down') return send(503, '<html><body>Service unavailable</body></html>', 'text/html');
    if (scenario === 'garbage') return send(200, { hourly: { time: ['yesterday-ish'], temperature_2m: ['cold'] } });
    // Slow answers the default forecast, too late for a client that keeps to its time limit.
    const file = scenario === 'slow' ? DEFAULT_WEATHER_SCENARIO : scenario;
    const answer = () => send(200, { ...shiftedScenario(file, nowMs), latitude: lat, longitude: lon });
    if (scenario === 'slow') {
      const timer = setTimeout(() => {
        timers.delete(timer);
        answer();
      }, opts.slowMs ?? 60_000);
      timers.add(timer);
      return;
    }
    answer();
  });
  await new Promise<void>((resolveListen, reject) => {
    server.once('error', reject);
    server.listen(opts.port, '127.0.0.1', () => resolveListen());
  });
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : opts.port;
  return {
    port,
    url: `http://127.0.0.1:${port}`,
    close: () =>
      new Promise<void>((r) => {
        for (const t of timers) clearTimeout(t);
        server.closeAllConnections();
        server.close(() => r());
      }),
  };
}
