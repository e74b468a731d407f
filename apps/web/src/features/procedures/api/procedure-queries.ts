import { procedureSchema, type procedureListQuery } from '@beadroll/rules';
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '@/lib/api-client';

export type ProcedureFilters = z.input<typeof procedureListQuery>;
const procedureList = z.object({ items: z.array(procedureSchema) });

export const procedureQueries = {
  all: () => ['procedures'] as const,
  lists: () => [...procedureQueries.all(), 'list'] as const,
  list: (filters: ProcedureFilters = {}) =>
    queryOptions({
      queryKey: [...procedureQueries.lists(), filters] as const,
      queryFn: ({ signal }) =>
        apiRequest('/api/procedures', procedureList, {
          signal,
          query: { code: filters.code, process: filters.process, status: filters.status, q: filters.q },
        }),
      placeholderData: keepPreviousData,
    }),
  detail: (id: string) =>
    queryOptions({
      queryKey: [...procedureQueries.all(), 'detail', id] as const,
      queryFn: ({ signal }) => apiRequest(`/api/procedures/${encodeURIComponent(id)}`, procedureSchema, { signal }),
    }),
};
