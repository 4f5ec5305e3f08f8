import { type QueryKey } from '@tanstack/react-query';

/**
 * Every query key of the client, from one factory, hierarchical so that a mutation invalidates by
 * prefix: `queryKeys.comparisons.detail(7)` is a prefix of that comparison's report, governance,
 * audit trail, notes, scenarios and swap sets. Keys are never written as literal arrays elsewhere.
 */
export const queryKeys = {
  auth: {
    me: ['auth', 'me'] as const,
    token: (token: string) => ['auth', 'tokens', token] as const,
  },
  users: {
    all: ['users'] as const,
    list: () => ['users', 'list'] as const,
  },
  policy: {
    all: ['policy'] as const,
    current: () => ['policy', 'current'] as const,
    versions: () => ['policy', 'versions'] as const,
  },
  holdouts: {
    detail: (id: number) => ['holdouts', 'detail', id] as const,
  },
  outbox: {
    list: (params: unknown) => ['outbox', 'list', params] as const,
  },
  comparisons: {
    all: ['comparisons'] as const,
    lists: () => ['comparisons', 'list'] as const,
    list: (params: unknown) => ['comparisons', 'list', params] as const,
    detail: (id: number) => ['comparisons', 'detail', id] as const,
    report: (id: number, runId: number | null) => ['comparisons', 'detail', id, 'report', runId] as const,
    governance: (id: number) => ['comparisons', 'detail', id, 'governance'] as const,
    audit: (id: number) => ['comparisons', 'detail', id, 'audit'] as const,
    notes: (id: number) => ['comparisons', 'detail', id, 'notes'] as const,
    scenarios: (id: number) => ['comparisons', 'detail', id, 'scenarios'] as const,
    swap: (id: number, runId: number | null, query: unknown) => ['comparisons', 'detail', id, 'swap', runId, query] as const,
    challengersSwap: (id: number, runId: number | null, approvalRate: number) => ['comparisons', 'detail', id, 'challengers-swap', runId, approvalRate] as const,
    mixedStrategy: (id: number, runId: number | null, query: unknown) => ['comparisons', 'detail', id, 'mixed-strategy', runId, query] as const,
  },
};

/** Which part of one comparison a key under `queryKeys.comparisons.detail(id)` names ('report', 'governance', …); null for the detail itself. */
export function comparisonPart(key: QueryKey): string | null {
  return key[0] === 'comparisons' && key[1] === 'detail' && typeof key[3] === 'string' ? key[3] : null;
}
