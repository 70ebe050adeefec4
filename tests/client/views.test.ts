import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import { PASSWORD_MIN_LENGTH, fieldErrors, setPasswordSchema } from '@shared/schemas';
import * as authApi from '@/api/auth';
import * as farmsApi from '@/api/farms';
import * as outboxApi from '@/api/outbox';
import * as peopleApi from '@/api/people';
import { ApiError } from '@/api/http';
import FarmsView from '@/views/FarmsView.vue';
import HomeView from '@/views/HomeView.vue';
import OutboxView from '@/views/OutboxView.vue';
import ProfileView from '@/views/ProfileView.vue';
import SetPasswordView from '@/views/SetPasswordView.vue';
import { makeFarm, makePerson, makeUser, sessionOf } from './support/fixtures';
import { inDocument, mountWithApp } from './support/mountApp';

vi.mock('@/api/auth', () => ({
  fetchSession: vi.fn(),
  signIn: vi.fn(),
  signOut: vi.fn(),
  updateProfile: vi.fn(),
  setPassword: vi.fn(),
  requestPasswordReset: vi.fn(),
  fetchTokenInfo: vi.fn(),
  fetchTextFailures: vi.fn(async () => []),
}));
vi.mock('@/api/farms', () => ({ fetchFarms: vi.fn(), fetchFarm: vi.fn(), createFarm: vi.fn(), updateFarm: vi.fn() }));
vi.mock('@/api/people', () => ({ fetchPeople: vi.fn(), invitePerson: vi.fn(), resendInvitation: vi.fn(), updatePerson: vi.fn() }));
vi.mock('@/api/outbox', async (original) => ({ ...(await original<typeof import('@/api/outbox')>()), fetchOutboxList: vi.fn(), clearOutbox: vi.fn() }));

const auth = vi.mocked(authApi);
const farms = vi.mocked(farmsApi);
const outbox = vi.mocked(outboxApi);
const people = vi.mocked(peopleApi);
let pinia: Pinia;

const TOKEN = 'k3y-0f-an-invitation-link-0001';

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  auth.fetchSession.mockResolvedValue(sessionOf(null));
  farms.fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site'), makeFarm(12, 'Ridge block', { archivedAt: '2026-01-05T10:00:00.000Z' })]);
});

describe('SetPasswordView', () => {
  it('shows the purpose, the e-mail and a name field for an invitation', async () => {
    auth.fetchTokenInfo.mockResolvedValue({ purpose: 'invite', email: 'bea@hollowbrook.test', name: 'Bea Holm' });
    const { wrapper } = await mountWithApp(SetPasswordView, { pinia, path: `/set-password?token=${TOKEN}` });

    expect(auth.fetchTokenInfo).toHaveBeenCalledWith(TOKEN);
    expect(wrapper.text()).toContain('Join your team');
    expect(wrapper.get('[data-testid="setpw-email"]').text()).toContain('bea@hollowbrook.test');
    expect((wrapper.get('[data-testid="setpw-name"]').element as HTMLInputElement).value).toBe('Bea Holm');
    expect(wrapper.text()).toContain(`At least ${PASSWORD_MIN_LENGTH} characters`);
  });

  it('has no name field for a reset link', async () => {
    auth.fetchTokenInfo.mockResolvedValue({ purpose: 'reset', email: 'dana@hollowbrook.test', name: 'Dana Okafor' });
    const { wrapper } = await mountWithApp(SetPasswordView, { pinia, path: `/set-password?token=${TOKEN}` });

    expect(wrapper.text()).toContain('Choose a new password');
    expect(wrapper.find('[data-testid="setpw-name"]').exists()).toBe(false);
  });

  it('rejects a short password with the shared schema message and does not send it', async () => {
    auth.fetchTokenInfo.mockResolvedValue({ purpose: 'reset', email: 'dana@hollowbrook.test', name: 'Dana' });
    const { wrapper } = await mountWithApp(SetPasswordView, { pinia, path: `/set-password?token=${TOKEN}` });

    await wrapper.get('[data-testid="setpw-password"]').setValue('short');
    await wrapper.get('form').trigger('submit');
    await flushPromises();

    const parsed = setPasswordSchema.safeParse({ token: TOKEN, password: 'short' });
    expect(parsed.success).toBe(false);
    expect(wrapper.get('[data-testid="setpw-password-error"]').text()).toBe(parsed.success ? '' : fieldErrors(parsed.error).password);
    expect(auth.setPassword).not.toHaveBeenCalled();
  });

  it('sets the password with the name, signs in and goes home', async () => {
    auth.fetchTokenInfo.mockResolvedValue({ purpose: 'invite', email: 'bea@hollowbrook.test', name: 'Bea Holm' });
    auth.setPassword.mockResolvedValue({ user: makeUser('worker'), csrfToken: 'tok-in' });
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('worker')));
    const { wrapper, router } = await mountWithApp(SetPasswordView, { pinia, path: `/set-password?token=${TOKEN}` });

    await wrapper.get('[data-testid="setpw-name"]').setValue('Bea H.');
    await wrapper.get('[data-testid="setpw-password"]').setValue('rain barrel lantern');
    await wrapper.get('form').trigger('submit');
    await flushPromises();

    // The strength rule loads on its own (large dictionaries) before the password is sent.
    await vi.waitFor(() => expect(auth.setPassword).toHaveBeenCalledWith({ token: TOKEN, password: 'rain barrel lantern', name: 'Bea H.' }));
    await vi.waitFor(() => expect(router.currentRoute.value.name).toBe('home'));
  });

  it('explains a used or expired link', async () => {
    auth.fetchTokenInfo.mockRejectedValue(new ApiError(404, 'token_invalid', 'This link is unknown, already used or expired; ask for a new one'));
    const { wrapper } = await mountWithApp(SetPasswordView, { pinia, path: `/set-password?token=${TOKEN}` });

    expect(wrapper.get('[data-testid="setpw-invalid"]').text()).toContain('already used or expired');
    expect(wrapper.find('form').exists()).toBe(false);
  });

  it('asks for the link from the mail when the token is missing', async () => {
    const { wrapper } = await mountWithApp(SetPasswordView, { pinia, path: '/set-password' });

    expect(wrapper.find('[data-testid="setpw-missing"]').exists()).toBe(true);
    expect(auth.fetchTokenInfo).not.toHaveBeenCalled();
  });
});

describe('OutboxView', () => {
  beforeEach(() => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('manager')));
  });

  it('lists mails newest first with clickable links', async () => {
    outbox.fetchOutboxList.mockResolvedValue({ texts: [], messages: [
      {
        id: 'a',
        to: 'orders@millrace.test',
        from: 'brimstock@hollowbrook.test',
        subject: 'Older',
        kind: 'order',
        date: '2026-03-01T09:00:00.000Z',
        text: 'no links',
        html: '',
        attachments: [{ index: 0, filename: 'TB-26-001.csv', contentType: 'text/csv', size: 2048 }],
      },
      {
        id: 'b',
        to: 'dana@hollowbrook.test',
        from: 'brimstock@hollowbrook.test',
        subject: 'Reset your password',
        kind: 'account',
        date: '2026-03-02T09:00:00.000Z',
        text: 'Open http://127.0.0.1:5173/set-password?token=abc to choose one.',
        html: '',
        attachments: [],
      },
    ] });
    const { wrapper } = await mountWithApp(OutboxView, { pinia, path: '/outbox' });

    const items = wrapper.findAll('[data-testid="outbox-message"]');
    expect(items).toHaveLength(2);
    expect(items[0]!.text()).toContain('Reset your password');
    expect(items[0]!.get('[data-testid="outbox-link"]').attributes('href')).toBe('http://127.0.0.1:5173/set-password?token=abc');
    expect(items[1]!.find('[data-testid="outbox-link"]').exists()).toBe(false);
    expect(items[1]!.get('[data-testid="outbox-kind"]').text()).toBe('Purchase order');
    const file = items[1]!.get('[data-testid="outbox-attachment"]');
    expect(file.attributes('href')).toBe('/api/dev/outbox/a/attachments/0');
    expect(file.text()).toBe('TB-26-001.csv');
  });

  it('lists texts beside the mails with the person they went to and a link to the tank', async () => {
    outbox.fetchOutboxList.mockResolvedValue({
      messages: [],
      texts: [{ id: 'SM1', to: '+61491570156', toName: 'Marek Danso', from: '+61491570110', body: 'Brimstock Culture too cold, North: cone 12 °C http://127.0.0.1:5180/tanks/4', date: '2026-03-02T09:00:00.000Z' }],
    });
    const { wrapper } = await mountWithApp(OutboxView, { pinia, path: '/outbox' });

    const text = wrapper.get('[data-testid="outbox-text"]');
    expect(text.text()).toContain('Marek Danso');
    expect(text.text()).toContain('+61491570156');
    expect(text.get('[data-testid="outbox-link"]').attributes('href')).toBe('http://127.0.0.1:5180/tanks/4');
    expect(wrapper.find('[data-testid="empty-state"]').exists()).toBe(false);
  });

  it('says the outbox is not enabled when the API answers 404', async () => {
    outbox.fetchOutboxList.mockRejectedValue(new ApiError(404, 'not_found', 'Not found'));
    const { wrapper } = await mountWithApp(OutboxView, { pinia, path: '/outbox' });

    expect(wrapper.get('[data-testid="outbox-disabled"]').text()).toContain('not enabled');
    expect(wrapper.find('[data-testid="load-error"]').exists()).toBe(false);
  });

  it('shows other failures with a retry', async () => {
    outbox.fetchOutboxList.mockRejectedValueOnce(new ApiError(0, 'network', 'Cannot reach the server.')).mockResolvedValueOnce({ messages: [], texts: [] });
    const { wrapper } = await mountWithApp(OutboxView, { pinia, path: '/outbox' });

    expect(wrapper.get('[data-testid="load-error"]').text()).toContain('Cannot reach the server.');
    await wrapper.get('[data-testid="load-retry"]').trigger('click');
    await flushPromises();
    expect(wrapper.find('[data-testid="empty-state"]').exists()).toBe(true);
  });
});

describe('FarmsView', () => {
  it('is read-only for a worker and hides archived farms until asked', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('worker')));
    const { wrapper } = await mountWithApp(FarmsView, { pinia, path: '/farms' });

    expect(wrapper.find('[data-testid="farms-new"]').exists()).toBe(false);
    expect(wrapper.find('[data-testid="farm-edit-11"]').exists()).toBe(false);
    expect(wrapper.find('[data-testid="farm-11"]').exists()).toBe(true);
    expect(wrapper.find('[data-testid="farm-12"]').exists()).toBe(false);

    await wrapper.get('#farms-show-archived').setValue(true);
    await flushPromises();
    expect(wrapper.find('[data-testid="farm-12"]').exists()).toBe(true);
  });

  it('lets a manager create a farm after the shared schema accepts it', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('manager')));
    farms.createFarm.mockResolvedValue(makeFarm(13, 'Spring field', { timeZone: 'UTC' }));
    const { wrapper } = await mountWithApp(FarmsView, { pinia, path: '/farms' });

    await wrapper.get('[data-testid="farms-new"]').trigger('click');
    await flushPromises();
    await inDocument('farm-submit').trigger('submit');
    await flushPromises();
    expect(inDocument('farm-name-error').text()).toBe('Required');
    expect(farms.createFarm).not.toHaveBeenCalled();

    await inDocument('farm-name').setValue('Spring field');
    await inDocument('farm-submit').trigger('submit');
    await flushPromises();

    expect(farms.createFarm).toHaveBeenCalledWith(expect.objectContaining({ name: 'Spring field', location: '' }));
    expect(wrapper.find('[data-testid="farm-13"]').exists()).toBe(true);
  });

  it('archives a farm only after confirming', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('owner')));
    farms.updateFarm.mockResolvedValue(makeFarm(11, 'Creek site', { archivedAt: '2026-03-03T00:00:00.000Z' }));
    const { wrapper } = await mountWithApp(FarmsView, { pinia, path: '/farms' });

    await wrapper.get('[data-testid="farm-archive-11"]').trigger('click');
    await flushPromises();
    expect(farms.updateFarm).not.toHaveBeenCalled();
    const accept = [...document.querySelectorAll('button')].find((b) => b.textContent?.trim() === 'Archive' && !b.closest('[data-testid="farm-11"]'));
    accept!.click();
    await flushPromises();

    expect(farms.updateFarm).toHaveBeenCalledWith(11, { archived: true });
    expect(wrapper.find('[data-testid="farm-11"]').exists()).toBe(false);
  });
});

describe('ProfileView', () => {
  it('saves the unit system through the session store', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('buyer')));
    auth.updateProfile.mockResolvedValue(makeUser('buyer', { unitSystem: 'us' }));
    const { wrapper } = await mountWithApp(ProfileView, { pinia, path: '/profile' });

    const usButton = wrapper.findAll('[data-testid="profile-units"] button').find((b) => b.text().includes('US customary'));
    await usButton!.trigger('click');
    await wrapper.get('form').trigger('submit');
    await flushPromises();

    expect(auth.updateProfile).toHaveBeenCalledWith({ name: 'Priya Nand', unitSystem: 'us', flagMail: 'digest', phone: null, flagTexts: 'off' });
  });

  it('sends a typed mobile number in E.164 with texts on, and refuses texts without a number under the number field', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('manager')));
    auth.updateProfile.mockResolvedValue(makeUser('manager', { phone: '+61491570156', flagTexts: 'immediate' }));
    const { wrapper } = await mountWithApp(ProfileView, { pinia, path: '/profile' });
    const eachFlag = () => wrapper.findAll('[data-testid="profile-flagtexts"] button').find((b) => b.text().includes('Each new flag'))!;

    await eachFlag().trigger('click');
    await wrapper.get('form').trigger('submit');
    await flushPromises();
    expect(auth.updateProfile).not.toHaveBeenCalled();
    expect(wrapper.text()).toContain('Texts need a mobile number');

    await wrapper.get('[data-testid="profile-phone"]').setValue('+61 491 570 156');
    await wrapper.get('form').trigger('submit');
    await flushPromises();
    expect(auth.updateProfile).toHaveBeenCalledWith(expect.objectContaining({ phone: '+61491570156', flagTexts: 'immediate' }));
  });
});

describe('HomeView', () => {
  it('greets the owner with farm and team counts and links to their screens', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('owner')));
    people.fetchPeople.mockResolvedValue([makePerson(1, 'Imre Vasquez', 'owner'), makePerson(6, 'Lee Park', 'worker', { invitationPending: true })]);
    const { wrapper } = await mountWithApp(HomeView, { pinia, path: '/' });

    expect(wrapper.get('[data-testid="home-greeting"]').text()).toMatch(/Imre$/);
    expect(wrapper.get('[data-testid="home-farm-count"]').text()).toMatch(/1\s*active farm\b/);
    expect(wrapper.get('[data-testid="home-farm-count"]').text()).toContain('1 archived');
    expect(wrapper.get('[data-testid="home-people"]').text()).toMatch(/Active\s*1\s*Invited\s*1/);
    expect(wrapper.find('[data-testid="home-link-people"]').exists()).toBe(true);
  });

  it('shows a worker no team section and no People link', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('worker')));
    const { wrapper } = await mountWithApp(HomeView, { pinia, path: '/' });

    expect(wrapper.find('[data-testid="home-people"]').exists()).toBe(false);
    expect(wrapper.find('[data-testid="home-link-people"]').exists()).toBe(false);
    expect(people.fetchPeople).not.toHaveBeenCalled();
  });
});
