import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { type MixedStrategyQuery, type MixedStrategyResult, mixedStrategyResultSchema } from '@shared/mixed-strategy';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/**
 * POST /api/comparisons/:id/mixed-strategy { keepChampion, approvalRate? } → the mixed strategy
 * beside the champion and pure adoption, on the current run (policy role and committee). A read,
 * sent as POST for its body; cached like a query, keyed by the chosen values.
 */
export async function getMixedStrategy(id: number, query: MixedStrategyQuery, signal?: AbortSignal): Promise<MixedStrategyResult> {
  return api.post(`/api/comparisons/${id}/mixed-strategy`, query, { schema: mixedStrategyResultSchema, signal });
}

export const mixedStrategyQueryOptions = (id: number, runId: number | null, query: MixedStrategyQuery | null) =>
  queryOptions({
    queryKey: queryKeys.comparisons.mixedStrategy(id, runId, query),
    queryFn: ({ signal }) => getMixedStrategy(id, query!, signal),
    enabled: query !== null && runId !== null,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });

export function useMixedStrategy(id: number, runId: number | null, query: MixedStrategyQuery | null) {
  return useQuery(mixedStrategyQueryOptions(id, runId, query));
}
