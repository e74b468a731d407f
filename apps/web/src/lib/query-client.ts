// One QueryClient for the app. Client errors (4xx) are answers, not glitches: they are not retried.
// Background failures and mutation errors without a form to show them become one notice per request.
import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { ApiError, errorMessage } from './api-client';
import { notify } from './notifications';

declare module '@tanstack/react-query' {
  interface Register {
    mutationMeta: {
      /** Shown as a notice when the mutation succeeds. */
      successMessage?: string;
      /** The form shows this mutation's errors next to its fields; no notice needed. */
      inlineErrors?: boolean;
    };
  }
}

export function createQueryClient(): QueryClient {
  return new QueryClient({
    queryCache: new QueryCache({
      onError: (error, query) => {
        // A first load that fails shows its error in place; only a failed refresh of shown data needs a notice.
        if (query.state.data !== undefined && !(error instanceof ApiError && error.status === 401)) {
          notify('error', `Could not refresh: ${errorMessage(error)}`);
        }
      },
    }),
    mutationCache: new MutationCache({
      onSuccess: (_data, _variables, _context, mutation) => {
        if (mutation.meta?.successMessage) notify('success', mutation.meta.successMessage);
      },
      onError: (error, _variables, _context, mutation) => {
        if (mutation.meta?.inlineErrors) return;
        if (error instanceof ApiError && error.status === 401) return;
        notify('error', errorMessage(error));
      },
    }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        refetchOnWindowFocus: true,
        retry: (failureCount, error) => {
          if (error instanceof ApiError && error.status >= 400 && error.status < 500) return false;
          return failureCount < 2;
        },
      },
    },
  });
}
