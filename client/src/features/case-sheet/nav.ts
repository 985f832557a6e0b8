import { IconChartBar, IconTable } from '@tabler/icons-react';
import type { NavItem } from '../../app/navigation';

/** Navigation of the estimate screens (the case sheet itself opens from a referral, so it has no item). */
export const caseSheetNavItems: NavItem[] = [
  { to: '/estimates/accuracy', label: 'Estimate accuracy', icon: IconChartBar, capability: 'estimateAccuracy', section: 'work' },
  { to: '/settings/estimate-table', label: 'Estimate table', icon: IconTable, capability: 'settings', section: 'admin' },
];
