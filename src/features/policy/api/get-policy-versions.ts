import { queryOptions } from '@tanstack/react-query';
import { type PolicyVersion, policyVersionsSchema } from '@shared/governance';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/** GET /api/policy/versions → every version of the adoption policy, newest first. */
export async function getPolicyVersions(): Promise<PolicyVersion[]> {
  return (await api.get('/api/policy/versions', { schema: policyVersionsSchema })).versions;
}

export const policyVersionsQueryOptions = () => queryOptions({ queryKey: queryKeys.policy.versions(), queryFn: getPolicyVersions });
