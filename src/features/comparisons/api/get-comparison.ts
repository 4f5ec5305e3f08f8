import { queryOptions } from '@tanstack/react-query';
import { type ComparisonDetail, comparisonDetailSchema } from '@shared/comparisons';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/** GET /api/comparisons/:id → the comparison with its runs, newest first (any signed-in person). */
export async function getComparison(id: number): Promise<ComparisonDetail> {
  return api.get(`/api/comparisons/${id}`, { schema: comparisonDetailSchema });
}

/** True while the newest run waits or works: the page then polls for its progress. */
export function isRunActive(comparison: Pick<ComparisonDetail, 'latestRun'> | undefined): boolean {
  const status = comparison?.latestRun?.status;
  return status === 'queued' || status === 'running';
}

/** How often to ask about a running analysis, in milliseconds. */
export const ANALYSIS_POLL_MS = 1000;

export const comparisonQueryOptions = (id: number) =>
  queryOptions({
    queryKey: queryKeys.comparisons.detail(id),
    queryFn: () => getComparison(id),
    refetchInterval: (query) => (isRunActive(query.state.data) ? ANALYSIS_POLL_MS : false),
    // A background tab keeps following the run, so the verdict is there when the person returns.
    refetchIntervalInBackground: true,
  });
