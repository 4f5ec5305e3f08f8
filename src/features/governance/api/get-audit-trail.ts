import { queryOptions, useQuery } from '@tanstack/react-query';
import { type z } from 'zod';
import { auditTrailSchema } from '@shared/governance';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

export type AuditTrail = z.infer<typeof auditTrailSchema>;

/** GET /api/comparisons/:id/audit → the comparison's events in order, and whether the whole hash chain verifies. */
export async function getAuditTrail(id: number): Promise<AuditTrail> {
  return api.get(`/api/comparisons/${id}/audit`, { schema: auditTrailSchema });
}

export const auditTrailQueryOptions = (id: number) =>
  queryOptions({ queryKey: queryKeys.comparisons.audit(id), queryFn: () => getAuditTrail(id) });

export function useAuditTrail(id: number) {
  return useQuery(auditTrailQueryOptions(id));
}
