import type { ProfileInput, SessionState, SessionUser, SetPasswordInput, SignInInput, TextFailure, TokenInfo } from '@shared/schemas';
import { http } from './http';

/** Who is signed in (or null) and the CSRF token for writes. */
export function fetchSession(): Promise<SessionState> {
  return http.get<SessionState>('/api/auth/session');
}

/** Signs in; the response carries the new session's CSRF token. */
export function signIn(input: SignInInput): Promise<SessionState & { user: SessionUser }> {
  return http.post('/api/auth/sign-in', input);
}

/** Ends the session on the server. */
export function signOut(): Promise<void> {
  return http.post<void>('/api/auth/sign-out');
}

/** Saves the signed-in user's own name and unit system. */
export function updateProfile(input: ProfileInput): Promise<SessionUser> {
  return http.patch<SessionUser>('/api/auth/me', input);
}

/** The signed-in person's flag texts of the last 7 days that failed after every attempt, newest first. */
export async function fetchTextFailures(): Promise<TextFailure[]> {
  return (await http.get<{ failures: TextFailure[] }>('/api/auth/me/text-failures')).failures;
}

/** Asks for a reset link; the server answers the same whether the address exists or not. */
export function requestPasswordReset(email: string): Promise<void> {
  return http.post<void>('/api/auth/password-reset', { email });
}

/** What an invitation or reset link is for. */
export function fetchTokenInfo(token: string): Promise<TokenInfo> {
  return http.get<TokenInfo>(`/api/auth/tokens/${encodeURIComponent(token)}`);
}

/** Sets a password from a link; the user is signed in afterwards. */
export function setPassword(input: SetPasswordInput): Promise<SessionState & { user: SessionUser }> {
  return http.post('/api/auth/set-password', input);
}
