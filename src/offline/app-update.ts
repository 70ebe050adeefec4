// A new version of the app, found by the service worker, waits here until the person chooses to reload
// (TheUpdatePrompt.vue), so nobody is reloaded in the middle of a round.
import { ref } from 'vue';

/** True once a new version is installed and waiting. */
export const updateWaiting = ref(false);
let activate: (() => Promise<void>) | null = null;

/** Called by the registration (src/main.ts) when a new version waits, with what switches to it. */
export function offerUpdate(switchToNew: () => Promise<void>): void {
  activate = switchToNew;
  updateWaiting.value = true;
}

/** Switches to the new version; the page reloads once it has taken over. */
export async function applyUpdate(): Promise<void> {
  updateWaiting.value = false;
  await activate?.();
}

/** Puts the offer aside for now (it comes back with the next version or the next start). */
export function postponeUpdate(): void {
  updateWaiting.value = false;
}
