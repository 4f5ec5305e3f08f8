import { describe, expect, it } from 'vitest';
import { locateCutoff } from '@server/stats/cutoffs';
import { preparePolicyData } from '@server/stats/policy-data';
import { makeHoldout } from './policy-fixtures';

// Scores 1, 2, 2, 3, 4 (higher = safer) for the champion, and the same five as PDs
// 0.4, 0.3, 0.3, 0.2, 0.1 (higher = riskier) for the challenger: the same ranking.
const data = preparePolicyData(
  makeHoldout({
    champion: [1, 2, 2, 3, 4],
    challenger: [0.4, 0.3, 0.3, 0.2, 0.1],
    bad: [1, 1, 0, 0, 0],
    higherIs: { champion: 'safer', challenger: 'riskier' },
  }),
  { bands: 2 },
);

describe('locateCutoff', () => {
  it('accepts the cut-off itself and everything on the safe side', () => {
    // Computed by hand: score ≥ 2 → 4 of 5; PD ≤ 0.3 → 4 of 5.
    expect(locateCutoff(data.champion, { cutoff: 2 }).position).toEqual({ cutoff: 2, approvalRate: 0.8 });
    expect(locateCutoff(data.challenger, { cutoff: 0.3 }).position).toEqual({ cutoff: 0.3, approvalRate: 0.8 });
    // Between score values: score ≥ 2.5 → 2 of 5; PD ≤ 0.25 → 2 of 5.
    expect(locateCutoff(data.champion, { cutoff: 2.5 }).position.approvalRate).toBe(0.4);
    expect(locateCutoff(data.challenger, { cutoff: 0.25 }).position.approvalRate).toBe(0.4);
  });

  it('picks the score of the k-th safest account, k = ⌈r·n⌉, and reports the rate ties give', () => {
    // Computed by hand: r = 0.4 → k = 2 → cut-off 3 (PD 0.2), 2 accepted.
    expect(locateCutoff(data.champion, { approvalRate: 0.4 }).position).toEqual({ cutoff: 3, approvalRate: 0.4 });
    expect(locateCutoff(data.challenger, { approvalRate: 0.4 }).position).toEqual({ cutoff: 0.2, approvalRate: 0.4 });
    // r = 0.6 → k = 3 → the third safest has score 2, tied with another: 4 accepted, 80%.
    expect(locateCutoff(data.champion, { approvalRate: 0.6 }).position).toEqual({ cutoff: 2, approvalRate: 0.8 });
    expect(locateCutoff(data.challenger, { approvalRate: 0.6 }).position).toEqual({ cutoff: 0.3, approvalRate: 0.8 });
    // r = 0.5 → k = ⌈2.5⌉ = 3: never below the target.
    expect(locateCutoff(data.champion, { approvalRate: 0.5 }).position.approvalRate).toBe(0.8);
  });

  it('treats r·n within rounding of an integer as that integer', () => {
    // 0.7 · 10 and 0.3 · 10 in binary floating point: k must be 7 and 3, not 8 and 4 (by hand).
    const ten = preparePolicyData(makeHoldout({ champion: [1, 2, 3, 4, 5, 6, 7, 8, 9, 10], challenger: [1, 2, 3, 4, 5, 6, 7, 8, 9, 10], bad: [1, 0, 0, 0, 0, 0, 0, 0, 0, 0] }), { bands: 2 });
    expect(locateCutoff(ten.champion, { approvalRate: 0.7 }).accepted).toBe(7);
    expect(locateCutoff(ten.champion, { approvalRate: 0.3 }).accepted).toBe(3);
    expect(locateCutoff(ten.champion, { approvalRate: 0.07 * 10 }).accepted).toBe(7);
    expect(locateCutoff(ten.champion, { approvalRate: 0.71 }).accepted).toBe(8);
  });

  it('accepts nobody at 0% and everybody at 100%', () => {
    const none = locateCutoff(data.champion, { approvalRate: 0 });
    expect(none.accepted).toBe(0);
    expect(none.position.approvalRate).toBe(0);
    expect(none.position.cutoff).toBeGreaterThan(4); // just beyond the safest score
    expect(locateCutoff(data.champion, { cutoff: none.position.cutoff }).accepted).toBe(0);
    const noneRiskier = locateCutoff(data.challenger, { approvalRate: 0 });
    expect(noneRiskier.accepted).toBe(0);
    expect(noneRiskier.position.cutoff).toBeLessThan(0.1);
    expect(locateCutoff(data.champion, { approvalRate: 1 }).position).toEqual({ cutoff: 1, approvalRate: 1 });
    expect(locateCutoff(data.challenger, { approvalRate: 1 }).position).toEqual({ cutoff: 0.4, approvalRate: 1 });
  });

  it('rejects rates outside [0, 1] and cut-offs that are not numbers', () => {
    expect(() => locateCutoff(data.champion, { approvalRate: 1.2 })).toThrow(/between 0 and 1/);
    expect(() => locateCutoff(data.champion, { cutoff: Number.NaN })).toThrow(/finite/);
  });
});
