import { describe, expect, it } from 'vitest';
import { comparisonPart, queryKeys } from '@/lib/query-keys';

// The query-key factory (src/lib/query-keys.ts): invalidating by prefix only works if every key of
// a comparison starts with its detail key, and a list key never does.

const startsWith = (key: readonly unknown[], prefix: readonly unknown[]) => prefix.every((part, index) => Object.is(key[index], part));

describe('query keys', () => {
  it("put every part of a comparison under its detail key, and nothing of another comparison's", () => {
    const detail = queryKeys.comparisons.detail(7);
    const parts = [
      queryKeys.comparisons.report(7, 3),
      queryKeys.comparisons.governance(7),
      queryKeys.comparisons.audit(7),
      queryKeys.comparisons.notes(7),
      queryKeys.comparisons.scenarios(7),
      queryKeys.comparisons.swap(7, 3, { approvalRate: 0.7 }),
      queryKeys.comparisons.mixedStrategy(7, 3, { keepChampion: [] }),
    ];
    for (const key of parts) {
      expect(startsWith(key, detail)).toBe(true);
      expect(startsWith(key, queryKeys.comparisons.detail(70))).toBe(false);
    }
    expect(parts.map(comparisonPart)).toEqual(['report', 'governance', 'audit', 'notes', 'scenarios', 'swap', 'mixed-strategy']);
    expect(comparisonPart(detail)).toBeNull();
    expect(startsWith(queryKeys.comparisons.list({ page: 1 }), queryKeys.comparisons.lists())).toBe(true);
    expect(startsWith(queryKeys.comparisons.list({ page: 1 }), detail)).toBe(false);
  });

  it('keeps each area under its own first part, so signing out can keep only the person', () => {
    expect(queryKeys.auth.me).toEqual(['auth', 'me']);
    expect(startsWith(queryKeys.users.list(), queryKeys.users.all)).toBe(true);
    expect(startsWith(queryKeys.policy.versions(), queryKeys.policy.all)).toBe(true);
    expect(startsWith(queryKeys.policy.current(), queryKeys.policy.all)).toBe(true);
  });
});
