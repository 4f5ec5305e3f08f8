import { queryOptions, useQuery } from '@tanstack/react-query';
import { type PolicyVersion, policyVersionSchema } from '@shared/governance';
import { api } from '@/lib/api-client';

/** GET /api/policy → the current adoption policy (its newest version), with who changed it, when and why. */
export async function getPolicy(): Promise<PolicyVersion> {
  return api.get('/api/policy', { schema: policyVersionSchema });
}

export const policyQueryOptions = () => queryOptions({ queryKey: ['policy', 'current'], queryFn: getPolicy });

export function usePolicy() {
  return useQuery(policyQueryOptions());
}
