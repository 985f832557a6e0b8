import type { ChairsideDay } from '@ostium/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export const chairsideKeys = {
  all: ['chairside'] as const,
  day: (date: string, locationId: number) => [...chairsideKeys.all, date, locationId] as const,
};

export const chairsideQuery = (date: string, locationId: number) =>
  queryOptions({ queryKey: chairsideKeys.day(date, locationId), queryFn: () => api<ChairsideDay>('/chairside', { query: { date, locationId } }), staleTime: 30_000 });

export const useChairside = (date: string, locationId: number | null) => useQuery({ ...chairsideQuery(date, locationId ?? 0), enabled: locationId !== null });
