import type { RouteObject } from 'react-router-dom';
import { RequireAccess } from '../auth/components/require-access';
import { AccuracyPage } from '../estimate-accuracy/components/accuracy-page';
import { EstimateTablePage } from '../estimate-settings/components/estimate-table-page';
import { CaseSheetPage } from './components/case-sheet-page';

/**
 * Routes of the case sheet, the estimate table and the accuracy report, as children of the signed-in
 * shell route ('/') in app/router.tsx.
 */
export const caseSheetRoutes: RouteObject[] = [
  {
    path: 'cases/:id',
    element: (
      <RequireAccess capability="cases">
        <CaseSheetPage />
      </RequireAccess>
    ),
  },
  {
    path: 'settings/estimate-table',
    element: (
      <RequireAccess capability="settings">
        <EstimateTablePage />
      </RequireAccess>
    ),
  },
  {
    path: 'estimates/accuracy',
    element: (
      <RequireAccess capability="estimateAccuracy">
        <AccuracyPage />
      </RequireAccess>
    ),
  },
];
