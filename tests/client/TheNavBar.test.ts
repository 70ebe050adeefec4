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

/** The nav test ids a person can reach: the bar's own links, then each menu's links once it is opened. */
async function reachable(wrapper: Awaited<ReturnType<typeof mountAs>>['wrapper']): Promise<string[]> {
  const ids = wrapper.findAll('.navbar [data-testid^="nav-"]').map((el) => el.attributes('data-testid')!);
  for (const group of wrapper.findAll('[data-testid^="nav-group-"]')) {
    await group.trigger('click');
    await flushPromises();
    const menu = document.getElementById(group.attributes('aria-controls')!)!;
    ids.push(...[...menu.querySelectorAll('[data-testid^="nav-"]')].map((el) => el.getAttribute('data-testid')!));
    await group.trigger('click');
    await flushPromises();
  }
  return ids.filter((id) => id !== 'nav-sign-out' && !id.startsWith('nav-group-') && id !== 'nav-menu');
}

describe('TheNavBar', () => {
  it.each([
    ['owner', ['home', 'round', 'imports', 'brews', 'flags', 'profile', 'inputs', 'orders', 'suppliers', 'farms', 'people', 'outbox']],
    ['manager', ['home', 'round', 'imports', 'brews', 'flags', 'profile', 'inputs', 'orders', 'suppliers', 'farms', 'outbox']],
    ['worker', ['home', 'round', 'imports', 'brews', 'flags', 'inputs', 'farms', 'profile']],
    ['buyer', ['home', 'flags', 'profile', 'inputs', 'orders', 'suppliers', 'farms', 'outbox']],
  ] as const)('lets a %s reach the screens %j from the bar and its menus', async (role, expected) => {
    const { wrapper } = await mountAs(role);

    const shown = await reachable(wrapper);
    expect(shown).toEqual(expected.map((name) => `nav-${name}`));
    // Every screen the role may open is reachable, once.
    expect([...shown].sort()).toEqual([...new Set(navItemsFor(role).map((item) => `nav-${item.name}`))].sort());
  });

  it.each([
    ['owner', ['nav-home', 'nav-round', 'nav-imports', 'nav-brews', 'nav-flags', 'nav-group-buying', 'nav-group-setup']],
    ['manager', ['nav-home', 'nav-round', 'nav-imports', 'nav-brews', 'nav-flags', 'nav-group-buying', 'nav-group-setup']],
    ['worker', ['nav-home', 'nav-round', 'nav-imports', 'nav-brews', 'nav-flags', 'nav-inputs', 'nav-farms']],
    ['buyer', ['nav-home', 'nav-flags', 'nav-group-buying', 'nav-group-setup']],
  ] as const)('puts at most seven entries on a %s’s bar, the buying and set-up screens in menus', async (role, expected) => {
    const { wrapper } = await mountAs(role);

    const bar = wrapper.findAll('.navbar__links > [data-testid]').map((el) => el.attributes('data-testid'));
    expect(bar).toEqual(expected);
    expect(bar.length).toBeLessThanOrEqual(7);
  });

  it('names the groups in our words and marks the menu holding the current page', async () => {
    const { wrapper } = await mountAs('owner');

    expect(wrapper.get('[data-testid="nav-group-buying"]').text()).toBe('Buying');
    expect(wrapper.get('[data-testid="nav-group-setup"]').text()).toBe('Set-up');
    // Mounted at /farms: Set-up holds the current page.
    expect(wrapper.get('[data-testid="nav-group-setup"]').classes()).toContain('navbar__link--current');
    expect(wrapper.get('[data-testid="nav-group-buying"]').classes()).not.toContain('navbar__link--current');
    await wrapper.get('[data-testid="nav-group-setup"]').trigger('click');
    await flushPromises();
    expect(document.querySelector('[data-testid="nav-farms"]')!.getAttribute('aria-current')).toBe('page');
  });

  it('opens a menu with a button that says it has one, and follows the link chosen in it', async () => {
    const { wrapper, router } = await mountAs('buyer');
    const button = wrapper.get('[data-testid="nav-group-buying"]');

    // Keyboard use of the open menu (arrows, Enter, Escape) is checked in Chromium: tests/e2e/navigation.test.ts.
    expect(button.element.tagName).toBe('BUTTON');
    expect(button.attributes('aria-haspopup')).toBe('menu');
    expect(button.attributes('aria-expanded')).toBe('false');
    await button.trigger('click');
    await flushPromises();
    document.querySelector<HTMLAnchorElement>(`#${button.attributes('aria-controls')} [data-testid="nav-orders"]`)!.click();
    await flushPromises();

    // The Orders screen's code loads on first use, which takes a while on a busy machine.
    await vi.waitFor(() => expect(router.currentRoute.value.name).toBe('orders'), { timeout: 8000 });
  });

  it('shows the signed-in name as a link to the profile, kept on one line beside Sign out', async () => {
    const { wrapper } = await mountAs('manager');

    const name = wrapper.get('[data-testid="nav-profile"]');
    expect(name.attributes('href')).toBe('/profile');
    expect(name.text()).toContain('Dana Okafor');
    expect(name.attributes('title')).toContain('Dana Okafor');
    expect(wrapper.get('.navbar__user').element.contains(wrapper.get('[data-testid="nav-sign-out"]').element)).toBe(true);
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

    // The drawer is teleported to <body>; it lists every screen, the menus' under their names.
    expect(document.querySelectorAll('[data-testid="nav-people"]')).toHaveLength(1);
    expect(document.querySelectorAll('[data-testid="nav-sign-out"]')).toHaveLength(1);
    const drawn = [...document.querySelectorAll('.nav-drawer__list [data-testid^="nav-"]')].map((el) => el.getAttribute('data-testid'));
    expect([...drawn].sort()).toEqual([...new Set(navItemsFor('owner').map((item) => `nav-${item.name}`))].sort());
    expect([...document.querySelectorAll('.nav-drawer__heading')].map((el) => el.textContent)).toEqual(['Buying', 'Set-up']);
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
