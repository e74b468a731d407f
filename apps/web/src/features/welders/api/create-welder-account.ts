import { personSchema } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { welderQueries } from './welder-queries';

/** "Give sign-in": creates the welder's own account for their e-mail and sends the invitation. */
export function useCreateWelderAccount() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (welderId: string) =>
      apiRequest(`/api/welders/${encodeURIComponent(welderId)}/account`, personSchema, { method: 'POST' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: welderQueries.all() }),
    meta: { inlineErrors: true, successMessage: 'Sign-in created; the invitation is on its way' },
  });
}
