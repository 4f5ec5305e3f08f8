import { type QueryClient } from '@tanstack/react-query';
import { type Governance } from '@shared/governance';
import { comparisonPart, queryKeys } from '@/lib/query-keys';

/**
 * After a workflow step: the answer is the new governance state; everything else under the
 * comparison (its detail and state, the audit trail, the notes) and the lists are refetched.
 * A step never changes a run's report, which keeps its cached copy.
 */
export function afterStep(queryClient: QueryClient, id: number, governance: Governance): Promise<unknown> {
  queryClient.setQueryData(queryKeys.comparisons.governance(id), governance);
  return Promise.all([
    queryClient.invalidateQueries({
      queryKey: queryKeys.comparisons.detail(id),
      predicate: (query) => !['report', 'governance'].includes(comparisonPart(query.queryKey) ?? ''),
    }),
    queryClient.invalidateQueries({ queryKey: queryKeys.comparisons.lists() }),
  ]);
}
