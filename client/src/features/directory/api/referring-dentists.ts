import type { MergeReferringDentistsRequest, ReferringDentist } from '@ostium/shared';
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export interface ReferringDentistFilters {
  /** Name, practice, e-mail or phone. */
  q?: string;
  /** At most this many rows (the server's default is 50, its ceiling 200). */
  limit?: number;
}

export const referringDentistKeys = {
  all: ['referring-dentists'] as const,
  list: (f: ReferringDentistFilters) => [...referringDentistKeys.all, 'list', f] as const,
};

export const referringDentistsQuery = (f: ReferringDentistFilters) =>
  queryOptions({
    queryKey: referringDentistKeys.list(f),
    queryFn: ({ signal }) => api<ReferringDentist[]>('/referring-dentists', { query: { q: f.q, limit: f.limit }, signal }),
    placeholderData: keepPreviousData,
  });

export const useReferringDentists = (f: ReferringDentistFilters, enabled = true) => useQuery({ ...referringDentistsQuery(f), enabled });

/** Keeps `keepId`; the other record's referrals move to it and the other record goes. */
export function useMergeReferringDentists() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ keepId, otherId }: { keepId: number } & MergeReferringDentistsRequest) =>
      api<ReferringDentist>(`/referring-dentists/${keepId}/merge`, { method: 'POST', body: { otherId } satisfies MergeReferringDentistsRequest }),
    onSuccess: () => qc.invalidateQueries({ queryKey: referringDentistKeys.all }),
  });
}
