import { qualificationSchema, type RevokeInput } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { qualificationQueries } from './qualification-queries';

export function useRevokeQualification() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: string; input: RevokeInput }) =>
      apiRequest(`/api/qualifications/${encodeURIComponent(id)}/revoke`, qualificationSchema, { method: 'POST', body: input }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: qualificationQueries.all() }),
    meta: { inlineErrors: true, successMessage: 'Qualification revoked' },
  });
}
