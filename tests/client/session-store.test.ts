import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import * as authApi from '@/api/auth';
import { http } from '@/api/http';
import { useSessionStore } from '@/stores/session';
import { useFarmsStore } from '@/stores/farms';
import { jsonResponse, makeFarm, makeUser, sessionOf } from './support/fixtures';

vi.mock('@/api/auth', () => ({
  fetchSession: vi.fn(),
  signIn: vi.fn(),
  signOut: vi.fn(),
  updateProfile: vi.fn(),
  setPassword: vi.fn(),
  requestPasswordReset: vi.fn(),
  fetchTokenInfo: vi.fn(),
}));
vi.mock('@/api/farms', () => ({ fetchFarms: vi.fn(), createFarm: vi.fn(), updateFarm: vi.fn(), fetchFarm: vi.fn() }));

const api = vi.mocked(authApi);

beforeEach(() => {
  vi.clearAllMocks();
  setActivePinia(createPinia());
});

describe('useSessionStore', () => {
  it('loads the session once when asked several times at once', async () => {
    api.fetchSession.mockResolvedValue(sessionOf(makeUser('worker'), 'tok-a'));
    const session = useSessionStore();

    await Promise.all([session.load(), session.load(), session.load()]);
    await session.load();

    expect(api.fetchSession).toHaveBeenCalledTimes(1);
    expect(session.user?.role).toBe('worker');
    expect(session.csrfToken).toBe('tok-a');
    expect(session.loaded).toBe(true);
  });

  it('fetches again when forced', async () => {
    api.fetchSession.mockResolvedValueOnce(sessionOf(null, 'tok-a')).mockResolvedValueOnce(sessionOf(null, 'tok-b'));
    const session = useSessionStore();

    await session.load();
    await session.load(true);

    expect(api.fetchSession).toHaveBeenCalledTimes(2);
    expect(session.csrfToken).toBe('tok-b');
  });

  it('keeps the error message and stays not loaded when the server cannot be reached', async () => {
    api.fetchSession.mockRejectedValueOnce(new Error('Cannot reach the server.'));
    const session = useSessionStore();

    await expect(session.load()).rejects.toThrow('Cannot reach the server.');
    expect(session.loaded).toBe(false);
    expect(session.loadError).toBe('Cannot reach the server.');
  });

  it('stores the user and the new CSRF token after sign-in', async () => {
    api.fetchSession.mockResolvedValue(sessionOf(null, 'tok-anon'));
    const owner = makeUser('owner');
    api.signIn.mockResolvedValue({ user: owner, csrfToken: 'tok-signed-in' });
    const session = useSessionStore();
    await session.load();

    await session.signIn({ email: owner.email, password: 'correct horse' });

    expect(api.signIn).toHaveBeenCalledWith({ email: owner.email, password: 'correct horse' });
    expect(session.user).toEqual(owner);
    expect(session.csrfToken).toBe('tok-signed-in');
    expect(session.hasRole('owner')).toBe(true);
    expect(session.hasRole('worker', 'buyer')).toBe(false);
  });

  it('fetches a token first when signing in before the session was loaded', async () => {
    api.fetchSession.mockResolvedValue(sessionOf(null, 'tok-anon'));
    api.signIn.mockResolvedValue({ user: makeUser('buyer'), csrfToken: 'tok-2' });
    const session = useSessionStore();

    await session.signIn({ email: 'buyer@hollowbrook.test', password: 'x' });

    expect(api.fetchSession).toHaveBeenCalledTimes(1);
    expect(api.fetchSession.mock.invocationCallOrder[0]).toBeLessThan(api.signIn.mock.invocationCallOrder[0]!);
  });

  it('clears the user and fetches a fresh anonymous token on sign-out', async () => {
    api.fetchSession.mockResolvedValueOnce(sessionOf(makeUser('manager'), 'tok-in')).mockResolvedValueOnce(sessionOf(null, 'tok-out'));
    api.signOut.mockResolvedValue(undefined);
    const session = useSessionStore();
    await session.load();

    await session.signOut();

    expect(session.user).toBeNull();
    expect(session.csrfToken).toBe('tok-out');
  });

  it('forgets cached farms when another person signs in on the same device', async () => {
    api.fetchSession.mockResolvedValue(sessionOf(makeUser('manager'), 't1'));
    const session = useSessionStore();
    await session.load();
    const farms = useFarmsStore();
    farms.farms = [makeFarm(11, 'Creek site')];
    farms.status = 'ready';

    api.signIn.mockResolvedValue({ user: makeUser('worker'), csrfToken: 't2' });
    await session.signIn({ email: 'worker@hollowbrook.test', password: 'x' });

    expect(farms.farms).toEqual([]);
    expect(farms.status).toBe('idle');
  });

  it('replaces the user with what the server returns after a profile update', async () => {
    api.fetchSession.mockResolvedValue(sessionOf(makeUser('worker'), 't'));
    const updated = makeUser('worker', { unitSystem: 'us', name: 'Tomas L.' });
    api.updateProfile.mockResolvedValue(updated);
    const session = useSessionStore();
    await session.load();

    await session.updateProfile({ unitSystem: 'us', name: 'Tomas L.' });

    expect(session.user).toEqual(updated);
  });

  it('is the CSRF source for the http wrapper and refreshes it on csrf_invalid', async () => {
    api.fetchSession.mockResolvedValueOnce(sessionOf(makeUser('owner'), 'tok-old')).mockResolvedValueOnce(sessionOf(makeUser('owner'), 'tok-new'));
    const session = useSessionStore();
    await session.load();
    const fetchMock = vi.fn<typeof fetch>()
      .mockResolvedValueOnce(jsonResponse(403, { error: { code: 'csrf_invalid', message: 'Invalid CSRF token' } }))
      .mockResolvedValueOnce(jsonResponse(200, { id: 5 }));
    vi.stubGlobal('fetch', fetchMock);

    await http.post('/api/farms', { name: 'Ridge' });

    const tokens = fetchMock.mock.calls.map((c) => (c[1]!.headers as Record<string, string>)['X-CSRF-Token']);
    expect(tokens).toEqual(['tok-old', 'tok-new']);
    expect(session.csrfToken).toBe('tok-new');
    vi.unstubAllGlobals();
  });
});
