import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api, setCsrfToken } from '@/lib/api-client';
import type { ChangePasswordInput } from '@shared/contracts/auth';
import { PasswordChangedSchema, SessionListSchema, type UpdateProfileInput } from '@shared/contracts/account';
import { sessionQueries } from '../auth/api';

export const accountQueries = {
  all: () => ['account'] as const,
  sessions: () => queryOptions({ queryKey: [...accountQueries.all(), 'sessions'], queryFn: ({ signal }) => api.get('/api/account/sessions', SessionListSchema, { signal }) }),
};

export function useChangePassword() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: ChangePasswordInput) => api.post('/api/account/password', PasswordChangedSchema, input),
    // The current session is reissued with a new id and CSRF token.
    onSuccess: async (res) => {
      setCsrfToken(res.csrfToken);
      await qc.invalidateQueries({ queryKey: accountQueries.all() });
      await qc.invalidateQueries({ queryKey: sessionQueries.all() });
    },
  });
}

export function useUpdateProfile() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateProfileInput) => api.patch('/api/account/profile', z.object({ displayName: z.string() }), input),
    onSuccess: () => qc.invalidateQueries({ queryKey: sessionQueries.all() }),
  });
}

export function useEndSession() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (sessionId: string) => api.delete(`/api/account/sessions/${sessionId}`, null),
    onSuccess: () => qc.invalidateQueries({ queryKey: accountQueries.all() }),
  });
}
