import { qualificationSchema, type CertifyInput } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { couponQueries } from './coupon-queries';

/** POST /api/coupons/:id/certify → the qualification (WPQ). The screen refreshes the qualification lists it shows. */
export function useCertifyCoupon() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: string; input: CertifyInput }) =>
      apiRequest(`/api/coupons/${encodeURIComponent(id)}/certify`, qualificationSchema, { method: 'POST', body: input }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: couponQueries.all() }),
    meta: { inlineErrors: true, successMessage: 'Qualification certified' },
  });
}
