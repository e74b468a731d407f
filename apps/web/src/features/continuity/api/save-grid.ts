import { gridSchema, type GridSaveBody } from '@beadroll/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '@/lib/api-client';
import { continuityQueries } from './continuity-queries';

/** One save for the month: the whole change set in one PUT; statuses everywhere are refetched after it. */
export function useSaveGrid() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: GridSaveBody) => apiRequest('/api/continuity/grid', gridSchema, { method: 'PUT', body }),
    onSuccess: (grid) => {
      queryClient.setQueryData(continuityQueries.grid(grid.shop.id, grid.month).queryKey, grid);
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: ['welders'] }),
        queryClient.invalidateQueries({ queryKey: ['overview'] }),
      ]);
    },
    meta: { inlineErrors: true, successMessage: 'Month saved' },
  });
}
