import type { CaseSheet, UpdateCaseSheetRequest } from '@ostium/shared';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export const caseKeys = {
  all: ['cases'] as const,
  detail: (id: number) => [...caseKeys.all, 'detail', id] as const,
};

export const caseSheetQuery = (id: number) => queryOptions({ queryKey: caseKeys.detail(id), queryFn: () => api<CaseSheet>(`/cases/${id}`) });

export const useCaseSheet = (id: number) => useQuery(caseSheetQuery(id));

export function useUpdateCaseSheet(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: UpdateCaseSheetRequest) => api<CaseSheet>(`/cases/${id}`, { method: 'PATCH', body }),
    onSuccess: (sheet) => {
      qc.setQueryData(caseKeys.detail(id), sheet);
      // The referral's status moves to planned; lists showing it must ask again.
      void qc.invalidateQueries({ queryKey: ['referrals'] });
    },
  });
}
