import type { Appointment, AppointmentQuery, UpdateAppointmentRequest } from '@ostium/shared';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export const appointmentKeys = {
  all: ['appointments'] as const,
  lists: () => [...appointmentKeys.all, 'list'] as const,
  list: (q: AppointmentQuery) => [...appointmentKeys.lists(), q] as const,
};

export const appointmentsQuery = (q: AppointmentQuery) =>
  queryOptions({
    queryKey: appointmentKeys.list(q),
    queryFn: () => api<Appointment[]>('/appointments', { query: { ...q } }),
    // The board is shared by the whole front desk; a minute-old view is the most we tolerate.
    staleTime: 15_000,
    refetchInterval: 60_000,
  });

export const useAppointments = (q: AppointmentQuery | null) => useQuery({ ...appointmentsQuery(q ?? { from: '', to: '' }), enabled: q !== null });

/** Replaces one appointment in every cached list, so all chair columns show the server's answer at once. */
export function putAppointmentInLists(lists: Appointment[] | undefined, next: Appointment): Appointment[] | undefined {
  if (!lists) return lists;
  return lists.some((a) => a.id === next.id) ? lists.map((a) => (a.id === next.id ? next : a)) : lists;
}

export function useUpdateAppointment() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: number; body: UpdateAppointmentRequest }) => api<Appointment>(`/appointments/${id}`, { method: 'PATCH', body }),
    onSuccess: (next) => {
      qc.setQueriesData<Appointment[]>({ queryKey: appointmentKeys.lists() }, (lists) => putAppointmentInLists(lists, next));
    },
    // Refused or not, someone else may have changed the day: read it again.
    onSettled: () => {
      void qc.invalidateQueries({ queryKey: appointmentKeys.lists() });
      void qc.invalidateQueries({ queryKey: ['chairside'] });
    },
  });
}
