import type { BookAppointmentsRequest, BookAppointmentsResponse, TimeFinderApiRequest, TimeFinderApiResponse, WaitlistEntry, WaitlistEntryInput } from '@ostium/shared';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { appointmentKeys } from '../../chair-board/api/appointments';
import { caseKeys } from '../../case-sheet/api/case-sheet';

export const timeFinderKeys = {
  all: ['time-finder'] as const,
  search: (req: TimeFinderApiRequest) => [...timeFinderKeys.all, 'search', req] as const,
};

export const waitlistKeys = {
  all: ['waitlist'] as const,
  list: () => [...waitlistKeys.all, 'list'] as const,
};

// A search reads free time, so it is a query even though it is sent as POST (the request is too rich for a URL).
export const timeFinderQuery = (req: TimeFinderApiRequest) =>
  queryOptions({ queryKey: timeFinderKeys.search(req), queryFn: () => api<TimeFinderApiResponse>('/time-finder', { method: 'POST', body: req }), staleTime: 0 });

export const useTimeFinder = (req: TimeFinderApiRequest | null) => useQuery({ ...timeFinderQuery(req ?? {}), enabled: req !== null });

/** Books one proposal; the key makes a retry (double click, lost answer) return the first booking instead of a twin. */
export function useBookProposal() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ body, idempotencyKey }: { body: BookAppointmentsRequest; idempotencyKey: string }) =>
      api<BookAppointmentsResponse>('/appointments', { method: 'POST', body, headers: { 'Idempotency-Key': idempotencyKey } }),
    onSuccess: (_r, { body }) => {
      void qc.invalidateQueries({ queryKey: appointmentKeys.lists() });
      void qc.invalidateQueries({ queryKey: caseKeys.detail(body.caseId) });
      void qc.invalidateQueries({ queryKey: ['referrals'] });
      void qc.invalidateQueries({ queryKey: ['chairside'] });
    },
    // Taken or not, the free time has changed: the proposals must be asked for again.
    onError: () => void qc.invalidateQueries({ queryKey: timeFinderKeys.all }),
  });
}

export function useAddToWaitlist() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: WaitlistEntryInput) => api<WaitlistEntry>('/waitlist', { method: 'POST', body }),
    onSuccess: () => void qc.invalidateQueries({ queryKey: waitlistKeys.all }),
  });
}
