import {
  companySettingsSchema,
  lapseNoticeListSchema,
  lapseWatchPreviewSchema,
  lapseWatchRunListSchema,
  lapseWatchRunSchema,
  type CompanySettingsInput,
} from '@beadroll/rules';
import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';

export const lapseWatchQueries = {
  all: () => ['lapse-watch'] as const,
  preview: (asOf: string) =>
    queryOptions({
      queryKey: [...lapseWatchQueries.all(), 'preview', asOf] as const,
      queryFn: ({ signal }) => apiRequest('/api/lapse-watch/preview', lapseWatchPreviewSchema, { query: { asOf }, signal }),
    }),
  runs: () =>
    queryOptions({
      queryKey: [...lapseWatchQueries.all(), 'runs'] as const,
      queryFn: async ({ signal }) => (await apiRequest('/api/lapse-watch/runs', lapseWatchRunListSchema, { signal })).items,
    }),
  notices: (status?: 'pending' | 'sent' | 'failed' | 'superseded') =>
    queryOptions({
      queryKey: [...lapseWatchQueries.all(), 'notices', status ?? 'all'] as const,
      queryFn: async ({ signal }) => (await apiRequest('/api/lapse-watch/notices', lapseNoticeListSchema, { query: { status }, signal })).items,
    }),
  settings: () =>
    queryOptions({
      queryKey: ['settings'] as const,
      queryFn: ({ signal }) => apiRequest('/api/settings', companySettingsSchema, { signal }),
    }),
};

/** "Run for today": the job runs once, dated the company's today (the API refuses any other day), and sends what is due. */
export function useRunLapseWatch() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (asOf: string) => apiRequest('/api/lapse-watch/runs', lapseWatchRunSchema, { method: 'POST', body: { asOf } }),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: lapseWatchQueries.all() }),
        queryClient.invalidateQueries({ queryKey: ['overview'] }),
      ]),
    meta: { inlineErrors: true, successMessage: 'Lapse watch ran' },
  });
}

export function useUpdateSettings() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CompanySettingsInput) => apiRequest('/api/settings', companySettingsSchema, { method: 'PATCH', body: input }),
    onSuccess: (settings) => {
      queryClient.setQueryData(lapseWatchQueries.settings().queryKey, settings);
      return queryClient.invalidateQueries({ queryKey: ['overview'] });
    },
    meta: { inlineErrors: true, successMessage: 'Settings saved' },
  });
}
