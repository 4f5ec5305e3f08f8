import { queryOptions } from '@tanstack/react-query';
import { type PolicyVersion, policyVersionSchema } from '@shared/governance';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/** GET /api/policy → the current adoption policy (its newest version), with who changed it, when and why. */
export async function getPolicy(): Promise<PolicyVersion> {
  return api.get('/api/policy', { schema: policyVersionSchema });
}

export const policyQueryOptions = () => queryOptions({ queryKey: queryKeys.policy.current(), queryFn: getPolicy });
