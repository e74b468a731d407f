import { shopSchema, type ShopUpdateInput } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { meQuery } from '@/lib/auth';
import { shopQueries } from './shop-queries';

export function useUpdateShop({ successMessage = 'Shop saved' }: { successMessage?: string } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: string; input: ShopUpdateInput }) =>
      apiRequest(`/api/shops/${encodeURIComponent(id)}`, shopSchema, { method: 'PATCH', body: input }),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: shopQueries.all() }),
        queryClient.invalidateQueries({ queryKey: meQuery.queryKey }),
      ]),
    meta: { inlineErrors: true, successMessage },
  });
}
