import { shopSchema, type ShopInput } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { meQuery } from '@/lib/auth';
import { shopQueries } from './shop-queries';

export function useCreateShop() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: ShopInput) => apiRequest('/api/shops', shopSchema, { method: 'POST', body: input }),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: shopQueries.all() }),
        queryClient.invalidateQueries({ queryKey: meQuery.queryKey }),
      ]),
    meta: { inlineErrors: true, successMessage: 'Shop created' },
  });
}
