import { qualificationSchema, type qualificationListQuery } from '@beadroll/rules';
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '@/lib/api-client';

export type QualificationFilters = z.input<typeof qualificationListQuery>;
const qualificationList = z.object({ items: z.array(qualificationSchema) });

export const qualificationQueries = {
  all: () => ['qualifications'] as const,
  lists: () => [...qualificationQueries.all(), 'list'] as const,
  list: (filters: QualificationFilters = {}) =>
    queryOptions({
      queryKey: [...qualificationQueries.lists(), filters] as const,
      queryFn: ({ signal }) =>
        apiRequest('/api/qualifications', qualificationList, {
          signal,
          query: { welderId: filters.welderId, state: filters.state },
        }),
    }),
};

export const wpqPdfUrl = (id: string) => `/api/qualifications/${encodeURIComponent(id)}/wpq.pdf`;
export const walletCardUrl = (welderId: string) => `/api/welders/${encodeURIComponent(welderId)}/card.pdf`;
