import type { FeedTokenResponse } from '@ostium/shared';
import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

/** A new private feed address (the old one stops working), or revoke it. */
export function useIssueFeedToken(operatorId: number) {
  return useMutation({ mutationFn: () => api<FeedTokenResponse>(`/operators/${operatorId}/feed-token`, { method: 'POST' }) });
}

export function useRevokeFeedToken(operatorId: number) {
  return useMutation({ mutationFn: () => api<void>(`/operators/${operatorId}/feed-token`, { method: 'DELETE' }) });
}
