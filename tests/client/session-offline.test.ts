import 'fake-indexeddb/auto';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import * as authApi from '@/api/auth';
import { ApiError } from '@/api/http';
import { useSessionStore } from '@/stores/session';
import { freshDeviceDb, settleDevice } from './support/device';
import { makeUser, sessionOf } from './support/fixtures';

vi.mock('@/api/auth', () => ({ fetchSession: vi.fn(), signIn: vi.fn(), signOut: vi.fn(), updateProfile: vi.fn(), setPassword: vi.fn(), requestPasswordReset: vi.fn(), fetchTokenInfo: vi.fn() }));
vi.mock('@/api/farms', () => ({ fetchFarms: vi.fn(), createFarm: vi.fn(), updateFarm: vi.fn(), fetchFarm: vi.fn() }));

const api = vi.mocked(authApi);
const unreachable = () => new ApiError(0, 'network', 'Cannot reach the server. Check your connection and try again.');

/** Loads the session in a fresh Pinia, as the app does when it starts. */
async function startApp() {
  setActivePinia(createPinia());
  const session = useSessionStore();
  await session.load().catch(() => undefined);
  await settleDevice();
  return session;
}

beforeEach(async () => {
  vi.clearAllMocks();
  await freshDeviceDb();
});

describe('useSessionStore without a way to the server', () => {
  it('opens signed in as the person the server last answered for, and says it is the device’s copy', async () => {
    api.fetchSession.mockResolvedValueOnce(sessionOf(makeUser('worker'), 'tok-a'));
    await startApp();

    api.fetchSession.mockRejectedValueOnce(unreachable());
    const offline = await startApp();

    expect(offline.user?.name).toBe('Tomas Lind');
    expect(offline.offlineSince).not.toBeNull();
    expect(offline.csrfToken).toBe('');
  });

  it('takes the server’s answer again once it is reachable', async () => {
    api.fetchSession.mockResolvedValueOnce(sessionOf(makeUser('worker'), 'tok-a'));
    await startApp();
    api.fetchSession.mockRejectedValueOnce(unreachable()).mockResolvedValueOnce(sessionOf(makeUser('worker'), 'tok-b'));
    const session = await startApp();

    await session.load(true);

    expect(session.offlineSince).toBeNull();
    expect(session.csrfToken).toBe('tok-b');
  });

  it.each([
    ['a sign-out', async (s: ReturnType<typeof useSessionStore>) => s.signOut()],
    ['a server answer with nobody signed in', async (s: ReturnType<typeof useSessionStore>) => s.load(true)],
  ])('forgets the copy after %s', async (_name, end) => {
    api.fetchSession.mockResolvedValueOnce(sessionOf(makeUser('worker'), 'tok-a'));
    const session = await startApp();
    api.signOut.mockResolvedValue(undefined);
    api.fetchSession.mockResolvedValue(sessionOf(null, 'tok-anon'));
    await end(session);
    await settleDevice();

    api.fetchSession.mockRejectedValueOnce(unreachable());
    const offline = await startApp();
    expect(offline.user).toBeNull();
    expect(offline.loadError).toMatch(/Cannot reach the server/);
  });

  it('does not let anybody in from the copy when the server answers with an error of its own', async () => {
    api.fetchSession.mockResolvedValueOnce(sessionOf(makeUser('worker'), 'tok-a'));
    await startApp();

    api.fetchSession.mockRejectedValueOnce(new ApiError(500, 'internal', 'Something went wrong on the server; it has been logged'));
    const session = await startApp();

    expect(session.user).toBeNull();
  });
});
