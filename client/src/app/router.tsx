import { createBrowserRouter, Navigate } from 'react-router-dom';
import { AuditPage } from '../features/audit/components/audit-page';
import { RequireAccess } from '../features/auth/components/require-access';
import { SignInPage } from '../features/auth/components/sign-in-page';
import { TodayPage } from '../features/home/components/today-page';
import { UsersPage } from '../features/users/components/users-page';
import { Shell } from './shell';

export const routes = [
  { path: '/sign-in', element: <SignInPage /> },
  {
    path: '/',
    element: (
      <RequireAccess>
        <Shell />
      </RequireAccess>
    ),
    children: [
      { index: true, element: <TodayPage /> },
      { path: 'admin/users', element: <RequireAccess capability="users"><UsersPage /></RequireAccess> },
      { path: 'admin/audit', element: <RequireAccess capability="audit"><AuditPage /></RequireAccess> },
      { path: '*', element: <Navigate to="/" replace /> },
    ],
  },
];

export const createRouter = () => createBrowserRouter(routes);
