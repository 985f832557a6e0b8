import type { ChangeReferralStatusRequest, CreateReferralRequest, Referral, ReferralQuery, ReferralQueuePage } from '@ostium/shared';
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export const referralKeys = {
  all: ['referrals'] as const,
  lists: () => [...referralKeys.all, 'list'] as const,
  list: (q: ReferralQuery) => [...referralKeys.lists(), q] as const,
  detail: (id: number) => [...referralKeys.all, 'detail', id] as const,
};

/** The query string the server reads; several statuses travel comma-separated. */
export function referralQueryString(q: ReferralQuery): Record<string, string | number | undefined> {
  return {
    status: Array.isArray(q.status) ? q.status.join(',') || undefined : q.status,
    urgency: q.urgency,
    referringDentistId: q.referringDentistId,
    locationId: q.locationId,
    from: q.from,
    to: q.to,
    q: q.q,
    sort: q.sort,
    order: q.order,
    page: q.page,
    pageSize: q.pageSize,
  };
}

export const referralQueueQuery = (q: ReferralQuery) =>
  queryOptions({
    queryKey: referralKeys.list(q),
    queryFn: ({ signal }) => api<ReferralQueuePage>('/referrals', { query: referralQueryString(q), signal }),
    placeholderData: keepPreviousData,
  });

export const useReferralQueue = (q: ReferralQuery) => useQuery(referralQueueQuery(q));

export const referralQuery = (id: number) =>
  queryOptions({ queryKey: referralKeys.detail(id), queryFn: ({ signal }) => api<Referral>(`/referrals/${id}`, { signal }) });

export const useReferral = (id: number) => useQuery(referralQuery(id));

export function useCreateReferral() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateReferralRequest) => api<Referral>('/referrals', { method: 'POST', body }),
    onSuccess: (created) => {
      // The page we go to next can show the answer at once.
      qc.setQueryData(referralKeys.detail(created.id), created);
      void qc.invalidateQueries({ queryKey: referralKeys.lists() });
    },
  });
}

export function useChangeReferralStatus(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: ChangeReferralStatusRequest) => api<Referral>(`/referrals/${id}/status`, { method: 'PATCH', body }),
    onSuccess: (updated) => {
      qc.setQueryData(referralKeys.detail(id), updated);
      void qc.invalidateQueries({ queryKey: referralKeys.lists() });
    },
  });
}
