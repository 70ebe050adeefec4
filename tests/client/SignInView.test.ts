import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import { fieldErrors, passwordResetSchema, signInSchema } from '@shared/schemas';
import * as authApi from '@/api/auth';
import * as setupApi from '@/api/setup';
import { ApiError } from '@/api/http';
import SignInView from '@/views/SignInView.vue';
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

const api = vi.mocked(authApi);
const setup = vi.mocked(setupApi);
let pinia: Pinia;

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  api.fetchSession.mockResolvedValue(sessionOf(null, 'tok-anon'));
  setup.fetchSetupState.mockResolvedValue({ firstOwnerNeeded: false });
});

function expectedErrors(schema: typeof signInSchema | typeof passwordResetSchema, data: unknown): Record<string, string> {
  const result = schema.safeParse(data);
  if (result.success) throw new Error('expected the data to be invalid');
  return fieldErrors(result.error);
}

describe('SignInView', () => {
  it('shows the shared schema messages under each field when the form is empty', async () => {
    const { wrapper } = await mountWithApp(SignInView, { pinia, path: '/sign-in' });

    await wrapper.get('[data-testid="signin-submit"]').trigger('submit');
    await flushPromises();

    const expected = expectedErrors(signInSchema, { email: '', password: '' });
    expect(wrapper.get('[data-testid="signin-email-error"]').text()).toBe(expected.email);
    expect(wrapper.get('[data-testid="signin-password-error"]').text()).toBe(expected.password);
    expect(wrapper.get('[data-testid="signin-email"]').attributes('aria-describedby')).toBe('signin-email-error');
    expect(api.signIn).not.toHaveBeenCalled();
  });

  it('shows only the e-mail message when the address is malformed and a password is given', async () => {
    const { wrapper } = await mountWithApp(SignInView, { pinia, path: '/sign-in' });

    await wrapper.get('[data-testid="signin-email"]').setValue('tomas-at-hollowbrook');
    await wrapper.get('[data-testid="signin-password"]').setValue('long enough');
    await wrapper.get('form').trigger('submit');
    await flushPromises();

    expect(wrapper.get('[data-testid="signin-email-error"]').text()).toBe(
      expectedErrors(signInSchema, { email: 'tomas-at-hollowbrook', password: 'long enough' }).email,
    );
    expect(wrapper.find('[data-testid="signin-password-error"]').exists()).toBe(false);
  });

  it('shows the server message when the credentials are wrong', async () => {
    api.signIn.mockRejectedValue(new ApiError(401, 'invalid_credentials', 'E-mail or password is wrong'));
    const { wrapper } = await mountWithApp(SignInView, { pinia, path: '/sign-in' });

    await wrapper.get('[data-testid="signin-email"]').setValue('tomas@hollowbrook.test');
    await wrapper.get('[data-testid="signin-password"]').setValue('not the password');
    await wrapper.get('form').trigger('submit');
    await flushPromises();

    expect(wrapper.get('[data-testid="signin-error"]').text()).toContain('E-mail or password is wrong');
  });

  it('signs in with the trimmed, lower-cased address and goes to the redirect target', async () => {
    api.signIn.mockResolvedValue({ user: makeUser('worker'), csrfToken: 'tok-in' });
    const { wrapper, router } = await mountWithApp(SignInView, { pinia, path: '/sign-in?redirect=/profile' });

    await wrapper.get('[data-testid="signin-email"]').setValue('  Tomas@Hollowbrook.TEST ');
    await wrapper.get('[data-testid="signin-password"]').setValue('correct horse');
    await wrapper.get('form').trigger('submit');
    await flushPromises();

    expect(api.signIn).toHaveBeenCalledWith({ email: 'tomas@hollowbrook.test', password: 'correct horse' });
    // The profile view is lazy: its chunk loads before the navigation settles.
    await vi.waitFor(() => expect(router.currentRoute.value.name).toBe('profile'));
  });

  it('posts a password reset and confirms without saying whether the account exists', async () => {
    api.requestPasswordReset.mockResolvedValue(undefined);
    const { wrapper } = await mountWithApp(SignInView, { pinia, path: '/sign-in' });

    await wrapper.get('[data-testid="forgot-open"]').trigger('click');
    await wrapper.get('[data-testid="forgot-submit"]').trigger('submit');
    await flushPromises();
    expect(wrapper.get('[data-testid="forgot-email-error"]').text()).toBe(expectedErrors(passwordResetSchema, { email: '' }).email);

    await wrapper.get('[data-testid="forgot-email"]').setValue('dana@hollowbrook.test');
    await wrapper.get('form').trigger('submit');
    await flushPromises();

    expect(api.requestPasswordReset).toHaveBeenCalledWith('dana@hollowbrook.test');
    expect(wrapper.get('[data-testid="forgot-sent"]').text()).toContain('If an account exists for dana@hollowbrook.test');
  });

  it('says where the set-up link is when the server has no organisation yet', async () => {
    setup.fetchSetupState.mockResolvedValue({ firstOwnerNeeded: true });
    const { wrapper } = await mountWithApp(SignInView, { pinia, path: '/sign-in' });
    expect(wrapper.get('[data-testid="signin-first-owner"]').text()).toBe(
      "This server has no organisation yet: the set-up link that makes its first owner is printed in the server's console.",
    );
  });

  it.each([
    ['the server has an organisation', () => setup.fetchSetupState.mockResolvedValue({ firstOwnerNeeded: false })],
    ['the server cannot be asked', () => setup.fetchSetupState.mockRejectedValue(new ApiError(0, 'network', 'Cannot reach the server.'))],
  ])('says nothing of a set-up link when %s', async (_case, arrange) => {
    arrange();
    const { wrapper } = await mountWithApp(SignInView, { pinia, path: '/sign-in' });
    expect(setup.fetchSetupState).toHaveBeenCalled();
    expect(wrapper.find('[data-testid="signin-first-owner"]').exists()).toBe(false);
  });
});
