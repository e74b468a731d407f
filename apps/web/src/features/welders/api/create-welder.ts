import { welderSchema, type WelderInput } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { welderQueries } from './welder-queries';

export function useCreateWelder() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: WelderInput) => apiRequest('/api/welders', welderSchema, { method: 'POST', body: input }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: welderQueries.lists() }),
    meta: { inlineErrors: true, successMessage: 'Welder added' },
  });
}
