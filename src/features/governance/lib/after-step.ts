import { type QueryClient } from '@tanstack/react-query';
import { type Governance } from '@shared/governance';

/**
 * After a workflow step: the answer is the new governance state; everything else under the
 * comparison (its detail and state, the audit trail, the notes) and the lists are refetched.
 * A step never changes a run's report, which keeps its cached copy.
 */
export function afterStep(queryClient: QueryClient, id: number, governance: Governance): Promise<unknown> {
  queryClient.setQueryData(['comparisons', 'detail', id, 'governance'], governance);
  return Promise.all([
    queryClient.invalidateQueries({
      queryKey: ['comparisons', 'detail', id],
      predicate: (query) => query.queryKey[3] !== 'report' && query.queryKey[3] !== 'governance',
    }),
    queryClient.invalidateQueries({ queryKey: ['comparisons', 'list'] }),
  ]);
}
