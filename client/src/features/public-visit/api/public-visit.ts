import type { PublicVisitAction, PublicVisitView } from '@ostium/shared';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api, ApiError } from '../../../lib/api-client';

export const publicVisitKeys = {
  all: ['public-visit'] as const,
  visit: (token: string) => [...publicVisitKeys.all, token] as const,
};

const path = (token: string) => `/public/visits/${encodeURIComponent(token)}`;

export const publicVisitQuery = (token: string) =>
  queryOptions({ queryKey: publicVisitKeys.visit(token), queryFn: ({ signal }) => api<PublicVisitView>(path(token), { signal }) });

export const usePublicVisit = (token: string) => useQuery(publicVisitQuery(token));

export function useVisitAction(token: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: PublicVisitAction) => api<PublicVisitView>(path(token), { method: 'POST', body }),
    onSuccess: (view) => qc.setQueryData(publicVisitKeys.visit(token), view),
  });
}

/** Why a link does not open a visit: it ran out, or it was never one of ours (or was changed on the way). */
export function linkProblem(e: unknown): 'expired' | 'invalid' | null {
  if (!(e instanceof ApiError)) return null;
  if (e.status === 410 || /expired/i.test(e.message)) return 'expired';
  if (e.status === 404 || e.status === 400 || e.status === 403) return 'invalid';
  return null;
}
