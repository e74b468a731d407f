import { weldSchema, type WeldDispositionInput } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { weldQueries } from './weld-queries';

/** The QA manager's disposition of a flagged weld. */
export function useDisposeWeld() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...body }: WeldDispositionInput & { id: string }) =>
      apiRequest(`/api/welds/${encodeURIComponent(id)}/disposition`, weldSchema, { method: 'POST', body }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: weldQueries.all() }),
    meta: { inlineErrors: true, successMessage: 'Disposition recorded' },
  });
}
