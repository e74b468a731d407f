import { weldSchema, type WeldBody } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { weldQueries } from './weld-queries';

/** Logs one weld; the server checks each welder and answers the weld as saved (flagged or not). */
export function useCreateWeld() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: WeldBody) => apiRequest('/api/welds', weldSchema, { method: 'POST', body }),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: weldQueries.lists() }),
        queryClient.invalidateQueries({ queryKey: ['continuity'] }),
      ]),
    meta: { inlineErrors: true },
  });
}
