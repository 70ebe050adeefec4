import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import { fieldErrors, invitationSchema } from '@shared/schemas';
import * as authApi from '@/api/auth';
import * as farmsApi from '@/api/farms';
import * as organisationApi from '@/api/organisation';
import * as peopleApi from '@/api/people';
import { ApiError } from '@/api/http';
import PeopleView from '@/views/PeopleView.vue';
import { setLanguage } from '@/i18n';
import { englishLeft } from './support/englishLeft';
import { makeFarm, makePerson, makeUser, sessionOf } from './support/fixtures';
import { existsInDocument, inDocument, mountWithApp, setViewportWidth } from './support/mountApp';

vi.mock('@/api/auth', () => ({
  fetchSession: vi.fn(),
  signIn: vi.fn(),
  signOut: vi.fn(),
  updateProfile: vi.fn(),
  setPassword: vi.fn(),
  requestPasswordReset: vi.fn(),
  fetchTokenInfo: vi.fn(),
}));
vi.mock('@/api/farms', () => ({ fetchFarms: vi.fn(), fetchFarm: vi.fn(), createFarm: vi.fn(), updateFarm: vi.fn() }));
vi.mock('@/api/organisation', () => ({ fetchOrganisation: vi.fn(), updateOrganisation: vi.fn() }));
vi.mock('@/api/people', () => ({ fetchPeople: vi.fn(), invitePerson: vi.fn(), resendInvitation: vi.fn(), updatePerson: vi.fn() }));

const auth = vi.mocked(authApi);
const farms = vi.mocked(farmsApi);
const people = vi.mocked(peopleApi);
let pinia: Pinia;

const owner = makePerson(1, 'Imre Vasquez', 'owner', { lastSignInAt: '2026-03-02T08:15:00.000Z' });
const worker = makePerson(3, 'Tomas Lind', 'worker', { farmIds: [11] });
const invited = makePerson(5, 'Ana Ferreira', 'buyer', { invitationPending: true, farmIds: [11, 12] });

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  auth.fetchSession.mockResolvedValue(sessionOf(makeUser('owner')));
  farms.fetchFarms.mockResolvedValue([makeFarm(11, 'Creek site'), makeFarm(12, 'Ridge block')]);
  people.fetchPeople.mockResolvedValue([owner, worker, invited]);
  vi.mocked(organisationApi).fetchOrganisation.mockResolvedValue({ id: 7, name: 'Hollowbrook Growers', code: 'HG', currency: 'EUR', nextOrderNumber: 'HG-26-004' });
});

afterEach(() => setViewportWidth(1024));

describe('PeopleView', () => {
  it('shows one card per person instead of the table on a 360 px phone', async () => {
    setViewportWidth(360);
    const { wrapper } = await mountWithApp(PeopleView, { pinia, path: '/people' });

    expect(wrapper.find('[data-testid="people-table"]').exists()).toBe(false);
    expect(wrapper.findAll('[data-testid="people-list"] > li')).toHaveLength(3);
    expect(wrapper.get('[data-testid="person-5"]').text()).toContain('Creek site, Ridge block');
    expect(wrapper.find('[data-testid="person-resend-5"]').exists()).toBe(true);
  });

  it('lists people with their farms and status', async () => {
    const { wrapper } = await mountWithApp(PeopleView, { pinia, path: '/people' });

    const table = wrapper.get('[data-testid="people-table"]').text();
    expect(table).toContain('Tomas Lind');
    expect(table).toContain('Creek site');
    expect(table).toContain('Creek site, Ridge block');
    expect(table).toContain('Invitation sent');
    expect(wrapper.find('[data-testid="person-resend-5"]').exists()).toBe(true);
    expect(wrapper.find('[data-testid="person-resend-3"]').exists()).toBe(false);
    // An owner cannot deactivate themself, so the button is not offered.
    expect(wrapper.find('[data-testid="person-deactivate-1"]').exists()).toBe(false);
    expect(wrapper.get('[data-testid="people-counts"]').text()).toBe('2 active · 1 invited · 0 deactivated');
  });

  it('shows a retry when the list cannot be loaded, and the list after retrying', async () => {
    people.fetchPeople.mockRejectedValueOnce(new ApiError(503, 'http_error', 'The server is not ready.'));
    const { wrapper } = await mountWithApp(PeopleView, { pinia, path: '/people' });

    expect(wrapper.get('[data-testid="load-error"]').text()).toContain('The server is not ready.');
    await wrapper.get('[data-testid="load-retry"]').trigger('click');
    await flushPromises();

    expect(wrapper.find('[data-testid="people-table"]').exists()).toBe(true);
  });

  it('validates the invitation with the shared schema before sending', async () => {
    const { wrapper } = await mountWithApp(PeopleView, { pinia, path: '/people' });

    await wrapper.get('[data-testid="people-invite"]').trigger('click');
    await flushPromises();
    await inDocument('invite-submit').trigger('submit');
    await flushPromises();

    const parsed = invitationSchema.safeParse({ email: '', name: '', role: 'worker', farmIds: [] });
    const expected = parsed.success ? {} : fieldErrors(parsed.error);
    expect(inDocument('invite-email-error').text()).toBe(expected.email);
    expect(inDocument('invite-name-error').text()).toBe(expected.name);
    expect(people.invitePerson).not.toHaveBeenCalled();
  });

  it('puts the server email_taken error under the e-mail field', async () => {
    people.invitePerson.mockRejectedValue(
      new ApiError(409, 'email_taken', 'email: someone with this e-mail address already has an account', 'email'),
    );
    const { wrapper } = await mountWithApp(PeopleView, { pinia, path: '/people' });

    await wrapper.get('[data-testid="people-invite"]').trigger('click');
    await flushPromises();
    await inDocument('invite-email').setValue('tomas@hollowbrook.test');
    await inDocument('invite-name').setValue('Tomas Again');
    await inDocument('invite-submit').trigger('submit');
    await flushPromises();

    expect(people.invitePerson).toHaveBeenCalledWith({ email: 'tomas@hollowbrook.test', name: 'Tomas Again', role: 'worker', farmIds: [] });
    expect(inDocument('invite-email-error').text()).toBe('someone with this e-mail address already has an account');
  });

  it('adds the invited person to the list and closes the dialog', async () => {
    const added = makePerson(9, 'Bea Holm', 'worker', { invitationPending: true });
    people.invitePerson.mockResolvedValue(added);
    const { wrapper } = await mountWithApp(PeopleView, { pinia, path: '/people' });

    await wrapper.get('[data-testid="people-invite"]').trigger('click');
    await flushPromises();
    await inDocument('invite-email').setValue('bea@hollowbrook.test');
    await inDocument('invite-name').setValue('Bea Holm');
    await inDocument('invite-submit').trigger('submit');
    await flushPromises();

    expect(wrapper.get('[data-testid="people-table"]').text()).toContain('Bea Holm');
    await vi.waitFor(() => expect(existsInDocument('invite-dialog')).toBe(false));
  });
});

describe('PeopleView in Spanish', () => {
  afterEach(() => setLanguage('en'));

  it('lists people with Spanish headings, statuses and counts that agree with their number, and the organisation panel in Spanish', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('owner', { language: 'es' })));
    const { wrapper } = await mountWithApp(PeopleView, { pinia, path: '/people' });

    const table = wrapper.get('[data-testid="people-table"]');
    expect(table.findAll('th').map((th) => th.text())).toEqual(['Persona', 'Función', 'Fincas', 'Estado', 'Último acceso', 'Acciones']);
    expect(table.text()).toContain('Invitación enviada');
    expect(wrapper.get('[data-testid="person-resend-5"]').text()).toBe('Reenviar la invitación');
    expect(wrapper.get('[data-testid="people-counts"]').text()).toBe('2 activas · 1 invitada · 0 desactivadas');
    const panel = wrapper.get('[data-testid="organisation-settings"]');
    expect(panel.get('h2').text()).toBe('Números de pedido y moneda');
    expect(panel.text()).toContain('Próximo pedido: HG-26-004.');
    // Spanish money: comma for decimals, the sign after the figure.
    expect(panel.text()).toMatch(/se leen así: 1\.?234,50\s€\./);
    expect(englishLeft(wrapper.text(), ['people', 'organisation'])).toEqual([]);
  });
});
