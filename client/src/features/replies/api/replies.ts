import type { DeskReplyRequest, DeskTask, OutboxMessage, ReplyThread, ReplyThreadSummary } from '@ostium/shared';
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export const THREAD_FILTERS = ['all', 'unread', 'tasks', 'failed'] as const;
export type ThreadFilter = (typeof THREAD_FILTERS)[number];

/** Replies is the front desk's inbox: a new text should show without anyone reloading. */
export const REPLIES_POLL_MS = 10_000;

export const replyKeys = {
  all: ['replies'] as const,
  threads: () => [...replyKeys.all, 'threads'] as const,
  list: (filter: ThreadFilter) => [...replyKeys.threads(), 'list', filter] as const,
  thread: (ref: string) => [...replyKeys.threads(), 'detail', ref] as const,
  tasks: () => [...replyKeys.all, 'tasks'] as const,
};

export const threadListQuery = (filter: ThreadFilter) =>
  queryOptions({
    queryKey: replyKeys.list(filter),
    queryFn: ({ signal }) => api<ReplyThreadSummary[]>('/replies/threads', { query: { filter }, signal }),
    refetchInterval: REPLIES_POLL_MS,
    placeholderData: keepPreviousData,
  });

export const useThreadList = (filter: ThreadFilter) => useQuery(threadListQuery(filter));

/**
 * How the server names a thread in its path: the patient's id, or `unmatched:<number>` for a sender no
 * patient gave (server/src/replies/threads.service.ts parseThreadKey).
 */
export const threadRef = (t: Pick<ReplyThreadSummary, 'patientId' | 'address'>) => (t.patientId !== null ? String(t.patientId) : `unmatched:${t.address ?? ''}`);

const threadPath = (ref: string) => `/replies/threads/${encodeURIComponent(ref)}`;

export const threadQuery = (ref: string) =>
  queryOptions({
    queryKey: replyKeys.thread(ref),
    queryFn: ({ signal }) => api<ReplyThread>(threadPath(ref), { signal }),
    refetchInterval: REPLIES_POLL_MS,
  });

export const useThread = (ref: string) => useQuery(threadQuery(ref));

export const openTasksQuery = () =>
  queryOptions({
    queryKey: replyKeys.tasks(),
    queryFn: ({ signal }) => api<DeskTask[]>('/replies/tasks', { query: { status: 'open' }, signal }),
    refetchInterval: REPLIES_POLL_MS,
  });

export const useOpenTasks = () => useQuery(openTasksQuery());

/** Everything the inbox shows moves together: counts in the list, the thread, the task list. */
const refreshAll = (qc: ReturnType<typeof useQueryClient>) => qc.invalidateQueries({ queryKey: replyKeys.all });

export function useMarkThreadRead() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (ref: string) => api<void>(`${threadPath(ref)}/read`, { method: 'POST' }),
    onSuccess: (_, ref) => {
      // The unread badge goes at once; the next poll brings the server's own counts.
      qc.setQueriesData<ReplyThreadSummary[]>({ queryKey: [...replyKeys.threads(), 'list'] }, (list) => list?.map((t) => (threadRef(t) === ref ? { ...t, unread: 0 } : t)));
      void qc.invalidateQueries({ queryKey: [...replyKeys.threads(), 'list'] });
    },
  });
}

export function useSendDeskReply(patientId: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: DeskReplyRequest) => api<OutboxMessage>(`${threadPath(String(patientId))}/messages`, { method: 'POST', body }),
    onSuccess: () => void refreshAll(qc),
  });
}

export function useMarkTaskDone() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api<DeskTask>(`/replies/tasks/${id}`, { method: 'PATCH', body: { status: 'done' } }),
    onSuccess: () => void refreshAll(qc),
  });
}

export function useRetryMessage() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api<OutboxMessage>(`/outbox/${id}/retry`, { method: 'POST' }),
    onSuccess: () => void refreshAll(qc),
  });
}
