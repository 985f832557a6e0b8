import type { RouteObject } from 'react-router-dom';
import { RequireAccess } from '../auth/components/require-access';
import { RepliesPage } from './components/replies-page';

/** Routes of Replies, as children of the signed-in shell route ('/') in app/router.tsx. */
export const repliesRoutes: RouteObject[] = [
  {
    path: 'replies',
    element: (
      <RequireAccess capability="replies">
        <RepliesPage />
      </RequireAccess>
    ),
  },
];
