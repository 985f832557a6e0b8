import { IconReportAnalytics } from '@tabler/icons-react';
import type { NavItem } from '../../app/navigation';

/** Navigation of the manager's reports. */
export const chairUseNavItems: NavItem[] = [{ to: '/reports/chair-use', label: 'Chair use', icon: IconReportAnalytics, capability: 'reports', section: 'work' }];
