import { useMutation, useQueryClient } from '@tanstack/react-query';
import { type Scenario, type ScenarioInput, scenarioSchema } from '@shared/comparisons';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/** POST /api/comparisons/:id/scenarios (policy role) → 201 the scenario, with its swap-in and swap-out. */
export async function createScenario({ id, ...input }: ScenarioInput & { id: number }): Promise<Scenario> {
  return api.post(`/api/comparisons/${id}/scenarios`, input, { schema: scenarioSchema });
}

export function useCreateScenario() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createScenario,
    onSuccess: (_scenario, { id }) => queryClient.invalidateQueries({ queryKey: queryKeys.comparisons.scenarios(id) }),
  });
}
