import type { LoginRequest, LoginResponse } from '@ostium/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { sessionStore } from '../../../lib/session';

export const signIn = (body: LoginRequest) => api<LoginResponse>('/auth/login', { method: 'POST', body });

export function useSignIn() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (res) => {
      qc.clear();
      sessionStore.set(res);
    },
  });
}

export function useSignOut() {
  const qc = useQueryClient();
  return async () => {
    await api<void>('/auth/logout', { method: 'POST' }).catch(() => undefined);
    sessionStore.set(null);
    qc.clear();
  };
}
