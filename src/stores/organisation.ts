import { ref, shallowRef } from 'vue';
import { defineStore } from 'pinia';
import type { OrganisationSettings, OrganisationSettingsInput } from '@shared/schemas';
import * as api from '@/api/organisation';
import { errorMessage } from '@/api/http';
import type { LoadStatus } from './farms';
import { useSessionStore } from './session';

/** The organisation's code (order numbers) and currency (money figures); owners change them. */
export const useOrganisationStore = defineStore('organisation', () => {
  const settings = shallowRef<OrganisationSettings | null>(null);
  const status = ref<LoadStatus>('idle');
  const error = ref<string | null>(null);

  async function load(): Promise<void> {
    status.value = 'loading';
    error.value = null;
    try {
      settings.value = await api.fetchOrganisation();
      status.value = 'ready';
    } catch (e) {
      error.value = errorMessage(e);
      status.value = 'error';
    }
  }

  /** Saves the change, then reads the session again so every money figure takes the new currency. */
  async function update(input: OrganisationSettingsInput): Promise<OrganisationSettings> {
    const saved = await api.updateOrganisation(input);
    settings.value = saved;
    await useSessionStore().load(true);
    return saved;
  }

  return { settings, status, error, load, update };
});
