import type { Farm, Person, Role, SessionState, SessionUser } from '@shared/schemas';

// Invented scenario: a small grower co-operative with two sites.
export function makeUser(role: Role, overrides: Partial<SessionUser> = {}): SessionUser {
  return {
    id: { owner: 1, manager: 2, worker: 3, buyer: 4 }[role],
    email: `${role}@hollowbrook.test`,
    name: { owner: 'Imre Vasquez', manager: 'Dana Okafor', worker: 'Tomas Lind', buyer: 'Priya Nand' }[role],
    role,
    organisationId: 7,
    organisationName: 'Hollowbrook Growers',
    organisationCode: 'HG',
    currency: 'EUR',
    unitSystem: 'metric',
    flagMail: 'digest',
    phone: null,
    flagTexts: 'off',
    textsStoppedAt: null,
    language: null,
    farmIds: [11, 12],
    ...overrides,
  };
}

export function sessionOf(user: SessionUser | null, csrfToken = 'token-anon-0001'): SessionState {
  return { user, csrfToken };
}

export function makeFarm(id: number, name: string, overrides: Partial<Farm> = {}): Farm {
  return { id, name, timeZone: 'Europe/Lisbon', location: 'Lower valley', archivedAt: null, staleAfterDays: 3, coldCultureC: 18, frostRiskC: 2, latitude: null, longitude: null, frostAheadC: 2, ...overrides };
}

export function makePerson(id: number, name: string, role: Role, overrides: Partial<Person> = {}): Person {
  return {
    id,
    email: `${name.split(' ')[0]!.toLowerCase()}@hollowbrook.test`,
    name,
    role,
    active: true,
    invitationPending: false,
    farmIds: [],
    lastSignInAt: null,
    ...overrides,
  };
}

/** A fetch Response with a JSON body (or none for 204). */
export function jsonResponse(status: number, body?: unknown): Response {
  return new Response(body === undefined ? null : JSON.stringify(body), {
    status,
    headers: body === undefined ? {} : { 'Content-Type': 'application/json' },
  });
}
