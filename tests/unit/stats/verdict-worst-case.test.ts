import { describe, expect, it } from 'vitest';
import { type AdoptionPolicy, defaultAdoptionPolicy } from '@shared/policy';
import type { SwapCell, SwapSets } from '@shared/report';
import { verdict, type VerdictEvidence } from '@server/stats/verdict';

/**
 * The swap rule's "must also hold at the worst case" (policy swapRule.worstCase): with applicants
 * without an outcome, the swap-in's upper bound (every unknown applicant bad) must also be at most
 * the swap-out's lower bound (every unknown applicant good). Swap sets written by hand:
 *   swap-in   100 accounts, 80 with an outcome (4 bads), 20 without; the column infers 2 bads:
 *             known 4/80 = 5%, inferred 6/100 = 6%, bounds 4/100 = 4% to 24/100 = 24%;
 *   swap-out  100 accounts, all with an outcome, 10 bads: 10%, bounds 10% to 10%.
 * The central rule holds (6% ≤ 10%); the worst case does not (24% > 10%).
 */
function cell(accounts: number, known: number, bads: number, inferredBads: number, share: number): SwapCell {
  const unknown = accounts - known;
  return {
    count: accounts,
    share,
    bads,
    badRate: known > 0 ? bads / known : null,
    badRateCi: null,
    amount: null,
    accounts,
    known,
    unknown,
    badRateBounds: [bads / accounts, (bads + unknown) / accounts],
    inferred: { method: 'column', bads: inferredBads, badRate: inferredBads / accounts },
  };
}

const swap: SwapSets = {
  basis: 'approval-rate',
  requestedApprovalRate: 0.7,
  champion: { cutoff: 600, approvalRate: 0.7 },
  challenger: { cutoff: 610, approvalRate: 0.7 },
  bothAccept: cell(500, 500, 10, 10, 0.5),
  swapIn: cell(100, 80, 4, 6, 0.1),
  swapOut: cell(100, 100, 10, 10, 0.1),
  bothReject: cell(300, 0, 0, 60, 0.3),
  test: { method: 'two-proportion-z', z: null, p: null, reason: null },
  bySegment: [],
};

const evidence: VerdictEvidence = {
  bads: 1000,
  settings: { bootstrap: 0, seed: 1, confidence: 0.95, approvalRate: 0.7, cutoffs: null, dropMissing: false, bands: 10, rejectInference: { method: 'column', parcelFactor: 1 } },
  difference: { gini: 0.05, giniSe: 0.01, giniCi: [0.03, 0.07], z: 5, pOneSided: 3e-7, pTwoSided: 6e-7, ks: 0.03, ksCi: null, giniBootstrapCi: null },
  swap,
} as VerdictEvidence;

const policy = (worstCase: boolean | undefined): AdoptionPolicy => ({ ...defaultAdoptionPolicy, swapRule: { enabled: true, approvalRate: 0.7, ...(worstCase === undefined ? {} : { worstCase }) } });
const swapCriterion = (worstCase: boolean | undefined) => verdict(evidence, policy(worstCase), swap).criteria.find((criterion) => criterion.id === 'swap-bad-rate')!;

describe('the swap rule at the worst case', () => {
  it('is met on the inferred rates without the option (absent or false)', () => {
    for (const option of [undefined, false]) {
      const criterion = swapCriterion(option);
      expect(criterion.met).toBe(true);
      expect(criterion.label).not.toContain('worst case');
      expect(criterion.detail).toContain('6.0% inferred');
    }
  });

  it('fails with the option: the swap-in up to 24% against the swap-out down to 10%', () => {
    const criterion = swapCriterion(true);
    expect(criterion.met).toBe(false);
    expect(criterion.label).toBe('Swap-in bad rate not above swap-out (the inferred-bad column, and at the worst case)');
    expect(criterion.detail).toContain('at the worst case (swap-in up to 24.0%, swap-out down to 10.0%) it does not hold');
  });

  it('makes the verdict not proven only through that criterion', () => {
    const without = verdict(evidence, policy(false), swap);
    const withOption = verdict(evidence, policy(true), swap);
    expect(withOption.outcome).not.toBe(without.outcome);
    expect(withOption.outcome).toBe('not-proven');
    const others = (v: typeof without) => v.criteria.filter((criterion) => criterion.id !== 'swap-bad-rate').map((criterion) => [criterion.id, criterion.met]);
    expect(others(withOption)).toEqual(others(without));
  });

  it('holds at the worst case when the bounds do not overlap', () => {
    // Swap-in 100 accounts, 95 known with 2 bads, 5 unknown: bounds 2% to 7%, below the swap-out's 10%.
    const narrow = { ...swap, swapIn: cell(100, 95, 2, 3, 0.1) };
    const criterion = verdict(evidence, policy(true), narrow).criteria.find((c) => c.id === 'swap-bad-rate')!;
    expect(criterion.met).toBe(true);
    expect(criterion.detail).toContain('at the worst case (swap-in up to 7.0%, swap-out down to 10.0%) it still holds');
  });
});
