import { sessionListSchema } from '@beadroll/rules';
import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest, apiSend } from '@/lib/api-client';

export const sessionQueries = {
  all: () => ['sessions'] as const,
  /** The caller's own signed-in browsers and devices, most recently used first. */
  list: () =>
    queryOptions({
      queryKey: sessionQueries.all(),
      queryFn: async ({ signal }) => (await apiRequest('/api/auth/sessions', sessionListSchema, { signal })).items,
    }),
};

/** Ends one of the caller's other sessions (`id`), or every other one (`id` null). */
export function useEndSessions() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (id: string | null) => {
      if (id === null) await apiRequest('/api/auth/sessions/end-others', z.object({ ended: z.number() }), { method: 'POST' });
      else await apiSend(`/api/auth/sessions/${encodeURIComponent(id)}`, { method: 'DELETE' });
    },
    onSuccess: () => queryClient.invalidateQueries({ queryKey: sessionQueries.all() }),
    meta: { successMessage: 'Signed out' },
  });
}
