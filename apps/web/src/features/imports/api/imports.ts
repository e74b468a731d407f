// Imports: upload, check (dry run), commit, cancel, and the import itself (polled while it runs).
import { queryOptions } from '@tanstack/react-query';
import {
  importSchema,
  paperRecordListSchema,
  paperRecordSchema,
  type ImportCheckInput,
  type PaperSettleInput,
} from '@beadroll/rules';
import { apiRequest } from '@/lib/api-client';

export const importQueries = {
  all: () => ['imports'] as const,
  detail: (id: string) =>
    queryOptions({
      queryKey: [...importQueries.all(), 'detail', id] as const,
      queryFn: ({ signal }) => apiRequest(`/api/imports/${encodeURIComponent(id)}`, importSchema, { signal }),
      // While it runs, the progress bar reads it twice a second.
      refetchInterval: (q) => (q.state.data?.status === 'running' ? 500 : false),
    }),
};

export function uploadImport(kind: string, file: File) {
  const body = new FormData();
  body.set('kind', kind);
  body.set('file', file);
  return apiRequest('/api/imports', importSchema, { method: 'POST', body });
}

export const checkImport = (id: string, input: ImportCheckInput) =>
  apiRequest(`/api/imports/${encodeURIComponent(id)}/check`, importSchema, { method: 'POST', body: input });
export const commitImport = (id: string) =>
  apiRequest(`/api/imports/${encodeURIComponent(id)}/commit`, importSchema, { method: 'POST' });
export const cancelImport = (id: string) =>
  apiRequest(`/api/imports/${encodeURIComponent(id)}/cancel`, importSchema, { method: 'POST' });

export const paperRecordQueries = {
  all: () => ['paper-records'] as const,
  open: () =>
    queryOptions({
      queryKey: [...paperRecordQueries.all(), 'open'] as const,
      queryFn: ({ signal }) => apiRequest('/api/paper-records?state=open', paperRecordListSchema, { signal }),
    }),
};

export const settlePaperRecord = (qualificationId: string, input: PaperSettleInput) =>
  apiRequest(`/api/paper-records/${encodeURIComponent(qualificationId)}/settle`, paperRecordSchema, { method: 'POST', body: input });
