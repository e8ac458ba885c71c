import { queryOptions, useMutation, useQueryClient, useSuspenseQuery, type QueryClient } from '@tanstack/react-query';
import { api, setCsrfToken } from '@/lib/api-client';
import { SessionInfoSchema, type SessionInfo, type SignInInput, type SignUpInput } from '@shared/contracts/auth';

async function fetchSession(signal?: AbortSignal): Promise<SessionInfo> {
  const info = await api.get('/api/auth/session', SessionInfoSchema, { signal });
  setCsrfToken(info.csrfToken);
  return info;
}

export const sessionQueries = {
  all: () => ['auth'] as const,
  current: () =>
    queryOptions({
      queryKey: [...sessionQueries.all(), 'session'],
      queryFn: ({ signal }) => fetchSession(signal),
      staleTime: 60_000,
    }),
};

/** Re-reads the session (this also extends the server's rolling idle timer). */
export async function refreshSession(qc: QueryClient): Promise<SessionInfo> {
  const info = await fetchSession();
  qc.setQueryData(sessionQueries.current().queryKey, info);
  return info;
}

/** Forgets the signed-in session on the client (after sign-out or a 401). */
export function forgetSession(qc: QueryClient): void {
  setCsrfToken('');
  qc.removeQueries({ predicate: (q) => q.queryKey[0] !== 'auth' });
  void qc.invalidateQueries({ queryKey: sessionQueries.all() });
}

/** The signed-in session; only for screens under the signed-in layout (its loader ensures it). */
export function useSession(): SessionInfo {
  return useSuspenseQuery(sessionQueries.current()).data;
}

function useSessionWrite<I>(url: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: I) => api.post(url, SessionInfoSchema, input),
    meta: { isSignInAttempt: true },
    onSuccess: (info) => {
      // A new session id and CSRF token after every sign-in (session fixation defence).
      setCsrfToken(info.csrfToken);
      qc.removeQueries({ predicate: (q) => q.queryKey[0] !== 'auth' });
      qc.setQueryData(sessionQueries.current().queryKey, info);
    },
  });
}

export const useSignIn = () => useSessionWrite<SignInInput>('/api/auth/sign-in');
export const useSignUp = () => useSessionWrite<SignUpInput>('/api/auth/sign-up');

export function useSignOut() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api.post('/api/auth/sign-out', null),
    onSettled: () => {
      setCsrfToken('');
      qc.clear();
    },
  });
}
