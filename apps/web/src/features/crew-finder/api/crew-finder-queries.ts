import { crewFinderAnswerSchema } from '@beadroll/rules';
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';

/** The search as it sits in the URL: the joint's fields, the range and the pages, all as typed. */
export type CrewSearch = Record<string, string>;

export const crewFinderQueries = {
  all: () => ['crew-finder'] as const,
  search: (search: CrewSearch) =>
    queryOptions({
      queryKey: [...crewFinderQueries.all(), search] as const,
      queryFn: ({ signal }) => apiRequest('/api/crew-finder', crewFinderAnswerSchema, { signal, query: search }),
      placeholderData: keepPreviousData,
      retry: false,
    }),
};
