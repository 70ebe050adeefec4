import { flushPromises } from '@vue/test-utils';

/** Lets the fake IndexedDB (it answers on later turns of the event loop) and the promises waiting on it finish. */
export async function settleDevice(turns = 12): Promise<void> {
  for (let i = 0; i < turns; i++) {
    await flushPromises();
    await new Promise((resolve) => setTimeout(resolve, 0));
  }
}
