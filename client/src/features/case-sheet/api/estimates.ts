import type { EstimateRequest, EstimateResult, FactorDefinition } from '@ostium/shared';
import { useDebouncedValue } from '@mantine/hooks';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export const estimateKeys = {
  all: ['estimates'] as const,
  factors: () => [...estimateKeys.all, 'factors'] as const,
  preview: (req: EstimateRequest) => [...estimateKeys.all, 'preview', req] as const,
  accuracy: () => [...estimateKeys.all, 'accuracy'] as const,
};

export const factorsQuery = () =>
  queryOptions({ queryKey: estimateKeys.factors(), queryFn: () => api<FactorDefinition[]>('/estimates/factors'), staleTime: 5 * 60_000 });

export const useFactors = () => useQuery(factorsQuery());

export const estimatePreviewQuery = (req: EstimateRequest) =>
  queryOptions({
    queryKey: estimateKeys.preview(req),
    queryFn: ({ signal }) => api<EstimateResult>('/estimates', { method: 'POST', body: req, signal }),
    // The same inputs give the same estimate until the table or the calibration changes (both invalidate 'estimates').
    staleTime: 60_000,
  });

export const PREVIEW_DEBOUNCE_MS = 250;

/**
 * Live preview of the estimate: waits until the inputs rest for a moment, keeps showing the last
 * result while the next one loads. `req` must be memoised by the caller (its identity starts the timer).
 */
export function useEstimatePreview(req: EstimateRequest | null) {
  const [settled] = useDebouncedValue(req, PREVIEW_DEBOUNCE_MS);
  const query = useQuery({
    ...estimatePreviewQuery(settled ?? { tooth: '', procedure: 'initial' }),
    enabled: settled !== null,
    placeholderData: keepPreviousData,
  });
  return { ...query, settling: req !== settled };
}
