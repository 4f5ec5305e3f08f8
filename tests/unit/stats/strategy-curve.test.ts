import { readFileSync } from 'node:fs';
import { equalApprovalSentence } from '@shared/equal-approval-words';
import { strategyCurveSchema } from '@shared/report';
import { describe, expect, it } from 'vitest';
import { preparePolicyData } from '@server/stats/policy-data';
import { strategyCurve } from '@server/stats/strategy-curve';
import { makeHoldout } from './policy-fixtures';

// The ten accounts of swap-sets.test.ts.
const data = preparePolicyData(
  makeHoldout({
    champion: [10, 20, 30, 40, 50, 60, 70, 80, 90, 100],
    challenger: [0.9, 0.1, 0.8, 0.2, 0.7, 0.3, 0.6, 0.4, 0.5, 0.05],
    bad: [1, 0, 1, 0, 1, 1, 0, 0, 1, 0],
    higherIs: { champion: 'safer', challenger: 'riskier' },
  }),
  { bands: 2 },
);

describe('strategyCurve', () => {
  it('has a point for every whole percent and the report rate, in order', () => {
    const curve = strategyCurve(data, 0.305);
    expect(strategyCurveSchema.parse(curve)).toEqual(curve);
    expect(curve.points).toHaveLength(101);
    expect(curve.points.map((p) => p.approvalRate).slice(29, 32)).toEqual([0.3, 0.305, 0.31]);
    expect(strategyCurve(data, 0.3).points).toHaveLength(100);
  });

  it('gives portfolio and marginal bad rates computed by hand', () => {
    const curve = strategyCurve(data, 0.3);
    const at = (rate: number) => curve.points.find((p) => p.approvalRate === rate)!;
    // Champion safest first: 100 g, 90 B, 80 g, 70 g, 60 B, … (computed by hand). With n = 10,
    // 1% already needs k = ⌈0.1⌉ = 1 account, and 2% … 10% the same one: they add nobody.
    expect(at(0.01).champion).toEqual({ cutoff: 100, achievedApprovalRate: 0.1, portfolioBadRate: 0, marginalBadRate: 0 });
    expect(at(0.1).champion).toEqual({ cutoff: 100, achievedApprovalRate: 0.1, portfolioBadRate: 0, marginalBadRate: null });
    // 11% needs k = 2: it adds account 90, a bad (marginal 1); 12% … 20% add nobody.
    expect(at(0.11).champion).toEqual({ cutoff: 90, achievedApprovalRate: 0.2, portfolioBadRate: 0.5, marginalBadRate: 1 });
    expect(at(0.2).champion).toEqual({ cutoff: 90, achievedApprovalRate: 0.2, portfolioBadRate: 0.5, marginalBadRate: null });
    // Challenger lowest PDs first: 0.05 g, 0.1 g, 0.2 g, 0.3 B, 0.4 g.
    expect(at(0.4).challenger).toMatchObject({ cutoff: 0.3, achievedApprovalRate: 0.4, portfolioBadRate: 0.25 });
    expect(at(1).champion).toMatchObject({ cutoff: 10, achievedApprovalRate: 1, portfolioBadRate: 0.5 });
  });

  it('counts bads avoided at equal approval and approvals gained at equal bad rate', () => {
    const { atApprovalRate } = strategyCurve(data, 0.3);
    // Computed by hand at 30%: champion approves 100, 90, 80 (1 bad); challenger 0.05, 0.1, 0.2 (0 bads),
    // the same 3 accounts, no ties.
    // Challenger books by size and bads: 4/1, 5/1, 6/2, 7/2, 8/3 …; the largest with a bad rate
    // ≤ 1/3 is 7 accounts (2/7); the next account (0.7) is a bad: 3/8 > 1/3 whole, and a part f of
    // it gives (2 + f)/(7 + f) ≤ 1/3 ⇔ f ≤ 1/2, so 7.5 − 3 = 4.5 approvals gained.
    expect(atApprovalRate).toEqual({
      approvalRate: 0.3,
      accounts: 3,
      championBads: 1,
      challengerBads: 0,
      badsAvoided: 1,
      challengerAtCutoff: { accounts: 3, bads: 0 },
      approvalsGainedAtEqualBadRate: 4.5,
    });
  });

  it('compares books of the same size when ties make the two cut-offs approve different numbers (by hand)', () => {
    // Ten accounts, both scores higher = safer:
    //   account   1  2  3  4  5  6  7  8  9  10
    //   champion  9  8  8  8  5  4  3  2  1  0
    //   challenger 10 6 6  9  6  6  1  3  1  1
    //   bad       0  1  1  0  1  0  1  0  1  1
    const tied = preparePolicyData(
      makeHoldout({ champion: [9, 8, 8, 8, 5, 4, 3, 2, 1, 0], challenger: [10, 6, 6, 9, 6, 6, 1, 3, 1, 1], bad: [0, 1, 1, 0, 1, 0, 1, 0, 1, 1] }),
      { bands: 2 },
    );
    const { atApprovalRate } = strategyCurve(tied, 0.3);
    // Champion at 30%: k = ⌈0.3 · 10⌉ = 3, the 3rd safest score is 8, tied three times, so the book
    // is accounts 1–4: N = 4 accounts, bads 2 and 3 → 2 bads.
    // Challenger at 30%: the 3rd safest score is 6 (after 10 and 9), tied four times (accounts 2, 3,
    // 5, 6 with 3 bads): its own cut-off approves 6 accounts with 3 bads — two more than the champion.
    // At N = 4: accounts 1 and 4 (0 bads) and 2 of the 4 tied accounts, in proportion 2/4 · 3 = 1.5
    // bads; bads avoided 2 − 1.5 = 0.5 (the unequal books would say 2 − 3 = −1).
    // Equal bad rate R = 2/4: the whole challenger books of 10 (6/10) fail; of 7 (accounts 1, 4, 2,
    // 3, 5, 6, 8: 3 bads) pass; a part f of the riskiest block (accounts 7, 9, 10, all bad) gives
    // (3 + 3f)/(7 + 3f) ≤ 1/2 ⇔ 6 + 6f ≤ 7 + 3f ⇔ f ≤ 1/3: a book of 7 + 1 = 8, gained 8 − 4 = 4.
    expect(atApprovalRate).toEqual({
      approvalRate: 0.3,
      accounts: 4,
      championBads: 2,
      challengerBads: 1.5,
      badsAvoided: 0.5,
      challengerAtCutoff: { accounts: 6, bads: 3 },
      approvalsGainedAtEqualBadRate: 4,
    });
  });

  it('counts inferred bads for applicants without an outcome, and cautions when it cannot (by hand)', () => {
    // Four accounts, both models higher = safer. Champion safest first: 1, 2, 3, 4; challenger: 3, 1, 4, 2.
    // Account 3 has no outcome (the champion declined it), inferred probability of bad 0.5; account 2 is bad.
    //   account     1     2     3     4
    //   champion    4     3     2     1
    //   challenger  3     1     4     2
    //   bad         0     1     —     0
    const base = makeHoldout({ champion: [4, 3, 2, 1], challenger: [3, 1, 4, 2], bad: [0, 1, 0, 0] });
    base.known = Uint8Array.from([1, 1, 0, 1]);
    base.inferredBad = Float64Array.from([0, 0, 0.5, 0]);
    // At 50%: the champion approves 1 and 2 (1 bad); the challenger's 2 safest are 3 and 1.
    // Known only: the challenger's book holds 0 known bads (account 3 counts as none): 1 avoided, flattered.
    const knownOnly = strategyCurve(preparePolicyData(base, { bands: 2 }), 0.5).atApprovalRate;
    expect(knownOnly).toMatchObject({ bads: 'known-only', accounts: 2, championBads: 1, challengerBads: 0, badsAvoided: 1 });
    expect(equalApprovalSentence(knownOnly)).toContain('Caution: only bads with a known outcome are counted');
    // Inferred by column: account 3 counts 0.5 bads, so the challenger's book holds 0.5: 0.5 avoided.
    const inferred = strategyCurve(preparePolicyData(base, { bands: 2, inference: { method: 'column', parcelFactor: 1 } }), 0.5).atApprovalRate;
    expect(inferred).toMatchObject({ bads: 'inferred', accounts: 2, championBads: 1, challengerBads: 0.5, badsAvoided: 0.5 });
    expect(equalApprovalSentence(inferred)).toContain('Bads include those inferred');
    // Every outcome known: no basis field, so plain reports read as before.
    expect(strategyCurve(preparePolicyData(makeHoldout({ champion: [4, 3, 2, 1], challenger: [3, 1, 4, 2], bad: [0, 1, 0, 0] }), { bands: 2 }), 0.5).atApprovalRate.bads).toBeUndefined();
  });

  it('is null for approvals gained when no challenger book reaches the champion bad rate', () => {
    // Champion accepts a bad-free account first; the challenger's safest account is bad (by hand).
    const worse = preparePolicyData(makeHoldout({ champion: [1, 2, 3, 4], challenger: [4, 3, 2, 1], bad: [1, 1, 0, 0] }), { bands: 2 });
    expect(strategyCurve(worse, 0.25).atApprovalRate).toEqual({
      approvalRate: 0.25,
      accounts: 1,
      championBads: 0,
      challengerBads: 1,
      badsAvoided: -1,
      challengerAtCutoff: { accounts: 1, bads: 1 },
      approvalsGainedAtEqualBadRate: null,
    });
  });

  it('agrees with an independent numpy implementation on a 3,000-account holdout', () => {
    // tests/reference/policy/swaps_numpy.py → swaps-numpy.json; counts exact.
    const reference = JSON.parse(readFileSync('tests/reference/policy/swaps-numpy.json', 'utf8')) as {
      holdout: { champion: number[]; challenger: number[]; bad: number[] };
      strategy: ({ approvalRate: number } & Record<'champion' | 'challenger', { cutoff: number; accepted: number; bads: number }>)[];
      atApprovalRate: unknown;
    };
    const big = preparePolicyData(makeHoldout({ ...reference.holdout, higherIs: { champion: 'safer', challenger: 'riskier' } }), { bands: 10 });
    const curve = strategyCurve(big, 0.7);
    for (const expected of reference.strategy) {
      const point = curve.points.find((p) => Math.abs(p.approvalRate - expected.approvalRate) < 1e-12)!;
      for (const model of ['champion', 'challenger'] as const) {
        expect(point[model].cutoff).toBe(expected[model].cutoff);
        expect(point[model].achievedApprovalRate).toBe(expected[model].accepted / 3000);
        expect(point[model].portfolioBadRate).toBe(expected[model].bads / expected[model].accepted);
      }
    }
    // Counts exact; the proportional parts to 1e-12 relative (the two implementations divide in a different order).
    const { approvalsGainedAtEqualBadRate: gained, ...rest } = curve.atApprovalRate;
    const { approvalsGainedAtEqualBadRate: expectedGained, ...expectedRest } = reference.atApprovalRate as typeof curve.atApprovalRate;
    expect(rest).toEqual(expectedRest);
    expect(Math.abs(gained! - expectedGained!)).toBeLessThan(1e-12 * Math.abs(expectedGained!));
  });

  it('approves the whole book at every rate when all accounts are tied', () => {
    const tied = preparePolicyData(makeHoldout({ champion: [2, 2, 2, 2], challenger: [0.5, 0.5, 0.5, 0.5], bad: [1, 0, 0, 0], higherIs: { champion: 'safer', challenger: 'riskier' } }), { bands: 2 });
    const curve = strategyCurve(tied, 0.7);
    // Computed by hand: one block, so 1% already accepts all 4 (bad rate 1/4); later points add nobody.
    expect(curve.points[0].champion).toEqual({ cutoff: 2, achievedApprovalRate: 1, portfolioBadRate: 0.25, marginalBadRate: 0.25 });
    expect(curve.points.slice(1).every((p) => p.champion.marginalBadRate === null && p.challenger.marginalBadRate === null)).toBe(true);
    // One block: both books are all 4 accounts.
    expect(curve.atApprovalRate).toEqual({ approvalRate: 0.7, accounts: 4, championBads: 1, challengerBads: 1, badsAvoided: 0, challengerAtCutoff: { accounts: 4, bads: 1 }, approvalsGainedAtEqualBadRate: 0 });
  });

  it('rejects an approval rate of 0', () => {
    expect(() => strategyCurve(data, 0)).toThrow(/above 0/);
  });
});
