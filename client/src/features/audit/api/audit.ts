import type { AuditEntry, Page } from '@ostium/shared';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export interface AuditFilters {
  userId?: number;
  entity?: string;
  from?: string;
  to?: string;
  page: number;
}

export const auditKeys = {
  all: ['audit'] as const,
  list: (f: AuditFilters) => [...auditKeys.all, 'list', f] as const,
};

export const auditQuery = (f: AuditFilters) =>
  queryOptions({
    queryKey: auditKeys.list(f),
    queryFn: () => api<Page<AuditEntry>>('/audit', { query: { ...f, pageSize: 25 } }),
    placeholderData: keepPreviousData,
  });

export const useAudit = (f: AuditFilters) => useQuery(auditQuery(f));
