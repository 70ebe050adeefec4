import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import * as authApi from '@/api/auth';
import * as organisationApi from '@/api/organisation';
import { ApiError } from '@/api/http';
import OrganisationSettingsPanel from '@/components/organisation/OrganisationSettingsPanel.vue';
import { makeUser, sessionOf } from './support/fixtures';
import { mountWithApp } from './support/mountApp';

vi.mock('@/api/auth', () => ({ fetchSession: vi.fn(), signIn: vi.fn(), signOut: vi.fn(), updateProfile: vi.fn(), setPassword: vi.fn(), requestPasswordReset: vi.fn(), fetchTokenInfo: vi.fn() }));
vi.mock('@/api/organisation', () => ({ fetchOrganisation: vi.fn(), updateOrganisation: vi.fn() }));

const auth = vi.mocked(authApi);
const api = vi.mocked(organisationApi);
let pinia: Pinia;
const settings = { id: 7, name: 'Hollowbrook Growers', code: 'HG', currency: 'EUR', nextOrderNumber: 'HG-26-004' };

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
  auth.fetchSession.mockResolvedValue(sessionOf(makeUser('owner')));
  api.fetchOrganisation.mockResolvedValue(settings);
});

describe('OrganisationSettingsPanel', () => {
  it('shows the code with the next order number and the currency, and saves only what changed, upper-cased', async () => {
    api.updateOrganisation.mockResolvedValue({ ...settings, code: 'HGC', nextOrderNumber: 'HGC-26-004' });
    const { wrapper } = await mountWithApp(OrganisationSettingsPanel, { pinia, path: '/people' });
    await flushPromises();

    expect(wrapper.text()).toContain('Next order: HG-26-004.');
    expect(wrapper.text()).toContain(new Intl.NumberFormat(undefined, { style: 'currency', currency: 'EUR' }).format(1234.5));
    await wrapper.get('[data-testid="org-code"]').setValue('hgc');
    await wrapper.get('form').trigger('submit');
    await flushPromises();

    expect(api.updateOrganisation).toHaveBeenCalledWith({ code: 'HGC' });
    // The session is read again, so money figures everywhere take the saved currency.
    expect(auth.fetchSession).toHaveBeenCalledTimes(2);
  }, 20_000);

  it('refuses a code that is not 2 to 4 letters before sending, and shows the server’s refusal under the field', async () => {
    const { wrapper } = await mountWithApp(OrganisationSettingsPanel, { pinia, path: '/people' });
    await flushPromises();

    await wrapper.get('[data-testid="org-code"]').setValue('H1');
    await wrapper.get('form').trigger('submit');
    await flushPromises();
    expect(api.updateOrganisation).not.toHaveBeenCalled();
    expect(wrapper.get('[data-testid="org-code-error"]').text()).toBe('must be 2 to 4 letters A–Z, such as TB');

    api.updateOrganisation.mockRejectedValue(new ApiError(409, 'code_taken', 'code: TB is used by another organisation; choose other letters', 'code'));
    await wrapper.get('[data-testid="org-code"]').setValue('TB');
    await wrapper.get('form').trigger('submit');
    await flushPromises();
    expect(wrapper.get('[data-testid="org-code-error"]').text()).toContain('used by another organisation');
  }, 20_000);
});
