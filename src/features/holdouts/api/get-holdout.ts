import { queryOptions } from '@tanstack/react-query';
import { type HoldoutInfo, holdoutSchema } from '@shared/comparisons';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

/** GET /api/holdouts/:id → the holdout: columns, preview rows and the guessed mapping. */
export async function getHoldout(id: number): Promise<HoldoutInfo> {
  return api.get(`/api/holdouts/${id}`, { schema: holdoutSchema });
}

export const holdoutQueryOptions = (id: number) =>
  // A stored holdout never changes.
  queryOptions({ queryKey: queryKeys.holdouts.detail(id), queryFn: () => getHoldout(id), staleTime: Infinity });
