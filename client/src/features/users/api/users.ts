import type { CreateUserRequest, UpdateUserRequest, UserSummary } from '@ostium/shared';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export const userKeys = {
  all: ['users'] as const,
  list: (role?: string) => [...userKeys.all, 'list', role ?? 'all'] as const,
};

export const usersQuery = (role?: string) =>
  queryOptions({ queryKey: userKeys.list(role), queryFn: () => api<UserSummary[]>('/users', { query: { role } }) });

export const useUsers = (role?: string) => useQuery(usersQuery(role));

export function useCreateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateUserRequest) => api<UserSummary>('/users', { method: 'POST', body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: userKeys.all }),
  });
}

export function useUpdateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...body }: UpdateUserRequest & { id: number }) => api<UserSummary>(`/users/${id}`, { method: 'PATCH', body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: userKeys.all }),
  });
}
