import type { LocationSummary, PracticeSummary } from '@ostium/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export const practiceKeys = {
  all: ['practice'] as const,
  practice: () => [...practiceKeys.all, 'detail'] as const,
  locations: () => [...practiceKeys.all, 'locations'] as const,
};

export const practiceQuery = () => queryOptions({ queryKey: practiceKeys.practice(), queryFn: () => api<PracticeSummary>('/practice'), staleTime: 60_000 });
export const locationsQuery = () => queryOptions({ queryKey: practiceKeys.locations(), queryFn: () => api<LocationSummary[]>('/locations'), staleTime: 60_000 });

export const usePractice = () => useQuery(practiceQuery());
export const useLocations = () => useQuery(locationsQuery());
