import { verifySchema, verifyTokenIssuedSchema, verifyTokenStatusSchema } from '@beadroll/rules';
import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest, apiSend } from '@/lib/api-client';

export const verifyQueries = {
  all: () => ['verify'] as const,
  /** The public page: no sign-in, so a 401 is never a reason to go to the sign-in page. */
  view: (token: string) =>
    queryOptions({
      queryKey: [...verifyQueries.all(), 'view', token] as const,
      queryFn: ({ signal }) =>
        apiRequest(`/api/verify/${encodeURIComponent(token)}`, verifySchema, { signal, redirectOn401: false }),
      retry: false,
      refetchOnWindowFocus: false,
    }),
  tokenStatus: (welderId: string) =>
    queryOptions({
      queryKey: [...verifyQueries.all(), 'token', welderId] as const,
      queryFn: ({ signal }) =>
        apiRequest(`/api/welders/${encodeURIComponent(welderId)}/verify-token`, verifyTokenStatusSchema, { signal }),
    }),
};

/** Issues a new verify link (the old one, and every card printed with it, stops working). */
export function useIssueVerifyToken() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (welderId: string) =>
      apiRequest(`/api/welders/${encodeURIComponent(welderId)}/verify-token`, verifyTokenIssuedSchema, { method: 'POST' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: verifyQueries.all() }),
    meta: { inlineErrors: true, successMessage: 'New verify link issued' },
  });
}

export function useRevokeVerifyToken() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (welderId: string) => apiSend(`/api/welders/${encodeURIComponent(welderId)}/verify-token`, { method: 'DELETE' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: verifyQueries.all() }),
    meta: { inlineErrors: true, successMessage: 'Verify link revoked' },
  });
}
