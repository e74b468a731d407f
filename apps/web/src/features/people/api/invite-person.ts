import { personSchema, type PersonInput } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { peopleQueries } from './people-queries';

export function useInvitePerson() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: PersonInput) => apiRequest('/api/people', personSchema, { method: 'POST', body: input }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: peopleQueries.all() }),
    meta: { inlineErrors: true, successMessage: 'Invitation sent' },
  });
}
