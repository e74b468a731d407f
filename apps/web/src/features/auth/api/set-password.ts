import { meSchema, type SetPasswordInput } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { meQuery } from '@/lib/auth';

/** Sets the password from an invitation or reset link; the API signs the person in. */
export function useSetPassword() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: SetPasswordInput) =>
      apiRequest('/api/auth/set-password', meSchema, { method: 'POST', body: input, redirectOn401: false }),
    onSuccess: (me) => {
      queryClient.clear();
      queryClient.setQueryData(meQuery.queryKey, me);
    },
    meta: { inlineErrors: true, successMessage: 'Password set. Welcome to Beadroll.' },
  });
}
