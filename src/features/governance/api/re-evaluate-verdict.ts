import { useMutation, useQueryClient } from '@tanstack/react-query';
import { type VerdictRecord, verdictRecordSchema } from '@shared/governance';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/** POST /api/comparisons/:id/verdicts (analyst, committee or admin): the current run under the current policy → a new verdict record. */
export async function reEvaluateVerdict(id: number): Promise<VerdictRecord> {
  return api.post(`/api/comparisons/${id}/verdicts`, {}, { schema: verdictRecordSchema });
}

export function useReEvaluateVerdict(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => reEvaluateVerdict(id),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: queryKeys.comparisons.governance(id) }),
        queryClient.invalidateQueries({ queryKey: queryKeys.comparisons.audit(id) }),
      ]),
  });
}
