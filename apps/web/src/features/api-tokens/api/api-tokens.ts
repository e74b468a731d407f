// API tokens (QA manager): list, create (the secret comes back once), revoke.
import { queryOptions } from '@tanstack/react-query';
import { apiTokenCreatedSchema, apiTokenListSchema, apiTokenSchema, type ApiTokenInput } from '@beadroll/rules';
import { apiRequest } from '@/lib/api-client';

export const apiTokenQueries = {
  all: () => ['api-tokens'] as const,
  list: () =>
    queryOptions({
      queryKey: [...apiTokenQueries.all(), 'list'] as const,
      queryFn: ({ signal }) => apiRequest('/api/api-tokens', apiTokenListSchema, { signal }),
    }),
};

export const createApiToken = (input: ApiTokenInput) =>
  apiRequest('/api/api-tokens', apiTokenCreatedSchema, { method: 'POST', body: input });
export const revokeApiToken = (id: string) =>
  apiRequest(`/api/api-tokens/${encodeURIComponent(id)}/revoke`, apiTokenSchema, { method: 'POST' });
