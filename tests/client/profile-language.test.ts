import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import Select from 'primevue/select';
import { formatVolume } from '@shared/units';
import * as authApi from '@/api/auth';
import { ApiError } from '@/api/http';
import { setLanguage } from '@/i18n';
import { useSessionStore } from '@/stores/session';
import { formatAge } from '@/utils/age';
import ProfileView from '@/views/ProfileView.vue';
import { makeUser, sessionOf } from './support/fixtures';
import { mountWithApp } from './support/mountApp';

vi.mock('@/api/auth', () => ({
  fetchSession: vi.fn(),
  signIn: vi.fn(),
  signOut: vi.fn(),
  updateProfile: vi.fn(),
  fetchTextFailures: vi.fn(async () => []),
}));

const auth = vi.mocked(authApi);
let pinia: Pinia;

beforeEach(() => {
  vi.clearAllMocks();
  document.body.innerHTML = '';
  pinia = createPinia();
  setActivePinia(pinia);
});
afterEach(() => setLanguage('en'));

async function chooseLanguage(wrapper: Awaited<ReturnType<typeof mountWithApp>>['wrapper'], language: string) {
  wrapper.findComponent(Select).vm.$emit('update:modelValue', language);
  await flushPromises();
}

describe('the language on the Profile', () => {
  it('offers each language by its own name and switches the screens at once, then saves the choice', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('worker')));
    auth.updateProfile.mockImplementation(async (input) => makeUser('worker', { language: input.language ?? null }));
    const { wrapper } = await mountWithApp(ProfileView, { pinia, path: '/profile' });
    expect(wrapper.get('h1').text()).toBe('Profile');
    expect(wrapper.findComponent(Select).props('options')).toEqual([
      { value: 'en', label: 'English' },
      { value: 'es', label: 'Español' },
      { value: 'fr', label: 'Français' },
    ]);

    await chooseLanguage(wrapper, 'es');

    expect(auth.updateProfile).toHaveBeenCalledWith({ language: 'es' });
    expect(wrapper.get('h1').text()).toBe('Perfil');
    expect(wrapper.get('[data-testid="profile-units"]').text()).toContain('Métricas');
    expect(document.body.textContent).toContain('Idioma guardado');
    expect(document.documentElement.lang).toBe('es');
    // Figures and ages follow the language too.
    expect(formatVolume(1234.5, 'metric', 1)).toBe('1234,5 L');
    expect(formatAge('2026-03-01T10:00:00Z', new Date('2026-03-04T10:00:00Z'))).toBe('hace 3 días');
    expect(useSessionStore().user?.language).toBe('es');
  });

  it('goes back to the language before when the choice could not be saved', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('buyer')));
    auth.updateProfile.mockRejectedValue(new ApiError(503, 'database_down', 'The database is not reachable right now; try again shortly'));
    const { wrapper } = await mountWithApp(ProfileView, { pinia, path: '/profile' });

    await chooseLanguage(wrapper, 'fr');

    expect(wrapper.get('h1').text()).toBe('Profile');
    expect(document.body.textContent).toContain('The language could not be saved');
  });

  it('speaks the signed-in person’s language from the session, and French writes its own figures', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('manager', { language: 'fr' })));
    const { wrapper } = await mountWithApp(ProfileView, { pinia, path: '/profile' });
    await useSessionStore().load();
    await flushPromises();

    expect(wrapper.get('h1').text()).toBe('Profil');
    expect(wrapper.text()).toContain('Alertes par e-mail');
    // CLDR French groups thousands with a narrow no-break space (U+202F).
    expect(formatVolume(12345, 'metric')).toBe('12\u202f345 L');
  });

  it('says a form check in the screens’ language under its field', async () => {
    auth.fetchSession.mockResolvedValue(sessionOf(makeUser('manager', { language: 'es' })));
    const { wrapper } = await mountWithApp(ProfileView, { pinia, path: '/profile' });
    await useSessionStore().load();
    await flushPromises();

    const eachFlag = wrapper.findAll('[data-testid="profile-flagtexts"] button').find((b) => b.text().includes('Cada aviso nuevo'))!;
    await eachFlag.trigger('click');
    await wrapper.get('form').trigger('submit');
    await flushPromises();

    expect(auth.updateProfile).not.toHaveBeenCalled();
    expect(wrapper.get('[data-testid="profile-phone-error"]').text()).toBe('Los SMS necesitan un número de móvil');
  });
});
