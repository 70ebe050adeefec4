import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { enableAutoUnmount, flushPromises, mount } from '@vue/test-utils';
import { createMemoryHistory } from 'vue-router';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import PrimeVue from 'primevue/config';
import ToastService from 'primevue/toastservice';
import ConfirmationService from 'primevue/confirmationservice';
import type { SessionState } from '@shared/schemas';
import * as authApi from '@/api/auth';
import * as farmsApi from '@/api/farms';
import App from '@/App.vue';
import { createAppRouter } from '@/router';
import { makeFarm, makeUser, sessionOf } from './support/fixtures';

vi.mock('@/api/auth', () => ({ fetchSession: vi.fn(), signIn: vi.fn(), signOut: vi.fn(), updateProfile: vi.fn(), setPassword: vi.fn(), requestPasswordReset: vi.fn(), fetchTokenInfo: vi.fn() }));
vi.mock('@/api/setup', () => ({ fetchSetupState: vi.fn(async () => ({ firstOwnerNeeded: false })), createFirstOwner: vi.fn() }));
vi.mock('@/api/farms', () => ({ fetchFarms: vi.fn(), fetchFarm: vi.fn(), createFarm: vi.fn(), updateFarm: vi.fn() }));

enableAutoUnmount(afterEach);
let pinia: Pinia;

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  vi.mocked(farmsApi).fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site')]);
});

/** Mounts the whole app at `path` while the session request is still on its way. */
function mountStarting(path: string) {
  let answer: (state: SessionState) => void = () => undefined;
  vi.mocked(authApi).fetchSession.mockReturnValue(new Promise((resolve) => (answer = resolve)));
  // Installing the router starts the first navigation, to where the history stands.
  const history = createMemoryHistory();
  history.replace(path);
  const router = createAppRouter(history);
  const wrapper = mount(App, { attachTo: document.body, global: { plugins: [pinia, router, [PrimeVue, { unstyled: true }], ToastService, ConfirmationService] } });
  return { wrapper, router, answer: (state: SessionState) => answer(state) };
}

describe('App', () => {
  it('says it is opening, not a blank page, while the session loads, then shows the screen', async () => {
    const { wrapper, answer } = mountStarting('/farms');
    await flushPromises();

    expect(wrapper.get('[data-testid="app-loading"]').attributes('role')).toBe('status');
    expect(wrapper.get('[data-testid="app-loading"]').text()).toContain('Opening Brimstock');
    expect(wrapper.find('.navbar').exists()).toBe(false);

    answer(sessionOf(makeUser('manager')));
    // The view is loaded lazily; its first import under the test runner can take a few seconds on a busy machine.
    await vi.waitFor(() => expect(wrapper.find('[data-testid="app-loading"]').exists()).toBe(false), { timeout: 8000 });
    await flushPromises();
    expect(wrapper.find('.navbar').exists()).toBe(true);
    expect(wrapper.find('main').text()).toContain('Creek site');
  });

  it('goes from the loading state to sign-in when nobody is signed in', async () => {
    const { wrapper, router, answer } = mountStarting('/');
    await flushPromises();
    expect(wrapper.find('[data-testid="app-loading"]').exists()).toBe(true);

    answer(sessionOf(null));
    await vi.waitFor(() => expect(router.currentRoute.value.name).toBe('sign-in'));
    await flushPromises();
    expect(wrapper.find('[data-testid="app-loading"]').exists()).toBe(false);
    expect(wrapper.find('[data-testid="signin-email"]').exists()).toBe(true);
  });
});
