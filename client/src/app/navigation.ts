import { can, type Capability, type Role } from '@ostium/shared';
import { caseSheetNavItems } from '../features/case-sheet/nav';
import { chairBoardNavItems } from '../features/chair-board/nav';
import { reminderSettingsNavItems } from '../features/reminder-settings/nav';
import { repliesNavItems } from '../features/replies/nav';
import { chairUseNavItems } from '../features/chair-use/nav';
import { IconAddressBook, IconFilePlus, IconHistory, IconListDetails, IconSun, IconUserHeart, IconUsers, type Icon } from '@tabler/icons-react';

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
  { to: '/intake', label: 'Intake', icon: IconFilePlus, capability: 'referralsWrite', section: 'work' },
  { to: '/referrals', label: 'Referral queue', icon: IconListDetails, capability: 'referralsRead', section: 'work' },
  { to: '/referring-dentists', label: 'Referring dentists', icon: IconAddressBook, capability: 'referralsRead', section: 'work' },
  { to: '/patients', label: 'Patients', icon: IconUserHeart, capability: 'referralsRead', section: 'work' },
  ...chairBoardNavItems.filter((i) => i.section === 'work'),
  ...caseSheetNavItems.filter((i) => i.section === 'work'),
  ...repliesNavItems.filter((i) => i.section === 'work'),
  ...chairUseNavItems,
  { to: '/admin/users', label: 'Users and roles', icon: IconUsers, capability: 'users', section: 'admin' },
  { to: '/admin/audit', label: 'Audit log', icon: IconHistory, capability: 'audit', section: 'admin' },
  ...chairBoardNavItems.filter((i) => i.section === 'admin'),
  ...caseSheetNavItems.filter((i) => i.section === 'admin'),
  ...reminderSettingsNavItems.filter((i) => i.section === 'admin'),
];

export function navFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((i) => !i.capability || can(role, i.capability));
}
