import { useMutation, useQueryClient } from '@tanstack/react-query';
import { type z } from 'zod';
import { type Governance, governanceSchema, type voteInputSchema } from '@shared/governance';
import { api } from '@/lib/api-client';
import { afterStep } from '@/features/governance/lib/after-step';

type Input = z.input<typeof voteInputSchema>;

/** POST /api/comparisons/:id/votes (committee, not the creator; validated): a new vote replaces the member's earlier one. */
export async function castVote({ id, ...input }: Input & { id: number }): Promise<Governance> {
  return api.post(`/api/comparisons/${id}/votes`, input, { schema: governanceSchema });
}

export function useCastVote(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: Input) => castVote({ id, ...input }),
    onSuccess: (governance) => afterStep(queryClient, id, governance),
  });
}
