import { weldDetailSchema, weldPageSchema, weldWelderListSchema, type WeldWelder, type weldListQuery } from '@beadroll/rules';
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { z } from 'zod';
import { apiRequest } from '@/lib/api-client';

export type WeldFilters = z.input<typeof weldListQuery>;

export const weldQueries = {
  all: () => ['welds'] as const,
  lists: () => [...weldQueries.all(), 'list'] as const,
  list: (filters: WeldFilters) =>
    queryOptions({
      queryKey: [...weldQueries.lists(), filters] as const,
      queryFn: ({ signal }) =>
        apiRequest('/api/welds', weldPageSchema, {
          signal,
          query: {
            job: filters.job,
            shopId: filters.shopId,
            welderId: filters.welderId,
            from: filters.from,
            to: filters.to,
            flagged: filters.flagged,
            page: typeof filters.page === 'number' ? filters.page : undefined,
          },
        }),
      placeholderData: keepPreviousData,
    }),
  detail: (id: string) =>
    queryOptions({
      queryKey: [...weldQueries.all(), 'detail', id] as const,
      queryFn: ({ signal }) => apiRequest(`/api/welds/${encodeURIComponent(id)}`, weldDetailSchema, { signal }),
    }),
  welders: (shopId: string, q: string) =>
    queryOptions({
      queryKey: [...weldQueries.all(), 'welders', shopId, q] as const,
      queryFn: async ({ signal }) => (await apiRequest('/api/welds/welders', weldWelderListSchema, { signal, query: { shopId, q } })).items,
      staleTime: 60_000,
    }),
  /** The welder of each stamp (exact match, case-insensitive), looked up one stamp per request. */
  weldersByStamp: (shopId: string, stamps: string[]) =>
    queryOptions({
      queryKey: [...weldQueries.all(), 'welders-by-stamp', shopId, stamps] as const,
      queryFn: async ({ signal }) => {
        const lists = await Promise.all(
          stamps.map((q) => apiRequest('/api/welds/welders', weldWelderListSchema, { signal, query: { shopId, q } })),
        );
        const found: Record<string, WeldWelder | undefined> = {};
        stamps.forEach((stamp, i) => {
          found[stamp] = lists[i]!.items.find((w) => w.stamp.toUpperCase() === stamp);
        });
        return found;
      },
      staleTime: 60_000,
    }),
};
