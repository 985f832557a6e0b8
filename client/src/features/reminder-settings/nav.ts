import { IconBellRinging } from '@tabler/icons-react';
import type { NavItem } from '../../app/navigation';

/** Settings → Reminders sits with the other settings pages in the administration section. */
export const reminderSettingsNavItems: NavItem[] = [{ to: '/settings/reminders', label: 'Reminders', icon: IconBellRinging, capability: 'reminderSettings', section: 'admin' }];
