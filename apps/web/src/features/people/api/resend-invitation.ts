import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiSend } from '@/lib/api-client';
import { peopleQueries } from './people-queries';

export function useResendInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (personId: string) => apiSend(`/api/people/${encodeURIComponent(personId)}/invitation`, { method: 'POST' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: peopleQueries.all() }),
    meta: { successMessage: 'A fresh invitation is on its way' },
  });
}
