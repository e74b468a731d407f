import { z } from 'zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { continuityQueries } from './continuity-queries';

const reviewedSchema = z.object({ id: z.string(), reviewStatus: z.string().nullable() });

/** The QA manager marks use logged while lapsed as reviewed, with a note on what was done with the welds. */
export function useReviewEntry() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, note }: { id: string; note: string }) =>
      apiRequest(`/api/continuity/entries/${encodeURIComponent(id)}/review`, reviewedSchema, { method: 'POST', body: { note } }),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: continuityQueries.all() }),
        queryClient.invalidateQueries({ queryKey: ['overview'] }),
      ]),
    meta: { inlineErrors: true, successMessage: 'Entry marked reviewed' },
  });
}
