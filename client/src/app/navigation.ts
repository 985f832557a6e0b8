import { can, type Capability, type Role } from '@ostium/shared';
import { IconHistory, IconSun, IconUsers, type Icon } from '@tabler/icons-react';

export interface NavItem {
  to: string;
  label: string;
  icon: Icon;
  /** Who sees it; the server checks the same capability on every call behind it. */
  capability?: Capability;
  section: 'work' | 'admin';
}

export const NAV_ITEMS: NavItem[] = [
  { to: '/', label: 'Today', icon: IconSun, section: 'work' },
  { to: '/admin/users', label: 'Users and roles', icon: IconUsers, capability: 'users', section: 'admin' },
  { to: '/admin/audit', label: 'Audit log', icon: IconHistory, capability: 'audit', section: 'admin' },
];

export function navFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((i) => !i.capability || can(role, i.capability));
}
