import { personSchema, type PersonUpdateInput } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { peopleQueries } from './people-queries';

export function useUpdatePerson({ successMessage = 'Saved' }: { successMessage?: string } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: string; input: PersonUpdateInput }) =>
      apiRequest(`/api/people/${encodeURIComponent(id)}`, personSchema, { method: 'PATCH', body: input }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: peopleQueries.all() }),
    meta: { inlineErrors: true, successMessage },
  });
}
