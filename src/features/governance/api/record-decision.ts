import { useMutation, useQueryClient } from '@tanstack/react-query';
import { type z } from 'zod';
import { type Governance, governanceSchema, type decisionInputSchema } from '@shared/governance';
import { api } from '@/lib/api-client';
import { afterStep } from '@/features/governance/lib/after-step';

type Input = z.input<typeof decisionInputSchema>;

/** POST /api/comparisons/:id/decision (committee, not the creator; validated; the policy's quorum) → decided. */
export async function recordDecision({ id, ...input }: Input & { id: number }): Promise<Governance> {
  return api.post(`/api/comparisons/${id}/decision`, input, { schema: governanceSchema });
}

export function useRecordDecision(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: Input) => recordDecision({ id, ...input }),
    onSuccess: (governance) => afterStep(queryClient, id, governance),
  });
}
