import { auditEventSchema, pageOf } from '@beadroll/rules';
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';

const auditPageSchema = pageOf(auditEventSchema);

export interface AuditFilters {
  entityType?: string;
  entityId?: string;
  page?: number;
}

export const auditQueries = {
  all: () => ['audit'] as const,
  lists: () => [...auditQueries.all(), 'list'] as const,
  list: (filters: AuditFilters) =>
    queryOptions({
      queryKey: [...auditQueries.lists(), filters] as const,
      queryFn: ({ signal }) =>
        apiRequest('/api/audit', auditPageSchema, {
          signal,
          query: { entityType: filters.entityType, entityId: filters.entityId, page: filters.page },
        }),
      placeholderData: keepPreviousData,
    }),
};
