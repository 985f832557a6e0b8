import { IconMessages } from '@tabler/icons-react';
import type { NavItem } from '../../app/navigation';

/** Navigation of the front desk's inbox. */
export const repliesNavItems: NavItem[] = [{ to: '/replies', label: 'Replies', icon: IconMessages, capability: 'replies', section: 'work' }];
