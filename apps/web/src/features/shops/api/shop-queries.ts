import { shopSchema } from '@beadroll/rules';
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '@/lib/api-client';

const shopListSchema = z.object({ items: z.array(shopSchema) });

export const shopQueries = {
  all: () => ['shops'] as const,
  lists: () => [...shopQueries.all(), 'list'] as const,
  /** QA manager: every shop of the company; foreman: assigned shops; welder: home shop. */
  list: () =>
    queryOptions({
      queryKey: shopQueries.lists(),
      queryFn: async ({ signal }) => (await apiRequest('/api/shops', shopListSchema, { signal })).items,
    }),
};
