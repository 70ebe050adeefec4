import { ROLES, type Role } from '@shared/schemas';

/** The menus of the main navigation: the buyer's screens, and the screens that set the organisation up. */
export const NAV_GROUPS = {
  buying: { key: 'buying', label: 'Buying', icon: 'pi pi-shopping-bag' },
  setup: { key: 'setup', label: 'Set-up', icon: 'pi pi-cog' },
} as const;
/** A menu of the main navigation. */
export type NavGroupKey = keyof typeof NAV_GROUPS;
export type NavGroup = (typeof NAV_GROUPS)[NavGroupKey];

/** One entry of the main navigation; a later screen is one more line in NAV_ITEMS. */
export interface NavItem {
  /** Route name; also the data-testid suffix (`nav-<name>`). */
  name: string;
  to: string;
  label: string;
  /** PrimeIcons class. */
  icon: string;
  roles: readonly Role[];
  /** One line for the home page's list of screens. */
  description: string;
  /** The menu it sits in on a wide screen (none: a link of its own). */
  group?: NavGroupKey;
  /** The person's own page: reached from their name beside Sign out. */
  account?: true;
}

const EVERYONE = ROLES;

export const NAV_ITEMS: readonly NavItem[] = [
  // Both entries are the `/` route: owners, managers and buyers see the stock board there, workers Home.
  { name: 'home', to: '/', label: 'Stock board', icon: 'pi pi-gauge', roles: ['owner', 'manager', 'buyer'], description: 'Live stock of every tank on every farm.' },
  { name: 'home', to: '/', label: 'Home', icon: 'pi pi-home', roles: ['worker'], description: 'Your farms at a glance.' },
  { name: 'round', to: '/round', label: 'Round', icon: 'pi pi-list-check', roles: ['owner', 'manager', 'worker'], description: 'Walk the tanks of a farm and type each sight-tube reading.' },
  { name: 'imports', to: '/imports', label: 'Logger files', icon: 'pi pi-file-import', roles: ['owner', 'manager', 'worker'], description: 'Upload level-logger CSV files, check their columns and import them.' },
  { name: 'brews', to: '/brews', label: 'Brews', icon: 'pi pi-filter', roles: ['owner', 'manager', 'worker'], description: 'Log batches of culture, fertilizer and pest solution, with the mixing calculator.' },
  { name: 'flags', to: '/flags', label: 'Flags', icon: 'pi pi-flag', roles: EVERYONE, description: 'Everything that needs a person: low stock, leaks, cold cultures, frost and more.' },
  { name: 'inputs', to: '/inputs', label: 'Inputs', icon: 'pi pi-box', roles: EVERYONE, group: 'buying', description: 'Purchased inputs: stock, days of cover and when to reorder.' },
  { name: 'orders', to: '/orders', label: 'Orders', icon: 'pi pi-shopping-cart', roles: ['owner', 'manager', 'buyer'], group: 'buying', description: 'Purchase orders: draft, send to suppliers, book deliveries in.' },
  { name: 'suppliers', to: '/suppliers', label: 'Suppliers', icon: 'pi pi-truck', roles: ['owner', 'manager', 'buyer'], group: 'buying', description: 'Who you buy from, their contacts and lead times.' },
  { name: 'farms', to: '/farms', label: 'Farms', icon: 'pi pi-map-marker', roles: EVERYONE, group: 'setup', description: 'The farms and sites you work on.' },
  { name: 'people', to: '/people', label: 'People', icon: 'pi pi-users', roles: ['owner'], group: 'setup', description: 'Invite people, set roles and farm access.' },
  { name: 'outbox', to: '/outbox', label: 'Outbox (dev)', icon: 'pi pi-envelope', roles: ['owner', 'manager', 'buyer'], group: 'setup', description: 'Mail and text messages the development server captured for your organisation.' },
  { name: 'profile', to: '/profile', label: 'Profile', icon: 'pi pi-user', roles: EVERYONE, account: true, description: 'Your name and the units you see.' },
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
