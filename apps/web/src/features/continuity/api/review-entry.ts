import { z } from 'zod';
import type { ReviewInput } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { continuityQueries } from './continuity-queries';

const reviewedSchema = z.object({ id: z.string(), reviewStatus: z.string().nullable() });

/** The QA manager closes use logged while lapsed with a decision about the welds and a note. */
export function useReviewEntry() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...body }: ReviewInput & { id: string }) =>
      apiRequest(`/api/continuity/entries/${encodeURIComponent(id)}/review`, reviewedSchema, { method: 'POST', body }),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: continuityQueries.all() }),
        queryClient.invalidateQueries({ queryKey: ['overview'] }),
      ]),
    meta: { inlineErrors: true, successMessage: 'Entry marked reviewed' },
  });
}
