import { queryOptions } from '@tanstack/react-query';
import { type Governance, governanceSchema } from '@shared/governance';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/** GET /api/comparisons/:id/governance → state, reviews, the current round's votes, the decision, verdict records, quorum. */
export async function getGovernance(id: number): Promise<Governance> {
  return api.get(`/api/comparisons/${id}/governance`, { schema: governanceSchema });
}

export const governanceQueryOptions = (id: number) =>
  queryOptions({ queryKey: queryKeys.comparisons.governance(id), queryFn: () => getGovernance(id) });
