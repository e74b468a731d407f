import { welderSchema, type WelderUpdateInput } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { welderQueries } from './welder-queries';

/** Sends the version the editor started from; a stale one comes back as 409 (someone else saved first). */
export function useUpdateWelder({ successMessage = 'Welder saved' }: { successMessage?: string } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: string; input: WelderUpdateInput }) =>
      apiRequest(`/api/welders/${encodeURIComponent(id)}`, welderSchema, { method: 'PATCH', body: input }),
    onSuccess: (welder) => {
      queryClient.setQueryData(welderQueries.detail(welder.id).queryKey, welder);
      return queryClient.invalidateQueries({ queryKey: welderQueries.all() });
    },
    meta: { inlineErrors: true, successMessage },
  });
}
