import type { RouteObject } from 'react-router-dom';
import { RequireAccess } from '../auth/components/require-access';
import { ChairsidePage } from '../chairside/components/chairside-page';
import { ResourcesPage } from '../resources/components/resources-page';
import { FindTimesPage } from '../time-finder/components/find-times-page';
import { BoardPage } from './components/board-page';

/**
 * Routes of scheduling: the Chair board, finding times for a case, the chairside list and the resources
 * admin, as children of the signed-in shell route ('/') in app/router.tsx.
 */
export const chairBoardRoutes: RouteObject[] = [
  {
    path: 'board',
    element: (
      <RequireAccess capability="schedule">
        <BoardPage />
      </RequireAccess>
    ),
  },
  {
    path: 'cases/:id/find-times',
    element: (
      <RequireAccess capability="schedule">
        <FindTimesPage />
      </RequireAccess>
    ),
  },
  {
    path: 'chairside',
    element: (
      <RequireAccess capability="chairside">
        <ChairsidePage />
      </RequireAccess>
    ),
  },
  {
    path: 'settings/resources',
    element: (
      <RequireAccess capability="settings">
        <ResourcesPage />
      </RequireAccess>
    ),
  },
];
