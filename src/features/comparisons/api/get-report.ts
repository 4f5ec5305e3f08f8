import { queryOptions, useQuery } from '@tanstack/react-query';
import { type Report, reportSchema } from '@shared/report';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/**
 * GET /api/comparisons/:id/report → the Report of the comparison's current run; 409 while no run
 * is done. The run id is part of the key: a run's report never changes, a new run is a new report.
 */
export async function getReport(id: number): Promise<Report> {
  return api.get(`/api/comparisons/${id}/report`, { schema: reportSchema });
}

export const reportQueryOptions = (id: number, runId: number | null) =>
  queryOptions({
    queryKey: queryKeys.comparisons.report(id, runId),
    queryFn: () => getReport(id),
    enabled: runId !== null,
    staleTime: Infinity,
  });

export function useReport(id: number, runId: number | null) {
  return useQuery(reportQueryOptions(id, runId));
}
