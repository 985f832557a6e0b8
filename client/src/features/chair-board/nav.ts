import { IconCalendarTime, IconClipboardList, IconBuildingHospital } from '@tabler/icons-react';
import type { NavItem } from '../../app/navigation';

/** Navigation of scheduling (finding times opens from a case sheet, so it has no item). */
export const chairBoardNavItems: NavItem[] = [
  { to: '/board', label: 'Chair board', icon: IconCalendarTime, capability: 'schedule', section: 'work' },
  { to: '/chairside', label: 'Chairside list', icon: IconClipboardList, capability: 'chairside', section: 'work' },
  { to: '/settings/resources', label: 'Resources', icon: IconBuildingHospital, capability: 'settings', section: 'admin' },
];
