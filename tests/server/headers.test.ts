// Response headers that keep personal and farm data out of caches and pin where the page may connect
// (OWASP HTTP Headers Cheat Sheet; RFC 9111 §5.2.2.5 no-store; RFC 6265bis §4.1.3.2 the __Host- prefix).
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { socketOrigin } from '../../server/middleware/security';
import { useTestApp } from '../support/db';
import { call, makeOrganisation, PASSWORD, signedIn } from '../support/fixtures';

const env = useTestApp({ PUBLIC_URL: 'http://127.0.0.1:5180' });

describe('response headers', () => {
  it('marks every API answer no-store, signed in or not, errors included', async () => {
    const org = await makeOrganisation(env);
    const agent = await signedIn(env, org.users.manager.email);
    for (const url of ['/api/auth/me', `/api/tanks?farmId=${org.farmIds[0]}`, '/api/board', '/api/no-such-route']) {
      const res = await call(agent, 'get', url);
      expect(res.headers['cache-control'], url).toBe('no-store');
    }
    expect((await request(env.app).get('/api/auth/session')).headers['cache-control']).toBe('no-store');
  });

  it("limits the page's connections to its own origin and that origin's WebSocket form", async () => {
    const res = await request(env.app).get('/api/health');
    const csp = String(res.headers['content-security-policy']);
    const connect = /connect-src ([^;]+)/.exec(csp)![1]!.trim().split(/\s+/);
    expect(connect).toEqual(["'self'", 'ws://127.0.0.1:5180']);
  });

  it.each([
    ['http://127.0.0.1:5180', 'ws://127.0.0.1:5180'],
    ['https://farm.example.org', 'wss://farm.example.org'],
    ['https://farm.example.org:8443/', 'wss://farm.example.org:8443'],
  ])('gives %s the socket origin %s', (url, ws) => {
    expect(socketOrigin(url)).toBe(ws);
  });

  it('names the session cookie __Host-… with Secure and Path=/ when COOKIE_SECURE=true', async () => {
    const org = await makeOrganisation(env);
    const secure = loadConfig({ NODE_ENV: 'test', COOKIE_SECURE: 'true' }).session;
    const app = createApp({ ...env.ctx, config: { ...env.config, session: { ...env.config.session, secureCookie: secure.secureCookie, cookieName: secure.cookieName } } });
    // Over plain HTTP a cookie jar never sends Secure cookies back: carry them by hand, as a browser would over HTTPS.
    const session = await request(app).get('/api/auth/session').set('X-Forwarded-Proto', 'https');
    const cookies = ([] as string[]).concat(session.headers['set-cookie'] ?? []).map((c) => c.split(';')[0]);
    const res = await request(app)
      .post('/api/auth/sign-in')
      .set('X-Forwarded-Proto', 'https')
      .set('Cookie', cookies.join('; '))
      .set('x-csrf-token', session.body.csrfToken)
      .send({ email: org.users.worker.email, password: PASSWORD });
    expect(res.status).toBe(200);
    const cookie = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.startsWith('__Host-brimstock.sid='));
    expect(cookie).toBeDefined();
    expect(cookie).toMatch(/; Secure/i);
    expect(cookie).toMatch(/; Path=\//i);
    expect(cookie).not.toMatch(/Domain=/i);
  });
});
