import { ROLES, type Role } from '@shared/schemas';

/** The menus of the main navigation: the buyer's screens, and the screens that set the organisation up. */
export const NAV_GROUPS = {
  buying: { key: 'buying', labelKey: 'app.nav.groups.buying', icon: 'pi pi-shopping-bag' },
  setup: { key: 'setup', labelKey: 'app.nav.groups.setup', icon: 'pi pi-cog' },
} as const;
/** A menu of the main navigation. */
export type NavGroupKey = keyof typeof NAV_GROUPS;
export type NavGroup = (typeof NAV_GROUPS)[NavGroupKey];

/** One entry of the main navigation; a later screen is one more line in NAV_ITEMS. */
export interface NavItem {
  /** Route name; also the data-testid suffix (`nav-<name>`). */
  name: string;
  to: string;
  /** Message key of the entry's name (app.nav.items.*). */
  labelKey: string;
  /** PrimeIcons class. */
  icon: string;
  roles: readonly Role[];
  /** Message key of one line for the home page's list of screens. */
  descriptionKey: string;
  /** The menu it sits in on a wide screen (none: a link of its own). */
  group?: NavGroupKey;
  /** The person's own page: reached from their name beside Sign out. */
  account?: true;
}

const EVERYONE = ROLES;

export const NAV_ITEMS: readonly NavItem[] = [
  // Both entries are the `/` route: owners, managers and buyers see the stock board there, workers Home.
  { name: 'home', to: '/', labelKey: 'app.nav.items.board.label', icon: 'pi pi-gauge', roles: ['owner', 'manager', 'buyer'], descriptionKey: 'app.nav.items.board.description' },
  { name: 'home', to: '/', labelKey: 'app.nav.items.home.label', icon: 'pi pi-home', roles: ['worker'], descriptionKey: 'app.nav.items.home.description' },
  { name: 'round', to: '/round', labelKey: 'app.nav.items.round.label', icon: 'pi pi-list-check', roles: ['owner', 'manager', 'worker'], descriptionKey: 'app.nav.items.round.description' },
  { name: 'imports', to: '/imports', labelKey: 'app.nav.items.imports.label', icon: 'pi pi-file-import', roles: ['owner', 'manager', 'worker'], descriptionKey: 'app.nav.items.imports.description' },
  { name: 'brews', to: '/brews', labelKey: 'app.nav.items.brews.label', icon: 'pi pi-filter', roles: ['owner', 'manager', 'worker'], descriptionKey: 'app.nav.items.brews.description' },
  { name: 'flags', to: '/flags', labelKey: 'app.nav.items.flags.label', icon: 'pi pi-flag', roles: EVERYONE, descriptionKey: 'app.nav.items.flags.description' },
  { name: 'inputs', to: '/inputs', labelKey: 'app.nav.items.inputs.label', icon: 'pi pi-box', roles: EVERYONE, group: 'buying', descriptionKey: 'app.nav.items.inputs.description' },
  { name: 'orders', to: '/orders', labelKey: 'app.nav.items.orders.label', icon: 'pi pi-shopping-cart', roles: ['owner', 'manager', 'buyer'], group: 'buying', descriptionKey: 'app.nav.items.orders.description' },
  { name: 'suppliers', to: '/suppliers', labelKey: 'app.nav.items.suppliers.label', icon: 'pi pi-truck', roles: ['owner', 'manager', 'buyer'], group: 'buying', descriptionKey: 'app.nav.items.suppliers.description' },
  { name: 'farms', to: '/farms', labelKey: 'app.nav.items.farms.label', icon: 'pi pi-map-marker', roles: EVERYONE, group: 'setup', descriptionKey: 'app.nav.items.farms.description' },
  { name: 'people', to: '/people', labelKey: 'app.nav.items.people.label', icon: 'pi pi-users', roles: ['owner'], group: 'setup', descriptionKey: 'app.nav.items.people.description' },
  { name: 'outbox', to: '/outbox', labelKey: 'app.nav.items.outbox.label', icon: 'pi pi-envelope', roles: ['owner', 'manager', 'buyer'], group: 'setup', descriptionKey: 'app.nav.items.outbox.description' },
  { name: 'profile', to: '/profile', labelKey: 'app.nav.items.profile.label', icon: 'pi pi-user', roles: EVERYONE, account: true, descriptionKey: 'app.nav.items.profile.description' },
];

/** The navigation entries a role may use, in menu order. */
export function navItemsFor(role: Role | null | undefined): NavItem[] {
  if (!role) return [];
  return NAV_ITEMS.filter((item) => item.roles.includes(role));
}

/** A place on the wide navigation bar: a link, or a menu of links. */
export type NavEntry = { kind: 'link'; item: NavItem } | { kind: 'group'; group: NavGroup; items: NavItem[] };

/**
 * The wide bar's entries for a role, in menu order, without the person's own page: each group where
 * its first screen stands, and a group the role has one screen of as a plain link to it.
 */
export function navEntriesFor(role: Role | null | undefined): NavEntry[] {
  const items = navItemsFor(role).filter((item) => !item.account);
  const entries: NavEntry[] = [];
  for (const item of items) {
    if (!item.group) {
      entries.push({ kind: 'link', item });
      continue;
    }
    if (entries.some((e) => e.kind === 'group' && e.group.key === item.group)) continue;
    const members = items.filter((other) => other.group === item.group);
    entries.push(members.length > 1 ? { kind: 'group', group: NAV_GROUPS[item.group], items: members } : { kind: 'link', item });
  }
  return entries;
}

/** True when `path` is the item's screen or one of its pages (a farm under Farms). */
export function isCurrentNav(item: NavItem, path: string): boolean {
  if (item.to === '/') return path === '/';
  return path === item.to || path.startsWith(`${item.to}/`);
}
