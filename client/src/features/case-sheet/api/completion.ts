import type { CaseCompletionView, CompleteCaseRequest } from '@ostium/shared';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api, openBlobInNewTab } from '../../../lib/api-client';
import { caseKeys } from './case-sheet';

export const completionKeys = {
  detail: (caseId: number) => [...caseKeys.detail(caseId), 'completion'] as const,
};

export const completionQuery = (caseId: number) =>
  queryOptions({
    queryKey: completionKeys.detail(caseId),
    queryFn: ({ signal }) => api<CaseCompletionView>(`/cases/${caseId}/completion`, { signal }),
    // A queued report becomes sent (or failed) a moment later; ask again while one is on its way.
    refetchInterval: (q) => (q.state.data?.completion?.report?.status === 'queued' ? 2_000 : false),
  });

export const useCompletion = (caseId: number) => useQuery(completionQuery(caseId));

export function useCompleteCase(caseId: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: CompleteCaseRequest) => api<CaseCompletionView>(`/cases/${caseId}/completion`, { method: 'POST', body }),
    onSuccess: (view) => {
      qc.setQueryData(completionKeys.detail(caseId), view);
      // The case and its referral are completed now; their pages and lists must ask again.
      void qc.invalidateQueries({ queryKey: caseKeys.detail(caseId), exact: true });
      void qc.invalidateQueries({ queryKey: ['referrals'] });
    },
  });
}

export const letterPdfPath = (letterId: number) => `/letters/${letterId}/pdf`;

/** Opens the report's PDF in a new tab. */
export const openLetterPdf = (letterId: number): Promise<void> => openBlobInNewTab(letterPdfPath(letterId));
