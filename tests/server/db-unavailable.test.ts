// A database connection reset in the middle of a query is the database being away, not a bug:
// 503 with Retry-After, and the next request after it is back answers normally.
import { createConnection, createServer, type Server, type Socket } from 'node:net';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { isDatabaseUnavailable } from '../../server/db-errors';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, signedIn } from '../support/fixtures';

/** A TCP relay to the test MariaDB that can be told to reset every connection on its next packet. */
function relay(targetPort: number) {
  const pairs = new Set<[Socket, Socket]>();
  const state = { resetting: false };
  const server: Server = createServer((client) => {
    const upstream = createConnection({ port: targetPort, host: '127.0.0.1' });
    const pair: [Socket, Socket] = [client, upstream];
    pairs.add(pair);
    const drop = () => {
      pairs.delete(pair);
      client.destroy();
      upstream.destroy();
    };
    client.on('data', (chunk) => {
      if (state.resetting) {
        // A TCP RST both ways, as when a firewall or a crashing host cuts the line mid-query.
        pairs.delete(pair);
        client.resetAndDestroy();
        upstream.resetAndDestroy();
        return;
      }
      upstream.write(chunk);
    });
    upstream.on('data', (chunk) => client.write(chunk));
    client.on('error', drop);
    upstream.on('error', drop);
    client.on('close', drop);
    upstream.on('close', drop);
  });
  return {
    state,
    listen: () => new Promise<number>((r) => server.listen(0, '127.0.0.1', () => r((server.address() as { port: number }).port))),
    close: () => new Promise<void>((r) => (pairs.forEach(([a, b]) => (a.destroy(), b.destroy())), server.close(() => r()))),
  };
}

const overrides: Record<string, string> = {};
let db: ReturnType<typeof relay>;
beforeAll(async () => {
  db = relay(inject('database').port);
  overrides.DB_PORT = String(await db.listen());
});
afterAll(() => db.close());
const env = useTestApp(overrides);

describe('database unavailable', () => {
  it('answers 503 with Retry-After when the connection is reset mid-query, then 200 once it is back', async () => {
    const org = await makeOrganisation(env);
    const agent = await signedIn(env, org.users.manager.email);
    await call(agent, 'get', `/api/tanks?farmId=${org.farmIds[0]}`).expect(200);

    db.state.resetting = true;
    const res = await call(agent, 'get', `/api/tanks?farmId=${org.farmIds[0]}`);
    expect(res.status).toBe(503);
    expect(res.headers['retry-after']).toBe('5');
    expect(res.body).toEqual({ error: { code: 'database_down', message: expect.stringMatching(/not reachable/) } });
    expect(JSON.stringify(res.body)).not.toMatch(/at |ECONNRESET|stack/);

    db.state.resetting = false;
    await call(agent, 'get', `/api/tanks?farmId=${org.farmIds[0]}`).expect(200);
  });

  // Shapes the mariadb connector and Sequelize give these failures (mariadb connector docs, "Error handling": fatal marks a lost connection).
  it.each([
    ['a Sequelize connection error', { name: 'SequelizeConnectionError' }, true],
    ['a query error wrapping a socket reset', { name: 'SequelizeDatabaseError', parent: { code: 'ECONNRESET' } }, true],
    ['a fatal connector error', { name: 'SequelizeDatabaseError', original: { code: 'ER_SOCKET_UNEXPECTED_CLOSE', fatal: true } }, true],
    ['a server shutting down', { name: 'SequelizeDatabaseError', parent: { code: 'ER_SERVER_SHUTDOWN', fatal: false } }, true],
    ['a duplicate key', { name: 'SequelizeUniqueConstraintError', parent: { code: 'ER_DUP_ENTRY', fatal: false } }, false],
    ['a syntax error', { name: 'SequelizeDatabaseError', parent: { code: 'ER_PARSE_ERROR', fatal: false } }, false],
    ['a plain bug', new TypeError('x is undefined'), false],
  ])('%s counts as unavailable: %s', (_what, err, expected) => {
    expect(isDatabaseUnavailable(err)).toBe(expected);
  });
});
