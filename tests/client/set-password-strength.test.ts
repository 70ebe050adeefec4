import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import { passwordStrength } from '@shared/passwords';
import * as authApi from '@/api/auth';
import { ApiError } from '@/api/http';
import SetPasswordView from '@/views/SetPasswordView.vue';
import { sessionOf } from './support/fixtures';
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

const auth = vi.mocked(authApi);
const TOKEN = 'k3y-0f-a-reset-link-000000001';
let pinia: Pinia;

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  auth.fetchSession.mockResolvedValue(sessionOf(null));
  auth.fetchTokenInfo.mockResolvedValue({ purpose: 'reset', email: 'dana.okafor@hollowbrook.test', name: 'Dana Okafor' });
});

describe('SetPasswordView password strength', () => {
  it('refuses a common password with the shared rule\'s message and does not send it', async () => {
    const { wrapper } = await mountWithApp(SetPasswordView, { pinia, path: `/set-password?token=${TOKEN}` });
    await wrapper.get('[data-testid="setpw-password"]').setValue('password');
    await wrapper.get('form').trigger('submit');
    await flushPromises();

    const verdict = passwordStrength('password', ['dana.okafor@hollowbrook.test', 'Dana Okafor']);
    expect(verdict.acceptable).toBe(false);
    await vi.waitFor(() => expect(wrapper.get('[data-testid="setpw-password-error"]').text()).toBe(verdict.message));
    expect(auth.setPassword).not.toHaveBeenCalled();
  });

  it('refuses a password built from the person\'s own name, as the server does', async () => {
    const { wrapper } = await mountWithApp(SetPasswordView, { pinia, path: `/set-password?token=${TOKEN}` });
    await wrapper.get('[data-testid="setpw-password"]').setValue('danaokafor');
    await wrapper.get('form').trigger('submit');
    await flushPromises();

    await vi.waitFor(() => expect(wrapper.get('[data-testid="setpw-password-error"]').text()).toContain('your name or e-mail address'));
    expect(auth.setPassword).not.toHaveBeenCalled();
  });

  it('says while typing whether the password is hard enough to guess', async () => {
    const { wrapper } = await mountWithApp(SetPasswordView, { pinia, path: `/set-password?token=${TOKEN}` });
    const shown = () => wrapper.get('[data-testid="setpw-strength"]').text();
    await wrapper.get('[data-testid="setpw-password"]').setValue('qwertyuiop');
    await vi.waitFor(() => expect(shown()).toMatch(/^Too easy to guess\./));
    await wrapper.get('[data-testid="setpw-password"]').setValue('kettle heron basalt plum');
    await vi.waitFor(() => expect(shown()).toBe('Hard enough to guess.'));
  });

  it('sends a strong password and shows a server refusal under the field', async () => {
    auth.setPassword.mockRejectedValue(new ApiError(422, 'weak_password', 'password: Too easy to guess. Dates are easy to guess.', 'password'));
    const { wrapper } = await mountWithApp(SetPasswordView, { pinia, path: `/set-password?token=${TOKEN}` });
    await wrapper.get('[data-testid="setpw-password"]').setValue('kettle heron basalt plum');
    await wrapper.get('form').trigger('submit');
    await flushPromises();

    await vi.waitFor(() => expect(auth.setPassword).toHaveBeenCalledWith({ token: TOKEN, password: 'kettle heron basalt plum' }));
    await vi.waitFor(() => expect(wrapper.get('[data-testid="setpw-password-error"]').text()).toBe('Too easy to guess. Dates are easy to guess.'));
  });
});
