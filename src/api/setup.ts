import type { FirstOwnerInput, SessionState, SessionUser, SetupState } from '@shared/schemas';
import { http } from './http';

/** Whether this server still needs its first owner (it holds no organisation yet). */
export function fetchSetupState(): Promise<SetupState> {
  return http.get<SetupState>('/api/setup');
}

/** Uses the set-up link printed in the server's console: makes the organisation and its owner, who is signed in. */
export function createFirstOwner(input: FirstOwnerInput): Promise<SessionState & { user: SessionUser }> {
  return http.post('/api/setup/first-owner', input);
}
