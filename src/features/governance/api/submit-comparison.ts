import { useMutation, useQueryClient } from '@tanstack/react-query';
import { type z } from 'zod';
import { type Governance, governanceSchema, type submitInputSchema } from '@shared/governance';
import { api } from '@/lib/api-client';
import { afterStep } from '@/features/governance/lib/after-step';

type Input = z.input<typeof submitInputSchema>;

/** POST /api/comparisons/:id/submit (modeler): analysed → in review; e-mails the analysts. */
export async function submitComparison({ id, ...input }: Input & { id: number }): Promise<Governance> {
  return api.post(`/api/comparisons/${id}/submit`, input, { schema: governanceSchema });
}

export function useSubmitComparison(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: Input) => submitComparison({ id, ...input }),
    onSuccess: (governance) => afterStep(queryClient, id, governance),
  });
}
