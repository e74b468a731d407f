import { couponRecordSchema, type CouponRecordInput } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { couponQueries } from './coupon-queries';

/** POST /api/coupons: the server evaluates again and refuses a claimed verdict that disagrees. */
export function useRecordCoupon() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CouponRecordInput) => apiRequest('/api/coupons', couponRecordSchema, { method: 'POST', body: input }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: couponQueries.all() }),
    meta: { inlineErrors: true, successMessage: 'Coupon recorded' },
  });
}
