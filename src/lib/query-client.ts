import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { isApiError } from './api-client';

export interface QueryClientHooks {
  /** Called once per burst of 401 answers: the session has ended. */
  onUnauthenticated: () => void;
}

/** 5xx and network failures go to the route's error boundary; 4xx are shown inline by the screen. */
export function isServerOrNetworkError(err: unknown): boolean {
  return !isApiError(err) || err.status === 0 || err.status >= 500;
}

export function createQueryClient(hooks: QueryClientHooks): QueryClient {
  let handling = false;
  const onError = (err: unknown) => {
    if (!isApiError(err) || err.status !== 401 || handling) return;
    handling = true;
    hooks.onUnauthenticated();
    setTimeout(() => (handling = false), 1000);
  };
  return new QueryClient({
    queryCache: new QueryCache({ onError }),
    // Sign-in answers 401 for a wrong password: that is a form error, not an ended session.
    mutationCache: new MutationCache({ onError: (err, _vars, _ctx, mutation) => (mutation.meta?.isSignInAttempt ? undefined : onError(err)) }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        retry: (count, err) => isServerOrNetworkError(err) && count < 2,
        throwOnError: (err) => isServerOrNetworkError(err),
      },
      mutations: {
        retry: false,
        throwOnError: false,
      },
    },
  });
}
