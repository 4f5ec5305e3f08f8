import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { type SwapQuery, type SwapResult, swapResultSchema } from '@shared/comparisons';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/**
 * POST /api/comparisons/:id/swap { cutoffs } | { approvalRate } → swap sets, swap matrix and the
 * strategy-curve position at those settings (any signed-in person). A read, sent as POST for its
 * body; cached like a query, keyed by the settings.
 */
export async function getSwap(id: number, query: SwapQuery, signal?: AbortSignal): Promise<SwapResult> {
  return api.post(`/api/comparisons/${id}/swap`, query, { schema: swapResultSchema, signal });
}

export const swapQueryOptions = (id: number, runId: number | null, query: SwapQuery | null) =>
  queryOptions({
    queryKey: queryKeys.comparisons.swap(id, runId, query),
    queryFn: ({ signal }) => getSwap(id, query!, signal),
    enabled: query !== null && runId !== null,
    // Moving a slider keeps the last table on screen until the new one arrives.
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });

export function useSwap(id: number, runId: number | null, query: SwapQuery | null) {
  return useQuery(swapQueryOptions(id, runId, query));
}
