import { ROLES, type Role } from '@shared/schemas';

/** Display name of each role. */
export const ROLE_LABELS: Record<Role, string> = {
  owner: 'Owner',
  manager: 'Manager',
  worker: 'Worker',
  buyer: 'Buyer',
};

/** What each role does, in one line for pickers and the home page. */
export const ROLE_DESCRIPTIONS: Record<Role, string> = {
  owner: 'Everything, plus people, roles and farm access.',
  manager: 'Sets up farms and tanks, watches stock on every farm.',
  worker: 'Reads sight tubes, uploads logger files, logs brews on their farms.',
  buyer: 'Keeps purchased inputs stocked: reorder points and orders.',
};

/** Roles that see every farm of the organisation, whatever their farm access list says. */
export const ALL_FARM_ROLES: readonly Role[] = ['owner', 'manager'];

/** Whether a role's farm access is a chosen list (worker, buyer) rather than every farm. */
export function roleHasFarmList(role: Role): boolean {
  return !ALL_FARM_ROLES.includes(role);
}

/** Options for a role picker. */
export const ROLE_OPTIONS = ROLES.map((role) => ({ value: role, label: ROLE_LABELS[role], description: ROLE_DESCRIPTIONS[role] }));
