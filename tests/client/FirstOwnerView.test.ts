import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import { fieldErrors, firstOwnerSchema } from '@shared/schemas';
import { passwordStrength } from '@shared/passwords';
import * as authApi from '@/api/auth';
import * as setupApi from '@/api/setup';
import { ApiError } from '@/api/http';
import { useSessionStore } from '@/stores/session';
import FirstOwnerView from '@/views/FirstOwnerView.vue';
import { makeUser, sessionOf } from './support/fixtures';
import { mountWithApp } from './support/mountApp';

vi.mock('@/api/auth', () => ({
  fetchSession: vi.fn(),
  signIn: vi.fn(),
  signOut: vi.fn(),
  updateProfile: vi.fn(),
  setPassword: vi.fn(),
  requestPasswordReset: vi.fn(),
  fetchTokenInfo: vi.fn(),
}));
vi.mock('@/api/setup', () => ({ fetchSetupState: vi.fn(), createFirstOwner: vi.fn() }));

const auth = vi.mocked(authApi);
const setup = vi.mocked(setupApi);
const TOKEN = 'Zq7sdyW1Hx0nXcMXL3hM3Ykz1lWQmYtb0UoA2Yd3Jf4';
const PATH = `/first-owner?token=${TOKEN}`;
const STRONG = 'kettle heron basalt plum';
let pinia: Pinia;

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  auth.fetchSession.mockResolvedValue(sessionOf(null));
  setup.fetchSetupState.mockResolvedValue({ firstOwnerNeeded: true });
});

type Wrapper = Awaited<ReturnType<typeof mountWithApp>>['wrapper'];
async function fillIn(wrapper: Wrapper, values: { organisationName?: string; name?: string; email?: string; password?: string }) {
  if (values.organisationName !== undefined) await wrapper.get('[data-testid="firstowner-organisation"]').setValue(values.organisationName);
  if (values.name !== undefined) await wrapper.get('[data-testid="firstowner-name"]').setValue(values.name);
  if (values.email !== undefined) await wrapper.get('[data-testid="firstowner-email"]').setValue(values.email);
  if (values.password !== undefined) await wrapper.get('[data-testid="firstowner-password"]').setValue(values.password);
}
const filled = { organisationName: 'Tarn Ridge Growers', name: 'Morwenna Lisle', email: 'Morwenna@TarnRidge.test', password: STRONG };

describe('FirstOwnerView', () => {
  it('shows a loading state while it asks the server, then the form', async () => {
    let answer!: (value: { firstOwnerNeeded: boolean }) => void;
    setup.fetchSetupState.mockReturnValue(new Promise((resolve) => (answer = resolve)));
    const { wrapper } = await mountWithApp(FirstOwnerView, { pinia, path: PATH });
    expect(wrapper.find('[aria-busy="true"]').exists()).toBe(true);
    expect(wrapper.find('[data-testid="firstowner-form"]').exists()).toBe(false);
    answer({ firstOwnerNeeded: true });
    await flushPromises();
    expect(wrapper.find('[aria-busy="true"]').exists()).toBe(false);
    expect(wrapper.find('[data-testid="firstowner-form"]').exists()).toBe(true);
  });

  it('says where the link comes from when the page is opened without its token', async () => {
    const { wrapper } = await mountWithApp(FirstOwnerView, { pinia, path: '/first-owner' });
    expect(wrapper.get('[data-testid="firstowner-missing"]').text()).toContain("prints in its console");
    expect(setup.fetchSetupState).not.toHaveBeenCalled();
  });

  it('says the link no longer works once the server has an organisation', async () => {
    setup.fetchSetupState.mockResolvedValue({ firstOwnerNeeded: false });
    const { wrapper } = await mountWithApp(FirstOwnerView, { pinia, path: PATH });
    expect(wrapper.get('[data-testid="firstowner-done"]').text()).toContain('already has an organisation');
    expect(wrapper.get('[data-testid="firstowner-done"] a').attributes('href')).toBe('/sign-in');
    expect(wrapper.find('[data-testid="firstowner-form"]').exists()).toBe(false);
  });

  it('shows a load error with a retry that tries again', async () => {
    setup.fetchSetupState.mockRejectedValueOnce(new ApiError(0, 'network', 'Cannot reach the server. Check your connection and try again.'));
    const { wrapper } = await mountWithApp(FirstOwnerView, { pinia, path: PATH });
    expect(wrapper.get('[data-testid="load-error"]').text()).toContain('Cannot reach the server');
    await wrapper.get('[data-testid="load-retry"]').trigger('click');
    await flushPromises();
    expect(setup.fetchSetupState).toHaveBeenCalledTimes(2);
    expect(wrapper.find('[data-testid="firstowner-form"]').exists()).toBe(true);
  });

  it('shows the shared schema messages under each field of an empty form and sends nothing', async () => {
    const { wrapper } = await mountWithApp(FirstOwnerView, { pinia, path: PATH });
    await wrapper.get('form').trigger('submit');
    await flushPromises();
    const result = firstOwnerSchema.safeParse({ token: TOKEN, organisationName: '', name: '', email: '', password: '' });
    if (result.success) throw new Error('expected the empty form to be invalid');
    const expected = fieldErrors(result.error);
    for (const [field, id] of [['organisationName', 'organisation'], ['name', 'name'], ['email', 'email'], ['password', 'password']] as const) {
      expect(wrapper.get(`[data-testid="firstowner-${id}-error"]`).text()).toBe(expected[field]);
    }
    expect(setup.createFirstOwner).not.toHaveBeenCalled();
  });

  it('says while typing whether the password is hard enough, with the rule the server uses', async () => {
    const { wrapper } = await mountWithApp(FirstOwnerView, { pinia, path: PATH });
    const shown = () => wrapper.get('[data-testid="firstowner-strength"]').text();
    await fillIn(wrapper, { organisationName: 'Tarn Ridge Growers', password: 'qwertyuiop' });
    await vi.waitFor(() => expect(shown()).toMatch(/^Too easy to guess\./));
    await fillIn(wrapper, { password: STRONG });
    await vi.waitFor(() => expect(shown()).toBe('Hard enough to guess.'));
  });

  it('refuses a password built from the organisation name, as the server does, and does not send it', async () => {
    const { wrapper } = await mountWithApp(FirstOwnerView, { pinia, path: PATH });
    await fillIn(wrapper, { ...filled, password: 'tarnridge2024' });
    await wrapper.get('form').trigger('submit');
    const verdict = passwordStrength('tarnridge2024', ['morwenna@tarnridge.test', 'Morwenna Lisle', 'Tarn Ridge Growers']);
    expect(verdict.acceptable).toBe(false);
    await vi.waitFor(() => expect(wrapper.get('[data-testid="firstowner-password-error"]').text()).toBe(verdict.message));
    expect(setup.createFirstOwner).not.toHaveBeenCalled();
  });

  it('makes the owner, signs them in and goes home', async () => {
    const owner = makeUser('owner', { email: 'morwenna@tarnridge.test', name: 'Morwenna Lisle', organisationName: 'Tarn Ridge Growers' });
    setup.createFirstOwner.mockResolvedValue({ user: owner, csrfToken: 'token-owner-0001' });
    const { wrapper, router } = await mountWithApp(FirstOwnerView, { pinia, path: PATH });
    await fillIn(wrapper, filled);
    await wrapper.get('form').trigger('submit');
    await vi.waitFor(() => expect(router.currentRoute.value.path).toBe('/'));
    expect(setup.createFirstOwner).toHaveBeenCalledWith({ token: TOKEN, organisationName: 'Tarn Ridge Growers', name: 'Morwenna Lisle', email: 'morwenna@tarnridge.test', password: STRONG });
    const session = useSessionStore();
    expect(session.user).toEqual(owner);
    expect(session.csrfToken).toBe('token-owner-0001');
  });

  it.each([
    ['a replaced or unknown link', new ApiError(404, 'token_invalid', 'This set-up link is unknown or no longer works'), 'firstowner-invalid', 'unknown or no longer works'],
    ['a link used a moment ago by someone else', new ApiError(409, 'setup_closed', 'This server already has an organisation'), 'firstowner-done', 'already has an organisation'],
  ])('shows the used-link state for %s', async (_case, error, testId, text) => {
    setup.createFirstOwner.mockRejectedValue(error);
    const { wrapper, router } = await mountWithApp(FirstOwnerView, { pinia, path: PATH });
    await fillIn(wrapper, filled);
    await wrapper.get('form').trigger('submit');
    await vi.waitFor(() => expect(wrapper.find(`[data-testid="${testId}"]`).exists()).toBe(true));
    expect(wrapper.get(`[data-testid="${testId}"]`).text()).toContain(text);
    expect(wrapper.find('[data-testid="firstowner-form"]').exists()).toBe(false);
    expect(router.currentRoute.value.path).toBe('/first-owner');
  });

  it('shows a server refusal that names a field under that field', async () => {
    setup.createFirstOwner.mockRejectedValue(new ApiError(400, 'invalid_input', 'Enter a valid e-mail address', 'email'));
    const { wrapper } = await mountWithApp(FirstOwnerView, { pinia, path: PATH });
    await fillIn(wrapper, filled);
    await wrapper.get('form').trigger('submit');
    await vi.waitFor(() => expect(wrapper.get('[data-testid="firstowner-email-error"]').text()).toBe('Enter a valid e-mail address'));
    expect(wrapper.find('[data-testid="firstowner-form"]').exists()).toBe(true);
  });
});
