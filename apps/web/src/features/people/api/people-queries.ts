import { personSchema } from '@beadroll/rules';
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { apiRequest } from '@/lib/api-client';

const peopleListSchema = z.object({ items: z.array(personSchema) });

export const peopleQueries = {
  all: () => ['people'] as const,
  lists: () => [...peopleQueries.all(), 'list'] as const,
  list: () =>
    queryOptions({
      queryKey: peopleQueries.lists(),
      queryFn: async ({ signal }) => (await apiRequest('/api/people', peopleListSchema, { signal })).items,
    }),
};
