import { useMutation, useQueryClient } from '@tanstack/react-query';
import { type z } from 'zod';
import { type Governance, governanceSchema, type reviewInputSchema } from '@shared/governance';
import { api } from '@/lib/api-client';
import { afterStep } from '@/features/governance/lib/after-step';

type Input = z.input<typeof reviewInputSchema>;

/** POST /api/comparisons/:id/review (analyst, not the creator): in review → validated or returned, with findings. */
export async function reviewComparison({ id, ...input }: Input & { id: number }): Promise<Governance> {
  return api.post(`/api/comparisons/${id}/review`, input, { schema: governanceSchema });
}

export function useReviewComparison(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: Input) => reviewComparison({ id, ...input }),
    onSuccess: (governance) => afterStep(queryClient, id, governance),
  });
}
