import { ROLES, type Role } from '@shared/schemas';
import { i18n } from '@/i18n';

// Read when shown (each entry is a getter), so a change of language shows at once.
function wordsOf(area: 'roles' | 'roleDescriptions'): Record<Role, string> {
  const out = {} as Record<Role, string>;
  for (const role of ROLES) Object.defineProperty(out, role, { enumerable: true, get: () => i18n.global.t(`words.${area}.${role}`) });
  return out;
}

/** Display name of each role, in the screens' language. */
export const ROLE_LABELS: Readonly<Record<Role, string>> = wordsOf('roles');

/** What each role does, in one line for pickers and the home page. */
export const ROLE_DESCRIPTIONS: Readonly<Record<Role, string>> = wordsOf('roleDescriptions');

/** Roles that see every farm of the organisation, whatever their farm access list says. */
export const ALL_FARM_ROLES: readonly Role[] = ['owner', 'manager'];

/** Whether a role's farm access is a chosen list (worker, buyer) rather than every farm. */
export function roleHasFarmList(role: Role): boolean {
  return !ALL_FARM_ROLES.includes(role);
}

/** Options for a role picker (label and description read in the screens' language when shown). */
export const ROLE_OPTIONS: { readonly value: Role; readonly label: string; readonly description: string }[] = ROLES.map((role) => ({
  value: role,
  get label() {
    return ROLE_LABELS[role];
  },
  get description() {
    return ROLE_DESCRIPTIONS[role];
  },
}));
