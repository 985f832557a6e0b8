import type { RouteObject } from 'react-router-dom';
import { RequireAccess } from '../auth/components/require-access';
import { ReminderSettingsPage } from './components/reminder-settings-page';

/** Routes of Settings → Reminders, as children of the signed-in shell route ('/') in app/router.tsx. */
export const reminderSettingsRoutes: RouteObject[] = [
  {
    path: 'settings/reminders',
    element: (
      <RequireAccess capability="reminderSettings">
        <ReminderSettingsPage />
      </RequireAccess>
    ),
  },
];
