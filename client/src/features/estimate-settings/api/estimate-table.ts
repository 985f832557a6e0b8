import type { EstimateTable, EstimateTableInfo } from '@ostium/shared';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export const estimateTableKeys = {
  all: ['settings', 'estimate-table'] as const,
};

export const estimateTableQuery = () => queryOptions({ queryKey: estimateTableKeys.all, queryFn: () => api<EstimateTableInfo>('/settings/estimate-table') });

export const useEstimateTable = () => useQuery(estimateTableQuery());

export function useSaveEstimateTable() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (table: EstimateTable) => api<EstimateTableInfo>('/settings/estimate-table', { method: 'PUT', body: table }),
    onSuccess: (info) => {
      qc.setQueryData(estimateTableKeys.all, info);
      // Previews, factor wording (ASA II) and accuracy all read the current table.
      void qc.invalidateQueries({ queryKey: ['estimates'] });
    },
  });
}
