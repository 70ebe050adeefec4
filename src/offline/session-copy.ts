// The last session answer kept on the device, so a signed-in person opens the app without signal.
import type { SessionUser } from '@shared/schemas';
import { deviceDb } from './db';

/** Keeps who is signed in (or forgets it when nobody is); a device that refuses storage only loses the offline start. */
export async function keepSessionCopy(user: SessionUser | null): Promise<void> {
  try {
    if (user) await deviceDb().session.put({ key: 'last', user, savedAt: new Date().toISOString() });
    else await deviceDb().session.delete('last');
  } catch {
    // Private windows and full disks refuse IndexedDB; the app still works online.
  }
}

/** Who was signed in when the server last answered, or null. */
export async function readSessionCopy(): Promise<{ user: SessionUser; savedAt: string } | null> {
  try {
    const copy = await deviceDb().session.get('last');
    return copy ? { user: copy.user, savedAt: copy.savedAt } : null;
  } catch {
    return null;
  }
}
