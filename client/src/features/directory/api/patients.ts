import type { Patient } from '@ostium/shared';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export interface PatientFilters {
  /** Name words, e-mail or phone. */
  q?: string;
  /** At most this many rows (the server's default is 50, its ceiling 200). */
  limit?: number;
}

export const patientKeys = {
  all: ['patients'] as const,
  list: (f: PatientFilters) => [...patientKeys.all, 'list', f] as const,
};

export const patientsQuery = (f: PatientFilters) =>
  queryOptions({
    queryKey: patientKeys.list(f),
    queryFn: ({ signal }) => api<Patient[]>('/patients', { query: { q: f.q, limit: f.limit }, signal }),
    placeholderData: keepPreviousData,
  });

export const usePatients = (f: PatientFilters, enabled = true) => useQuery({ ...patientsQuery(f), enabled });
