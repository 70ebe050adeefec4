import type { OrganisationSettings, OrganisationSettingsInput } from '@shared/schemas';
import { http } from './http';

/** The signed-in person's organisation: name, code, currency and the next order number. */
export function fetchOrganisation(): Promise<OrganisationSettings> {
  return http.get<OrganisationSettings>('/api/organisation');
}

/** Owners change the organisation's code or currency. */
export function updateOrganisation(input: OrganisationSettingsInput): Promise<OrganisationSettings> {
  return http.patch<OrganisationSettings>('/api/organisation', input);
}
