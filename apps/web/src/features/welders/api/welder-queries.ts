import { welderPageSchema, welderSchema } from '@beadroll/rules';
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import type { WelderFilters } from './welder-search';

export const welderQueries = {
  all: () => ['welders'] as const,
  lists: () => [...welderQueries.all(), 'list'] as const,
  list: (filters: WelderFilters) =>
    queryOptions({
      queryKey: [...welderQueries.lists(), filters] as const,
      queryFn: ({ signal }) =>
        apiRequest('/api/welders', welderPageSchema, {
          signal,
          query: {
            q: filters.q,
            shopId: filters.shopId,
            state: filters.state,
            status: filters.status,
            sort: filters.sort,
            dir: filters.dir,
            page: filters.page,
            pageSize: filters.pageSize,
          },
        }),
      // Keep the rows on screen while the next page or sort order loads.
      placeholderData: keepPreviousData,
    }),
  details: () => [...welderQueries.all(), 'detail'] as const,
  detail: (id: string) =>
    queryOptions({
      queryKey: [...welderQueries.details(), id] as const,
      queryFn: ({ signal }) => apiRequest(`/api/welders/${encodeURIComponent(id)}`, welderSchema, { signal }),
    }),
};
