import { tokenInfoSchema } from '@beadroll/rules';
import { queryOptions } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';

export const tokenQueries = {
  all: () => ['auth', 'tokens'] as const,
  /** Who a set-password link is for; an expired or used link answers 200 with `usable: false` and why. */
  info: (token: string) =>
    queryOptions({
      queryKey: [...tokenQueries.all(), token] as const,
      queryFn: ({ signal }) =>
        apiRequest(`/api/auth/tokens/${encodeURIComponent(token)}`, tokenInfoSchema, { signal, redirectOn401: false }),
      staleTime: Infinity,
      retry: false,
    }),
};
