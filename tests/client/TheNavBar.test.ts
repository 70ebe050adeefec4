import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import { ROLES, type Role } from '@shared/schemas';
import * as authApi from '@/api/auth';
import TheNavBar from '@/components/TheNavBar.vue';
import { NAV_ITEMS, navItemsFor } from '@/router/nav';
import { routes } from '@/router';
import { useSessionStore } from '@/stores/session';
import { makeUser, sessionOf } from './support/fixtures';
import { mountWithApp, setViewportWidth } from './support/mountApp';

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
let pinia: Pinia;

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  setViewportWidth(1280);
});

afterEach(() => setViewportWidth(1024));

async function mountAs(role: Role) {
  api.fetchSession.mockResolvedValue(sessionOf(makeUser(role)));
  return mountWithApp(TheNavBar, { pinia, path: '/farms' });
}

describe('TheNavBar', () => {
  it.each([
    ['owner', ['home', 'round', 'imports', 'farms', 'inputs', 'orders', 'suppliers', 'brews', 'flags', 'people', 'outbox', 'profile']],
    ['manager', ['home', 'round', 'imports', 'farms', 'inputs', 'orders', 'suppliers', 'brews', 'flags', 'outbox', 'profile']],
    ['worker', ['home', 'round', 'imports', 'farms', 'inputs', 'brews', 'flags', 'profile']],
    ['buyer', ['home', 'farms', 'inputs', 'orders', 'suppliers', 'flags', 'outbox', 'profile']],
  ] as const)('shows a %s the links %j', async (role, expected) => {
    const { wrapper } = await mountAs(role);

    const shown = wrapper.findAll('[data-testid^="nav-"]').map((el) => el.attributes('data-testid'));
    expect(shown.filter((id) => id !== 'nav-sign-out')).toEqual(expected.map((name) => `nav-${name}`));
    expect(wrapper.find('[data-testid="nav-people"]').exists()).toBe(role === 'owner');
  });

  it('marks the current page for assistive technology', async () => {
    const { wrapper } = await mountAs('worker');

    expect(wrapper.get('[data-testid="nav-farms"]').attributes('aria-current')).toBe('page');
    expect(wrapper.get('[data-testid="nav-home"]').attributes('aria-current')).toBeUndefined();
  });

  it('signs out and goes to the sign-in page', async () => {
    api.signOut.mockResolvedValue(undefined);
    const { wrapper, router } = await mountAs('manager');
    api.fetchSession.mockResolvedValue(sessionOf(null, 'tok-after'));

    await wrapper.get('[data-testid="nav-sign-out"]').trigger('click');
    await flushPromises();

    expect(api.signOut).toHaveBeenCalledTimes(1);
    expect(useSessionStore().user).toBeNull();
    await vi.waitFor(() => expect(router.currentRoute.value.name).toBe('sign-in'));
  });

  it('folds the links into a menu on a 360 px wide phone', async () => {
    setViewportWidth(360);
    const { wrapper } = await mountAs('owner');

    expect(wrapper.find('[data-testid="nav-people"]').exists()).toBe(false);
    await wrapper.get('[data-testid="nav-menu"]').trigger('click');
    await flushPromises();

    // The drawer is teleported to <body>.
    expect(document.querySelectorAll('[data-testid="nav-people"]')).toHaveLength(1);
    expect(document.querySelectorAll('[data-testid="nav-sign-out"]')).toHaveLength(1);
  });
});

describe('navItemsFor', () => {
  it('returns nothing when nobody is signed in', () => {
    expect(navItemsFor(null)).toEqual([]);
  });

  it.each(NAV_ITEMS.map((item) => [item.name, item] as const))('points %s at the route of that name with the same roles', (_name, item) => {
    const route = routes.find((r) => r.name === item.name);
    expect(route?.path).toBe(item.to);
    // Nav and guard must agree, or a link would bounce the person back home.
    const routeRoles = route?.meta?.roles ?? ROLES;
    for (const role of item.roles) expect(routeRoles).toContain(role);
  });
});
