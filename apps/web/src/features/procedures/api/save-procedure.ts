import { procedureSchema, type ProcedureInput, type ProcedureUpdateInput } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { procedureQueries } from './procedure-queries';

export function useCreateProcedure() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: ProcedureInput) => apiRequest('/api/procedures', procedureSchema, { method: 'POST', body: input }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: procedureQueries.all() }),
    meta: { inlineErrors: true, successMessage: 'WPS added to the register' },
  });
}

/** Sends the version the editor started from; a stale one comes back as 409. Superseding is a status change. */
export function useUpdateProcedure({ successMessage = 'WPS saved' }: { successMessage?: string } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: string; input: ProcedureUpdateInput }) =>
      apiRequest(`/api/procedures/${encodeURIComponent(id)}`, procedureSchema, { method: 'PATCH', body: input }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: procedureQueries.all() }),
    meta: { inlineErrors: true, successMessage },
  });
}
