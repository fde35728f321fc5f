import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { showToast } from '../components/ui/toast.tsx';
import { ApiError, getErrorMessage } from '../lib/api-client.ts';
import type {} from '../lib/query-meta.ts';
import { authKeys } from '../features/auth/api/get-me.ts';

/** A 4xx will answer the same on a second try; only network trouble and 5xx are retried. */
function shouldRetry(failureCount: number, error: unknown): boolean {
  if (error instanceof ApiError && error.status >= 400 && error.status < 500) return false;
  return failureCount < 2;
}

/** A 401 on any request means the session is gone (expired, or the account was disabled). */
function endsSession(error: unknown): boolean {
  return error instanceof ApiError && error.status === 401 && ['unauthenticated', 'session-expired', 'account-disabled'].includes(error.code);
}

export function createQueryClient(): QueryClient {
  // Forgetting the user sends the app shell to the sign-in page, which brings the person back here.
  const forgetUser = () => queryClient.setQueryData(authKeys.me(), null);
  const queryClient: QueryClient = new QueryClient({
    defaultOptions: {
      queries: { staleTime: 30_000, retry: shouldRetry },
      mutations: { retry: false },
    },
    queryCache: new QueryCache({
      onError: (error) => {
        if (endsSession(error)) forgetUser();
      },
    }),
    // Every failed mutation is reported once, here, unless its form shows the error itself.
    mutationCache: new MutationCache({
      onError: (error, _variables, _context, mutation) => {
        if (endsSession(error)) forgetUser();
        const title = mutation.meta?.errorTitle;
        if (title === false) return;
        showToast({ tone: 'error', title: title ?? 'The change was not saved', message: getErrorMessage(error) });
      },
      onSuccess: (_data, _variables, _context, mutation) => {
        const title = mutation.meta?.successTitle;
        if (title) showToast({ tone: 'success', title });
      },
    }),
  });
  return queryClient;
}
