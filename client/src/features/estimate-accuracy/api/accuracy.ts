import type { CellAccuracy, ToothNotation, VisitHistoryImportResult } from '@ostium/shared';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { estimateKeys } from '../../case-sheet/api/estimates';

export const accuracyQuery = () => queryOptions({ queryKey: estimateKeys.accuracy(), queryFn: () => api<CellAccuracy[]>('/estimates/accuracy') });

export const useAccuracy = () => useQuery(accuracyQuery());

export interface ImportInput {
  file: File;
  /** Notation of the file's tooth column; the server defaults to the practice's. */
  notation?: ToothNotation;
  onProgress?: (fraction: number) => void;
}

export function useImportHistory() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ file, notation, onProgress }: ImportInput) => {
      const body = new FormData();
      body.append('file', file);
      return api<VisitHistoryImportResult>('/visit-history/import', { method: 'POST', body, query: { notation }, onUploadProgress: onProgress ?? (() => {}) });
    },
    onSuccess: (r) => {
      qc.setQueryData(estimateKeys.accuracy(), r.accuracy);
      // The calibration changed: every preview may now differ.
      void qc.invalidateQueries({ queryKey: estimateKeys.all, predicate: (q) => q.queryKey[1] !== 'accuracy' });
    },
  });
}
