import type { RouteObject } from 'react-router-dom';
import { PublicVisitPage } from './components/public-visit-page';

/** The public visit page opened from a reminder's link: outside the signed-in shell, no sign-in. */
export const publicVisitRoutes: RouteObject[] = [{ path: '/v/:token', element: <PublicVisitPage /> }];
