import { flushPromises } from '@vue/test-utils';
import Dexie from 'dexie';
import { closeDeviceDb } from '@/offline/db';

/** Lets the fake IndexedDB (it answers on later turns of the event loop) and the promises waiting on it finish. */
export async function settleDevice(turns = 12): Promise<void> {
  for (let i = 0; i < turns; i++) {
    await flushPromises();
    await new Promise((resolve) => setTimeout(resolve, 0));
  }
}

/**
 * Starts a case on an empty device database: the last case's writes land first (so none reaches this
 * case), then the database is closed and deleted; the app opens a new one when it next needs it.
 */
export async function freshDeviceDb(): Promise<void> {
  await settleDevice();
  closeDeviceDb();
  await Dexie.delete('brimstock');
}
