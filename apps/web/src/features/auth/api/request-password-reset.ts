import type { PasswordResetRequestInput } from '@beadroll/rules';
import { useMutation } from '@tanstack/react-query';
import { apiSend } from '@/lib/api-client';

export function useRequestPasswordReset() {
  return useMutation({
    mutationFn: (input: PasswordResetRequestInput) =>
      apiSend('/api/auth/password-reset', { method: 'POST', body: input, redirectOn401: false }),
    meta: { inlineErrors: true },
  });
}
