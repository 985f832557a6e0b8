import type { WaitlistEntry } from '@ostium/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export const waitlistFitsKeys = {
  // Under ['waitlist'] so adding someone to the waitlist (time finder) refreshes this too.
  fits: (appointmentId: number) => ['waitlist', 'fits', appointmentId] as const,
};

/** Waitlisted cases that fit the time a cancelled appointment freed, each with where its first visit would go. */
export const waitlistFitsQuery = (appointmentId: number) =>
  queryOptions({ queryKey: waitlistFitsKeys.fits(appointmentId), queryFn: () => api<WaitlistEntry[]>('/waitlist/fits', { query: { appointmentId } }) });

export const useWaitlistFits = (appointmentId: number | null) => useQuery({ ...waitlistFitsQuery(appointmentId ?? 0), enabled: appointmentId !== null });
