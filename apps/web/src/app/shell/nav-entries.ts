import type { Role } from '@clearbase/contracts';
import { roles, staffRoles } from '@clearbase/contracts/values';

/** One line of the side navigation: shown only to the roles listed. */
export interface NavEntry {
  /** Stable name; the link carries `data-testid="nav-<name>"`. */
  name: string;
  label: string;
  /** A symbol name from the bundled icon font. */
  icon: string;
  path: string;
  roles: readonly Role[];
  /** Groups are drawn in this order with a divider between them. */
  group: 'work' | 'admin' | 'you';
  /** Shown only while the server runs the local fakes (the page is about them). */
  onlyWithLocalFakes?: boolean;
}

/** What the server said about itself that the menu depends on. */
export interface NavConditions {
  localFakes: boolean;
}

const everyone: readonly Role[] = roles;

/**
 * Every page of the app that exists, with who may use it. A feature adds its line here when its page lands;
 * the server checks the same roles on every route, this list only keeps the menu honest.
 */
export const navEntries: readonly NavEntry[] = [
  { name: 'home', label: 'Home', icon: 'home', path: '/', roles: everyone, group: 'work' },
  { name: 'orders', label: 'Orders', icon: 'receipt_long', path: '/orders', roles: everyone, group: 'work' },
  {
    name: 'customers',
    label: 'Customers',
    icon: 'contacts',
    path: '/customers',
    roles: staffRoles,
    group: 'work',
  },
  {
    name: 'catalogue',
    label: 'Film stocks',
    icon: 'camera_roll',
    path: '/catalogue',
    roles: everyone,
    group: 'work',
  },
  {
    name: 'scanners',
    label: 'Scanners',
    icon: 'scanner',
    path: '/scanners',
    roles: staffRoles,
    group: 'work',
  },
  {
    name: 'calibration',
    label: 'Calibration',
    icon: 'tune',
    path: '/calibration',
    roles: staffRoles,
    group: 'work',
  },
  { name: 'prices', label: 'Prices', icon: 'sell', path: '/prices', roles: everyone, group: 'work' },
  { name: 'users', label: 'Users', icon: 'group', path: '/admin/users', roles: ['admin'], group: 'admin' },
  {
    name: 'audit',
    label: 'Audit log',
    icon: 'history',
    path: '/admin/audit',
    roles: ['admin'],
    group: 'admin',
  },
  {
    name: 'outbox',
    label: 'Outbox',
    icon: 'outbox',
    path: '/admin/outbox',
    roles: ['admin'],
    group: 'admin',
  },
  {
    name: 'dev-mailbox',
    label: 'Development mailbox',
    icon: 'mail',
    path: '/dev/mailbox',
    roles: ['admin'],
    group: 'admin',
    onlyWithLocalFakes: true,
  },
  {
    name: 'account',
    label: 'Account',
    icon: 'manage_accounts',
    path: '/account',
    roles: everyone,
    group: 'you',
  },
];

/** The entries a role may see, in menu order; pages about the local fakes only while they run. */
export function navEntriesFor(
  role: Role | null,
  conditions: NavConditions = { localFakes: false },
  entries: readonly NavEntry[] = navEntries,
): NavEntry[] {
  if (role === null) return [];
  return entries.filter((e) => e.roles.includes(role) && (!e.onlyWithLocalFakes || conditions.localFakes));
}
