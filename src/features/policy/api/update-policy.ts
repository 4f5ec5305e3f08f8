import { useMutation, useQueryClient } from '@tanstack/react-query';
import { type PolicyUpdate, type PolicyVersion, policyVersionSchema } from '@shared/governance';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/** PUT /api/policy (admin): the fields and a reason → a new version; earlier versions never change. */
export async function updatePolicy(input: PolicyUpdate): Promise<PolicyVersion> {
  return api.put('/api/policy', input, { schema: policyVersionSchema });
}

export function useUpdatePolicy() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updatePolicy,
    onSuccess: (version) => {
      queryClient.setQueryData(queryKeys.policy.current(), version);
      return queryClient.invalidateQueries({ queryKey: queryKeys.policy.all });
    },
  });
}
