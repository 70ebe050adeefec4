import type { InvitationInput, Person, PersonUpdateInput } from '@shared/schemas';
import { http } from './http';

/** Everyone in the organisation (owners only). */
export function fetchPeople(): Promise<Person[]> {
  return http.get<Person[]>('/api/people');
}

/** Invites a person; the server mails them a set-password link. */
export function invitePerson(input: InvitationInput): Promise<Person> {
  return http.post<Person>('/api/invitations', input);
}

/** Sends the invitation mail again. */
export function resendInvitation(personId: number): Promise<void> {
  return http.post<void>(`/api/people/${personId}/invitation`);
}

/** Changes role, farm access or active state. */
export function updatePerson(personId: number, input: PersonUpdateInput): Promise<Person> {
  return http.patch<Person>(`/api/people/${personId}`, input);
}
