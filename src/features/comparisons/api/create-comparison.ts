import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { type CreateComparisonInput, comparisonStateSchema } from '@shared/comparisons';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

const createdSchema = z.object({ id: z.number().int(), state: comparisonStateSchema });

/**
 * POST /api/comparisons (modeler) → 201 { id, state }. Without a mapping the comparison is a draft
 * waiting for its mapping; with one it is checked (400 naming the row and column) and queued.
 */
export async function createComparison(input: CreateComparisonInput) {
  return api.post('/api/comparisons', input, { schema: createdSchema });
}

export function useCreateComparison() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createComparison,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: queryKeys.comparisons.lists() }),
  });
}
