import { computed, ref, shallowRef } from 'vue';
import { defineStore } from 'pinia';
import type { InvitationInput, Person, PersonUpdateInput } from '@shared/schemas';
import * as peopleApi from '@/api/people';
import { errorMessage } from '@/api/http';
import type { LoadStatus } from './farms';

/** The organisation's people (owners only), with invitations and access changes. */
export const usePeopleStore = defineStore('people', () => {
  const people = shallowRef<Person[]>([]);
  const status = ref<LoadStatus>('idle');
  const error = ref<string | null>(null);

  const counts = computed(() => ({
    active: people.value.filter((p) => p.active && !p.invitationPending).length,
    pending: people.value.filter((p) => p.active && p.invitationPending).length,
    inactive: people.value.filter((p) => !p.active).length,
  }));

  async function load(): Promise<void> {
    status.value = 'loading';
    error.value = null;
    try {
      people.value = await peopleApi.fetchPeople();
      status.value = 'ready';
    } catch (e) {
      error.value = errorMessage(e);
      status.value = 'error';
    }
  }

  async function ensureLoaded(): Promise<void> {
    if (status.value === 'idle' || status.value === 'error') await load();
  }

  function put(person: Person): Person {
    const index = people.value.findIndex((p) => p.id === person.id);
    const next = people.value.slice();
    if (index === -1) next.push(person);
    else next[index] = person;
    people.value = next.sort((a, b) => a.name.localeCompare(b.name));
    return person;
  }

  async function invite(input: InvitationInput): Promise<Person> {
    return put(await peopleApi.invitePerson(input));
  }

  async function update(personId: number, input: PersonUpdateInput): Promise<Person> {
    return put(await peopleApi.updatePerson(personId, input));
  }

  async function resendInvitation(personId: number): Promise<void> {
    await peopleApi.resendInvitation(personId);
  }

  function reset(): void {
    people.value = [];
    status.value = 'idle';
    error.value = null;
  }

  return { people, status, error, counts, load, ensureLoaded, invite, update, resendInvitation, reset };
});
