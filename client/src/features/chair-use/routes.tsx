import type { RouteObject } from 'react-router-dom';
import { RequireAccess } from '../auth/components/require-access';
import { ChairUsePage } from './components/chair-use-page';

/** Routes of the manager's reports, as children of the signed-in shell route ('/') in app/router.tsx. */
export const chairUseRoutes: RouteObject[] = [
  {
    path: 'reports/chair-use',
    element: (
      <RequireAccess capability="reports">
        <ChairUsePage />
      </RequireAccess>
    ),
  },
];
