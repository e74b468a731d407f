import { gridSchema, gridWelderListSchema, reviewQueueSchema, timelineSchema } from '@beadroll/rules';
import { queryOptions } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';

export const continuityQueries = {
  all: () => ['continuity'] as const,
  grid: (shopId: string, month: string) =>
    queryOptions({
      queryKey: [...continuityQueries.all(), 'grid', shopId, month] as const,
      queryFn: ({ signal }) => apiRequest('/api/continuity/grid', gridSchema, { query: { shopId, month }, signal }),
      // The grid is edited in place; a background refetch must not overwrite what is being typed.
      staleTime: Infinity,
      refetchOnWindowFocus: false,
    }),
  addable: (shopId: string, q: string) =>
    queryOptions({
      queryKey: [...continuityQueries.all(), 'welders', shopId, q] as const,
      queryFn: async ({ signal }) =>
        (await apiRequest('/api/continuity/welders', gridWelderListSchema, { query: { shopId, q }, signal })).items,
    }),
  review: () =>
    queryOptions({
      queryKey: [...continuityQueries.all(), 'review'] as const,
      queryFn: async ({ signal }) => (await apiRequest('/api/continuity/review', reviewQueueSchema, { signal })).items,
    }),
  timeline: (welderId: string) =>
    queryOptions({
      queryKey: [...continuityQueries.all(), 'timeline', welderId] as const,
      queryFn: ({ signal }) => apiRequest(`/api/welders/${encodeURIComponent(welderId)}/timeline`, timelineSchema, { signal }),
    }),
};
