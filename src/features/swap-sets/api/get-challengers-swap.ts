import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { type ChallengersSwapResult, challengersSwapResultSchema } from '@shared/comparisons';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/**
 * POST /api/comparisons/:id/challengers/swap { approvalRate } → every challenger's swap sets
 * against the champion at that approval rate, side by side, and who each model approves (any
 * signed-in person). A read, sent as POST for its body; cached like a query.
 */
export async function getChallengersSwap(id: number, approvalRate: number, signal?: AbortSignal): Promise<ChallengersSwapResult> {
  return api.post(`/api/comparisons/${id}/challengers/swap`, { approvalRate }, { schema: challengersSwapResultSchema, signal });
}

export const challengersSwapQueryOptions = (id: number, runId: number | null, approvalRate: number | null) =>
  queryOptions({
    queryKey: queryKeys.comparisons.challengersSwap(id, runId, approvalRate ?? Number.NaN),
    queryFn: ({ signal }) => getChallengersSwap(id, approvalRate!, signal),
    enabled: approvalRate !== null && runId !== null,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });

export function useChallengersSwap(id: number, runId: number | null, approvalRate: number | null) {
  return useQuery(challengersSwapQueryOptions(id, runId, approvalRate));
}
