import { computed, ref } from 'vue';
import { defineStore } from 'pinia';
import type { FirstOwnerInput, ProfileInput, Role, SessionState, SetPasswordInput, SignInInput, SessionUser } from '@shared/schemas';
import * as authApi from '@/api/auth';
import * as setupApi from '@/api/setup';
import { registerCsrfSource } from '@/api/http';
import { browserLanguage, setLanguage } from '@/i18n';
import { keepSessionCopy, readSessionCopy } from '@/offline/session-copy';
import { isUnreachable } from '@/offline/unreachable';
import { useFarmsStore } from './farms';
import { usePeopleStore } from './people';

/** The signed-in user, the CSRF token for writes, and the actions that change them. */
export const useSessionStore = defineStore('session', () => {
  const user = ref<SessionUser | null>(null);
  const csrfToken = ref('');
  /** True once GET /api/auth/session has answered at least once. */
  const loaded = ref(false);
  /** Why the last load failed (server unreachable…), or null. */
  const loadError = ref<string | null>(null);
  /** Set while the user shown comes from the device's copy (the server could not be reached): when that copy was saved. */
  const offlineSince = ref<string | null>(null);
  let pending: Promise<void> | null = null;

  const isSignedIn = computed(() => user.value !== null);
  const role = computed<Role | null>(() => user.value?.role ?? null);

  function hasRole(...roles: Role[]): boolean {
    return role.value !== null && roles.includes(role.value);
  }

  /** The screens speak the person's language, or the browser's while nobody is signed in or none is chosen. */
  function speakFor(person: SessionUser | null): void {
    setLanguage(person?.language ?? browserLanguage());
  }

  function adopt(state: SessionState): void {
    // Lists cached for one person must not show to the next one on this device.
    if (user.value?.id !== state.user?.id) forgetUserData();
    user.value = state.user;
    csrfToken.value = state.csrfToken;
    loaded.value = true;
    loadError.value = null;
    offlineSince.value = null;
    speakFor(state.user);
    void keepSessionCopy(state.user);
  }

  /** Without a way to the server, the person last signed in on this device stays signed in (the round works offline). */
  async function adoptCopy(): Promise<boolean> {
    const copy = await readSessionCopy();
    if (!copy) return false;
    user.value = copy.user;
    csrfToken.value = '';
    loaded.value = true;
    offlineSince.value = copy.savedAt;
    speakFor(copy.user);
    return true;
  }

  /** Fetches the session once; `force` fetches again (after sign-out, or for a fresh CSRF token). */
  function load(force = false): Promise<void> {
    if (loaded.value && !force) return Promise.resolve();
    // Several callers (router guard, CSRF retry) may ask at once; one request serves them all.
    pending ??= authApi
      .fetchSession()
      .then(adopt)
      .catch(async (error: unknown) => {
        loadError.value = error instanceof Error ? error.message : String(error);
        if (isUnreachable(error) && (user.value !== null || !loaded.value) && (await adoptCopy())) return;
        throw error;
      })
      .finally(() => {
        pending = null;
      });
    return pending;
  }

  async function signIn(input: SignInInput): Promise<SessionUser> {
    if (!csrfToken.value) await load(true);
    const state = await authApi.signIn(input);
    adopt(state);
    return state.user;
  }

  async function setPassword(input: SetPasswordInput): Promise<SessionUser> {
    if (!csrfToken.value) await load(true);
    const state = await authApi.setPassword(input);
    adopt(state);
    return state.user;
  }

  /** Makes the first owner of a server with no organisation from its set-up link; they are signed in. */
  async function createFirstOwner(input: FirstOwnerInput): Promise<SessionUser> {
    if (!csrfToken.value) await load(true);
    const state = await setupApi.createFirstOwner(input);
    adopt(state);
    return state.user;
  }

  /** Signs out on the server, then fetches the new anonymous session so the next sign-in has a token. */
  async function signOut(): Promise<void> {
    try {
      await authApi.signOut();
    } finally {
      clear();
      await load(true).catch(() => undefined);
    }
  }

  /** Forgets the user locally (the server already ended the session). */
  function clear(): void {
    user.value = null;
    csrfToken.value = '';
    offlineSince.value = null;
    speakFor(null);
    void keepSessionCopy(null);
    forgetUserData();
  }

  function forgetUserData(): void {
    useFarmsStore().reset();
    usePeopleStore().reset();
  }

  async function updateProfile(input: ProfileInput): Promise<SessionUser> {
    const updated = await authApi.updateProfile(input);
    user.value = updated;
    speakFor(updated);
    void keepSessionCopy(updated);
    return updated;
  }

  registerCsrfSource({ token: () => csrfToken.value, refresh: () => load(true) });

  // Back online after starting from the device's copy: ask the server who is signed in (and for a form token).
  if (typeof window !== 'undefined') {
    window.addEventListener('online', () => {
      if (offlineSince.value) void load(true).catch(() => undefined);
    });
  }

  return { user, csrfToken, loaded, loadError, offlineSince, isSignedIn, role, hasRole, load, signIn, setPassword, createFirstOwner, signOut, clear, updateProfile };
});
