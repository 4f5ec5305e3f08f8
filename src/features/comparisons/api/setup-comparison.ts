import { useMutation, useQueryClient } from '@tanstack/react-query';
import { type ComparisonDetail, type SetupComparisonInput, comparisonDetailSchema } from '@shared/comparisons';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/**
 * PUT /api/comparisons/:id/setup (modeler; draft, analysed or returned) { mapping, settings?,
 * holdoutId? } → the detail: checks the mapping and starts a new analysis run (earlier runs kept).
 */
export async function setupComparison({ id, ...input }: SetupComparisonInput & { id: number }): Promise<ComparisonDetail> {
  return api.put(`/api/comparisons/${id}/setup`, input, { schema: comparisonDetailSchema });
}

export function useSetupComparison() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: setupComparison,
    onSuccess: (detail) => {
      queryClient.setQueryData(queryKeys.comparisons.detail(detail.id), detail);
      return queryClient.invalidateQueries({ queryKey: queryKeys.comparisons.lists() });
    },
  });
}
