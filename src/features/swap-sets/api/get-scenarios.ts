import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { type Scenario, scenarioSchema } from '@shared/comparisons';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

const scenariosResponseSchema = z.object({ scenarios: z.array(scenarioSchema) });

/** GET /api/comparisons/:id/scenarios → the saved cut-off scenarios (any signed-in person). */
export async function getScenarios(id: number): Promise<Scenario[]> {
  return (await api.get(`/api/comparisons/${id}/scenarios`, { schema: scenariosResponseSchema })).scenarios;
}

export const scenariosQueryOptions = (id: number) =>
  queryOptions({ queryKey: queryKeys.comparisons.scenarios(id), queryFn: () => getScenarios(id) });

export function useScenarios(id: number) {
  return useQuery(scenariosQueryOptions(id));
}
