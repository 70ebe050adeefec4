import { describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';

describe('loadConfig', () => {
  it('works with no settings at all, on loopback', () => {
    const c = loadConfig({});
    expect(c.host).toBe('127.0.0.1');
    expect(c.port).toBe(5180);
    expect(c.devOutbox).toBe(true);
  });

  it('names every bad key when settings are wrong', () => {
    expect(() => loadConfig({ PORT: 'eighty', DB_PORT: '0' })).toThrow(/PORT[\s\S]*DB_PORT/);
  });

  it('refuses production without a session secret and never serves the outbox there', () => {
    expect(() => loadConfig({ NODE_ENV: 'production' })).toThrow(/SESSION_SECRET/);
    const c = loadConfig({ NODE_ENV: 'production', SESSION_SECRET: 'x'.repeat(32), DEV_OUTBOX: 'true' });
    expect(c.devOutbox).toBe(false);
  });

  it('loads the demo in development and test only, unless DEMO says otherwise', () => {
    const secret = { SESSION_SECRET: 'x'.repeat(32) };
    expect(loadConfig({ NODE_ENV: 'production', ...secret }).demo).toBe(false);
    expect(loadConfig({ NODE_ENV: 'production', ...secret, DEMO: 'true' }).demo).toBe(true);
    expect(loadConfig({ NODE_ENV: 'development' }).demo).toBe(true);
    expect(loadConfig({ NODE_ENV: 'test' }).demo).toBe(true);
    expect(loadConfig({ NODE_ENV: 'development', DEMO: 'false' }).demo).toBe(false);
  });
});
