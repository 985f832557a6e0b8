import { createBrowserRouter, Navigate } from 'react-router-dom';
import { AuditPage } from '../features/audit/components/audit-page';
import { RequireAccess } from '../features/auth/components/require-access';
import { SignInPage } from '../features/auth/components/sign-in-page';
import { PatientsPage } from '../features/directory/components/patients-page';
import { ReferringDentistsPage } from '../features/directory/components/referring-dentists-page';
import { TodayPage } from '../features/home/components/today-page';
import { IntakePage } from '../features/intake/components/intake-page';
import { ReferralPage } from '../features/referrals/components/referral-page';
import { ReferralQueuePage } from '../features/referrals/components/referral-queue-page';
import { UsersPage } from '../features/users/components/users-page';
import { caseSheetRoutes } from '../features/case-sheet/routes';
import { chairBoardRoutes } from '../features/chair-board/routes';
import { publicVisitRoutes } from '../features/public-visit/routes';
import { reminderSettingsRoutes } from '../features/reminder-settings/routes';
import { repliesRoutes } from '../features/replies/routes';
import { chairUseRoutes } from '../features/chair-use/routes';
import { Shell } from './shell';

export const routes = [
  { path: '/sign-in', element: <SignInPage /> },
  ...publicVisitRoutes,
  {
    path: '/',
    element: (
      <RequireAccess>
        <Shell />
      </RequireAccess>
    ),
    children: [
      { index: true, element: <TodayPage /> },
      { path: 'intake', element: <RequireAccess capability="referralsWrite"><IntakePage /></RequireAccess> },
      { path: 'referrals', element: <RequireAccess capability="referralsRead"><ReferralQueuePage /></RequireAccess> },
      { path: 'referrals/:id', element: <RequireAccess capability="referralsRead"><ReferralPage /></RequireAccess> },
      { path: 'referring-dentists', element: <RequireAccess capability="referralsRead"><ReferringDentistsPage /></RequireAccess> },
      { path: 'patients', element: <RequireAccess capability="referralsRead"><PatientsPage /></RequireAccess> },
      { path: 'admin/users', element: <RequireAccess capability="users"><UsersPage /></RequireAccess> },
      { path: 'admin/audit', element: <RequireAccess capability="audit"><AuditPage /></RequireAccess> },
      ...caseSheetRoutes,
      ...chairBoardRoutes,
      ...repliesRoutes,
      ...reminderSettingsRoutes,
      ...chairUseRoutes,
      { path: '*', element: <Navigate to="/" replace /> },
    ],
  },
];

export const createRouter = () => createBrowserRouter(routes);
