import { ROLES, type Role } from '@shared/schemas';

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
}

const EVERYONE = ROLES;

export const NAV_ITEMS: readonly NavItem[] = [
  // Both entries are the `/` route: owners, managers and buyers see the stock board there, workers Home.
  { name: 'home', to: '/', label: 'Stock board', icon: 'pi pi-gauge', roles: ['owner', 'manager', 'buyer'], description: 'Live stock of every tank on every farm.' },
  { name: 'home', to: '/', label: 'Home', icon: 'pi pi-home', roles: ['worker'], description: 'Your farms at a glance.' },
  { name: 'round', to: '/round', label: 'Round', icon: 'pi pi-list-check', roles: ['owner', 'manager', 'worker'], description: 'Walk the tanks of a farm and type each sight-tube reading.' },
  { name: 'imports', to: '/imports', label: 'Logger files', icon: 'pi pi-file-import', roles: ['owner', 'manager', 'worker'], description: 'Upload level-logger CSV files, check their columns and import them.' },
  { name: 'farms', to: '/farms', label: 'Farms', icon: 'pi pi-map-marker', roles: EVERYONE, description: 'The farms and sites you work on.' },
  { name: 'inputs', to: '/inputs', label: 'Inputs', icon: 'pi pi-box', roles: EVERYONE, description: 'Purchased inputs: stock, days of cover and when to reorder.' },
  { name: 'orders', to: '/orders', label: 'Orders', icon: 'pi pi-shopping-cart', roles: ['owner', 'manager', 'buyer'], description: 'Purchase orders: draft, send to suppliers, book deliveries in.' },
  { name: 'suppliers', to: '/suppliers', label: 'Suppliers', icon: 'pi pi-truck', roles: ['owner', 'manager', 'buyer'], description: 'Who you buy from, their contacts and lead times.' },
  { name: 'brews', to: '/brews', label: 'Brews', icon: 'pi pi-filter', roles: ['owner', 'manager', 'worker'], description: 'Log batches of culture, fertilizer and pest solution, with the mixing calculator.' },
  { name: 'flags', to: '/flags', label: 'Flags', icon: 'pi pi-flag', roles: EVERYONE, description: 'Everything that needs a person: low stock, leaks, cold cultures, frost and more.' },
  { name: 'people', to: '/people', label: 'People', icon: 'pi pi-users', roles: ['owner'], description: 'Invite people, set roles and farm access.' },
  { name: 'outbox', to: '/outbox', label: 'Outbox (dev)', icon: 'pi pi-envelope', roles: ['owner', 'manager', 'buyer'], description: 'Mail the development server captured for your organisation.' },
  { name: 'profile', to: '/profile', label: 'Profile', icon: 'pi pi-user', roles: EVERYONE, description: 'Your name and the units you see.' },
];

/** The navigation entries a role may use, in menu order. */
export function navItemsFor(role: Role | null | undefined): NavItem[] {
  if (!role) return [];
  return NAV_ITEMS.filter((item) => item.roles.includes(role));
}
