import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { createMemoryHistory } from 'vue-router';
import type { Role } from '@shared/schemas';
import * as authApi from '@/api/auth';
import { setLanguage } from '@/i18n';
import { createAppRouter, safeRedirect, showPageTitle } from '@/router';
import { makeUser, sessionOf } from './support/fixtures';

vi.mock('@/api/auth', () => ({
  fetchSession: vi.fn(),
  signIn: vi.fn(),
  signOut: vi.fn(),
  updateProfile: vi.fn(),
  setPassword: vi.fn(),
  requestPasswordReset: vi.fn(),
  fetchTokenInfo: vi.fn(),
}));

const api = vi.mocked(authApi);

function routerFor(role: Role | null) {
  api.fetchSession.mockResolvedValue(sessionOf(role ? makeUser(role) : null));
  return createAppRouter(createMemoryHistory());
}

beforeEach(() => {
  vi.clearAllMocks();
  setActivePinia(createPinia());
});

describe('router guard', () => {
  it('sends a signed-out visitor to /sign-in and remembers where they were going', async () => {
    const router = routerFor(null);

    await router.push('/farms');

    expect(router.currentRoute.value.name).toBe('sign-in');
    expect(router.currentRoute.value.query.redirect).toBe('/farms');
  });

  it('sends a signed-out visitor of / to /sign-in without a redirect query', async () => {
    const router = routerFor(null);

    await router.push('/');

    expect(router.currentRoute.value.fullPath).toBe('/sign-in');
  });

  it('loads the session only once across navigations', async () => {
    const router = routerFor('manager');

    await router.push('/');
    await router.push('/farms');
    await router.push('/profile');

    expect(api.fetchSession).toHaveBeenCalledTimes(1);
  });

  it('lets a signed-out visitor open the set-password link', async () => {
    const router = routerFor(null);

    await router.push('/set-password?token=abc');

    expect(router.currentRoute.value.name).toBe('set-password');
  });

  it.each([
    ['owner', 'people'],
    ['manager', 'home'],
    ['worker', 'home'],
    ['buyer', 'home'],
  ] as const)('takes a %s who opens /people to %s', async (role, expected) => {
    const router = routerFor(role);

    await router.push('/people');

    expect(router.currentRoute.value.name).toBe(expected);
  });

  it.each(['owner', 'manager', 'worker', 'buyer'] as const)('lets a %s open Farms and Profile', async (role) => {
    const router = routerFor(role);

    await router.push('/farms');
    expect(router.currentRoute.value.name).toBe('farms');
    await router.push('/profile');
    expect(router.currentRoute.value.name).toBe('profile');
  });

  it('sends a signed-in user away from /sign-in to the redirect target', async () => {
    const router = routerFor('worker');

    await router.push('/sign-in?redirect=/profile');

    expect(router.currentRoute.value.name).toBe('profile');
  });

  it('treats an unreachable server as signed out instead of failing the navigation', async () => {
    api.fetchSession.mockRejectedValue(new Error('Cannot reach the server.'));
    const router = createAppRouter(createMemoryHistory());

    await router.push('/farms');

    expect(router.currentRoute.value.name).toBe('sign-in');
  });

  it('shows the not-found page for unknown paths', async () => {
    const router = routerFor('worker');

    await router.push('/no/such/page');

    expect(router.currentRoute.value.name).toBe('not-found');
  });
});

describe('safeRedirect', () => {
  it.each([
    ['/farms', '/farms'],
    ['/people?x=1', '/people?x=1'],
    ['//evil.example/path', '/'],
    ['/\\evil.example', '/'],
    ['https://evil.example', '/'],
    [undefined, '/'],
    [['/a', '/b'], '/'],
  ])('turns %j into %s', (input, expected) => {
    expect(safeRedirect(input)).toBe(expected);
  });
});

describe('page titles', () => {
  it('names the browser tab after the page in the screens’ language', async () => {
    const router = routerFor('worker');

    await router.push('/round');
    expect(document.title).toBe('Round · Brimstock');

    setLanguage('es');
    try {
      showPageTitle(router.currentRoute.value);
      expect(document.title).toBe('Ronda · Brimstock');
      await router.push('/farms');
      expect(document.title).toBe('Fincas · Brimstock');
    } finally {
      setLanguage('en');
    }
  });
});
