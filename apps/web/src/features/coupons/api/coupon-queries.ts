import { couponRecordSchema, type examinationResults } from '@beadroll/rules';
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '@/lib/api-client';

export type CouponFilters = { welderId?: string; result?: (typeof examinationResults)[number] };
const couponList = z.object({ items: z.array(couponRecordSchema) });

export const couponQueries = {
  all: () => ['coupons'] as const,
  lists: () => [...couponQueries.all(), 'list'] as const,
  list: (filters: CouponFilters = {}) =>
    queryOptions({
      queryKey: [...couponQueries.lists(), filters] as const,
      queryFn: ({ signal }) =>
        apiRequest('/api/coupons', couponList, { signal, query: { welderId: filters.welderId, result: filters.result } }),
    }),
  detail: (id: string) =>
    queryOptions({
      queryKey: [...couponQueries.all(), 'detail', id] as const,
      queryFn: ({ signal }) => apiRequest(`/api/coupons/${encodeURIComponent(id)}`, couponRecordSchema, { signal }),
    }),
};
