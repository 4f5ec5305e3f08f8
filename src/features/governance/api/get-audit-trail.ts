import { queryOptions } from '@tanstack/react-query';
import { type z } from 'zod';
import { auditTrailSchema } from '@shared/governance';
import { pageLimitMax } from '@shared/paging';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

export type AuditTrail = z.infer<typeof auditTrailSchema>;

/** GET /api/comparisons/:id/audit → the comparison's events in order (every page), and whether the hash chain verifies. */
export async function getAuditTrail(id: number): Promise<AuditTrail> {
  const first = await api.get(`/api/comparisons/${id}/audit?limit=${pageLimitMax}`, { schema: auditTrailSchema });
  const events = [...first.events];
  let { chainValid, nextAfter } = first;
  while (nextAfter !== null && nextAfter !== undefined) {
    const page = await api.get(`/api/comparisons/${id}/audit?after=${nextAfter}&limit=${pageLimitMax}`, { schema: auditTrailSchema });
    events.push(...page.events);
    chainValid &&= page.chainValid;
    nextAfter = page.nextAfter;
  }
  return { events, chainValid, nextAfter: null };
}

export const auditTrailQueryOptions = (id: number) =>
  queryOptions({ queryKey: queryKeys.comparisons.audit(id), queryFn: () => getAuditTrail(id) });
