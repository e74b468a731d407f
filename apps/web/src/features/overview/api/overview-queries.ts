import { overviewSchema } from '@beadroll/rules';
import { queryOptions } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';

export const overviewQueries = {
  all: () => ['overview'] as const,
  /** Counts by status per shop, lapses by week, the review queue, the latest lapse-watch run. */
  summary: () =>
    queryOptions({
      queryKey: [...overviewQueries.all(), 'summary'] as const,
      queryFn: ({ signal }) => apiRequest('/api/overview', overviewSchema, { signal }),
    }),
};
