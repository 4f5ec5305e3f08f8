import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { swapSetsSchema, type HigherIs } from '@shared/report';
import { describe, expect, it } from 'vitest';
import { preparePolicyData } from '@server/stats/policy-data';
import { swapSets, type SwapRequest } from '@server/stats/swap-sets';
import { wilsonInterval } from '@server/stats/wilson';
import { makeHoldout, relativeError } from './policy-fixtures';

// Ten accounts: champion points (higher = safer), challenger PDs (higher = riskier), exposure.
const hand = makeHoldout({
  champion: [10, 20, 30, 40, 50, 60, 70, 80, 90, 100],
  challenger: [0.9, 0.1, 0.8, 0.2, 0.7, 0.3, 0.6, 0.4, 0.5, 0.05],
  bad: [1, 0, 1, 0, 1, 1, 0, 0, 1, 0],
  exposure: [100, 200, 300, 400, 500, 600, 700, 800, 900, 1000],
  higherIs: { champion: 'safer', challenger: 'riskier' },
});
const handData = preparePolicyData(hand, { bands: 2 });

describe('swapSets', () => {
  it('splits the holdout into the four cells at given cut-offs', () => {
    const result = swapSets(handData, { basis: 'cutoffs', cutoffs: { champion: 60, challenger: 0.4 } }, 0.95);
    expect(swapSetsSchema.parse(result)).toEqual(result);
    // Computed by hand: champion accepts 6–10 (score ≥ 60); challenger accepts 2, 4, 6, 8, 10 (PD ≤ 0.4).
    expect(result.champion).toEqual({ cutoff: 60, approvalRate: 0.5 });
    expect(result.challenger).toEqual({ cutoff: 0.4, approvalRate: 0.5 });
    expect(result.bothAccept).toEqual({ count: 3, share: 0.3, bads: 1, badRate: 1 / 3, badRateCi: wilsonInterval(1, 3, 0.95), amount: 2400 });
    expect(result.swapIn).toEqual({ count: 2, share: 0.2, bads: 0, badRate: 0, badRateCi: wilsonInterval(0, 2, 0.95), amount: 600 });
    expect(result.swapOut).toEqual({ count: 2, share: 0.2, bads: 1, badRate: 0.5, badRateCi: wilsonInterval(1, 2, 0.95), amount: 1600 });
    expect(result.bothReject).toEqual({ count: 3, share: 0.3, bads: 3, badRate: 1, badRateCi: wilsonInterval(3, 3, 0.95), amount: 900 });
    // Swap-in 0/2 vs swap-out 1/2: expected counts 0.5 < 5 → Fisher; both tables of the support
    // have probability 1/2, so p = 1 (computed by hand).
    expect(result.test).toEqual({ method: 'fisher-exact', z: null, p: 1, reason: null });
    expect(result.basis).toBe('cutoffs');
    expect(result.requestedApprovalRate).toBeNull();
  });

  it('splits each segment value the same way, with each model\'s approvals there', () => {
    // The hand holdout with accounts 1, 3, 5, 7, 9 in segment "a" and 2, 4, 6, 8, 10 in "b"
    // (levels listed b first: rows come in value order). Computed by hand from the cells above:
    // both accept 6, 8, 10; swap-in 2, 4; swap-out 7, 9; both reject 1, 3, 5.
    const segmented = { ...hand, segments: [{ column: 'group', levels: ['b', 'a'], codes: Uint32Array.from([1, 0, 1, 0, 1, 0, 1, 0, 1, 0]) }] };
    const result = swapSets(preparePolicyData(segmented, { bands: 2 }), { basis: 'cutoffs', cutoffs: { champion: 60, challenger: 0.4 } }, 0.95);
    expect(swapSetsSchema.parse(result)).toEqual(result);
    const [a, b] = result.bySegment;
    expect(a).toEqual({
      column: 'group',
      value: 'a',
      accounts: 5,
      bads: 4,
      champion: { approved: 2, approvalRate: 0.4, approvedBadRate: 0.5 },
      challenger: { approved: 0, approvalRate: 0, approvedBadRate: null },
      swapIn: { count: 0, bads: 0, badRate: null, badRateCi: null, amount: 0 },
      swapOut: { count: 2, bads: 1, badRate: 0.5, badRateCi: wilsonInterval(1, 2, 0.95), amount: 1600 },
    });
    expect(b).toEqual({
      column: 'group',
      value: 'b',
      accounts: 5,
      bads: 1,
      champion: { approved: 3, approvalRate: 0.6, approvedBadRate: 1 / 3 },
      challenger: { approved: 5, approvalRate: 1, approvedBadRate: 0.2 },
      swapIn: { count: 2, bads: 0, badRate: 0, badRateCi: wilsonInterval(0, 2, 0.95), amount: 600 },
      swapOut: { count: 0, bads: 0, badRate: null, badRateCi: null, amount: 0 },
    });
    expect(swapSets(handData, { basis: 'cutoffs', cutoffs: { champion: 60, challenger: 0.4 } }, 0.95).bySegment).toEqual([]);
  });

  it('matches both models to one approval rate', () => {
    const result = swapSets(handData, { basis: 'approval-rate', approvalRate: 0.3 }, 0.95);
    // Computed by hand: k = 3; champion accepts 8, 9, 10 (cut-off 80); challenger accepts the three
    // lowest PDs 0.05, 0.1, 0.2 (accounts 10, 2, 4; cut-off 0.2).
    expect(result.champion).toEqual({ cutoff: 80, approvalRate: 0.3 });
    expect(result.challenger).toEqual({ cutoff: 0.2, approvalRate: 0.3 });
    expect([result.bothAccept.count, result.bothAccept.bads]).toEqual([1, 0]);
    expect([result.swapIn.count, result.swapIn.bads, result.swapIn.amount]).toEqual([2, 0, 600]);
    expect([result.swapOut.count, result.swapOut.bads, result.swapOut.amount]).toEqual([2, 1, 1700]);
    expect([result.bothReject.count, result.bothReject.bads]).toEqual([5, 4]);
    expect(result.requestedApprovalRate).toBe(0.3);
  });

  it('gives null bad rates and intervals for empty cells and no amounts without an exposure column', () => {
    const data = preparePolicyData({ ...hand, exposure: null }, { bands: 2 });
    const result = swapSets(data, { basis: 'approval-rate', approvalRate: 1 }, 0.95);
    expect(result.bothAccept.count).toBe(10);
    for (const cell of [result.swapIn, result.swapOut, result.bothReject]) {
      expect(cell).toEqual({ count: 0, share: 0, bads: 0, badRate: null, badRateCi: null, amount: null });
    }
    expect(result.test.p).toBeNull();
    expect(result.test.reason).toMatch(/same accounts/);
    const none = swapSets(data, { basis: 'approval-rate', approvalRate: 0 }, 0.95);
    expect(none.bothReject.count).toBe(10);
    expect(none.champion.approvalRate).toBe(0);
    expect(none.bothAccept.badRate).toBeNull();
  });

  it('handles a constant model and an all-tied holdout', () => {
    // Champion constant: every account is accepted or none (ties are never split).
    const constant = preparePolicyData(makeHoldout({ champion: [5, 5, 5, 5], challenger: [1, 2, 3, 4], bad: [1, 0, 1, 0] }), { bands: 2 });
    const half = swapSets(constant, { basis: 'approval-rate', approvalRate: 0.5 }, 0.95);
    expect(half.champion).toEqual({ cutoff: 5, approvalRate: 1 });
    expect(half.challenger).toEqual({ cutoff: 3, approvalRate: 0.5 });
    expect([half.bothAccept.count, half.swapOut.count, half.swapIn.count, half.bothReject.count]).toEqual([2, 2, 0, 0]);
    expect(half.test.reason).toMatch(/no swap-in/);
    const tied = preparePolicyData(makeHoldout({ champion: [1, 1, 1], challenger: [2, 2, 2], bad: [1, 0, 0] }), { bands: 2 });
    const result = swapSets(tied, { basis: 'approval-rate', approvalRate: 0.1 }, 0.95);
    expect(result.bothAccept.count).toBe(3);
    expect(result.champion.approvalRate).toBe(1);
  });

  it('agrees with an independent numpy implementation on a 3,000-account holdout', () => {
    // tests/reference/policy/swaps_numpy.py → swaps-numpy.json. Counts and bads exact; amounts 1e-12
    // relative (different summation order); cut-offs exact.
    const reference = JSON.parse(readFileSync('tests/reference/policy/swaps-numpy.json', 'utf8')) as {
      holdout: { champion: number[]; challenger: number[]; bad: number[]; exposure: number[] };
      swaps: ({ championCutoff: number; challengerCutoff: number; championApproval: number; challengerApproval: number; cells: Record<string, { count: number; bads: number; amount: number }> } & (
        | { basis: 'cutoffs'; cutoffs: { champion: number; challenger: number } }
        | { basis: 'approval-rate'; approvalRate: number }
      ))[];
    };
    const data = preparePolicyData(makeHoldout({ ...reference.holdout, higherIs: { champion: 'safer', challenger: 'riskier' } }), { bands: 10 });
    for (const expected of reference.swaps) {
      const request: SwapRequest = expected.basis === 'cutoffs' ? { basis: 'cutoffs', cutoffs: expected.cutoffs } : { basis: 'approval-rate', approvalRate: expected.approvalRate };
      const result = swapSets(data, request, 0.95);
      expect(result.champion.cutoff).toBe(expected.championCutoff);
      expect(result.challenger.cutoff).toBe(expected.challengerCutoff);
      expect(result.champion.approvalRate).toBeCloseTo(expected.championApproval, 15);
      expect(result.challenger.approvalRate).toBeCloseTo(expected.challengerApproval, 15);
      for (const name of ['bothAccept', 'swapIn', 'swapOut', 'bothReject'] as const) {
        expect(result[name].count).toBe(expected.cells[name].count);
        expect(result[name].bads).toBe(expected.cells[name].bads);
        expect(relativeError(result[name].amount!, expected.cells[name].amount)).toBeLessThan(1e-12);
      }
    }
  });

  const smallHoldout = fc
    .integer({ min: 1, max: 60 })
    .chain((n) =>
      fc.record({
        champion: fc.array(fc.integer({ min: 0, max: 12 }), { minLength: n, maxLength: n }),
        challenger: fc.array(fc.integer({ min: 0, max: 12 }), { minLength: n, maxLength: n }),
        bad: fc.array(fc.integer({ min: 0, max: 1 }), { minLength: n, maxLength: n }),
        championHigherIs: fc.constantFrom<HigherIs>('safer', 'riskier'),
        challengerHigherIs: fc.constantFrom<HigherIs>('safer', 'riskier'),
        cutChampion: fc.integer({ min: -1, max: 13 }),
        cutChallenger: fc.integer({ min: -1, max: 13 }),
        rate: fc.double({ min: 0, max: 1, noNaN: true }),
        group: fc.array(fc.integer({ min: 0, max: 3 }), { minLength: n, maxLength: n }),
      }),
    );

  it('agrees with a direct count of the acceptance rule on random holdouts', () => {
    fc.assert(
      fc.property(smallHoldout, (h) => {
        const holdout = makeHoldout({ ...h, higherIs: { champion: h.championHigherIs, challenger: h.challengerHigherIs } });
        const data = preparePolicyData(holdout, { bands: 3 });
        const result = swapSets(data, { basis: 'cutoffs', cutoffs: { champion: h.cutChampion, challenger: h.cutChallenger } }, 0.9);
        const accepts = (score: number, cut: number, higherIs: HigherIs) => (higherIs === 'safer' ? score >= cut : score <= cut);
        const expected = { bothAccept: 0, swapIn: 0, swapOut: 0, bothReject: 0 };
        for (let i = 0; i < holdout.n; i++) {
          const a = accepts(h.champion[i], h.cutChampion, h.championHigherIs);
          const b = accepts(h.challenger[i], h.cutChallenger, h.challengerHigherIs);
          expected[a ? (b ? 'bothAccept' : 'swapOut') : b ? 'swapIn' : 'bothReject']++;
        }
        return (Object.keys(expected) as (keyof typeof expected)[]).every((cell) => result[cell].count === expected[cell]);
      }),
    );
  });

  it('splits every segment value by a direct count of the acceptance rule, the values adding up to the whole', () => {
    fc.assert(
      fc.property(smallHoldout, (h) => {
        const levels = ['w', 'x', 'y', 'z'];
        const holdout = {
          ...makeHoldout({ ...h, higherIs: { champion: h.championHigherIs, challenger: h.challengerHigherIs } }),
          segments: [{ column: 'group', levels, codes: Uint32Array.from(h.group) }],
        };
        const result = swapSets(preparePolicyData(holdout, { bands: 3 }), { basis: 'cutoffs', cutoffs: { champion: h.cutChampion, challenger: h.cutChallenger } }, 0.9);
        const accepts = (score: number, cut: number, higherIs: HigherIs) => (higherIs === 'safer' ? score >= cut : score <= cut);
        expect(result.bySegment.map((row) => row.value)).toEqual(levels);
        for (const [level, row] of result.bySegment.entries()) {
          const expected = { accounts: 0, bads: 0, championApproved: 0, challengerApproved: 0, swapIn: 0, swapInBads: 0, swapOut: 0, swapOutBads: 0 };
          for (let i = 0; i < holdout.n; i++) {
            if (h.group[i] !== level) continue;
            const a = accepts(h.champion[i], h.cutChampion, h.championHigherIs);
            const b = accepts(h.challenger[i], h.cutChallenger, h.challengerHigherIs);
            expected.accounts++;
            expected.bads += h.bad[i];
            if (a) expected.championApproved++;
            if (b) expected.challengerApproved++;
            if (b && !a) {
              expected.swapIn++;
              expected.swapInBads += h.bad[i];
            }
            if (a && !b) {
              expected.swapOut++;
              expected.swapOutBads += h.bad[i];
            }
          }
          expect([row.accounts, row.bads, row.champion.approved, row.challenger.approved]).toEqual([expected.accounts, expected.bads, expected.championApproved, expected.challengerApproved]);
          expect([row.swapIn.count, row.swapIn.bads, row.swapOut.count, row.swapOut.bads]).toEqual([expected.swapIn, expected.swapInBads, expected.swapOut, expected.swapOutBads]);
        }
        const total = (pick: (row: (typeof result.bySegment)[number]) => number) => result.bySegment.reduce((sum, row) => sum + pick(row), 0);
        expect(total((row) => row.swapIn.count)).toBe(result.swapIn.count);
        expect(total((row) => row.swapOut.bads)).toBe(result.swapOut.bads);
        expect(total((row) => row.champion.approved)).toBe(result.bothAccept.count + result.swapOut.count);
        expect(total((row) => row.accounts)).toBe(holdout.n);
      }),
    );
  });

  it('swaps swap-in and swap-out when the models are swapped', () => {
    fc.assert(
      fc.property(smallHoldout, (h) => {
        const higherIs = { champion: h.championHigherIs, challenger: h.challengerHigherIs };
        const ab = preparePolicyData(makeHoldout({ ...h, higherIs }), { bands: 3 });
        const ba = preparePolicyData(
          makeHoldout({ champion: h.challenger, challenger: h.champion, bad: h.bad, higherIs: { champion: higherIs.challenger, challenger: higherIs.champion } }),
          { bands: 3 },
        );
        const x = swapSets(ab, { basis: 'approval-rate', approvalRate: h.rate }, 0.95);
        const y = swapSets(ba, { basis: 'approval-rate', approvalRate: h.rate }, 0.95);
        expect(y.swapIn).toEqual(x.swapOut);
        expect(y.swapOut).toEqual(x.swapIn);
        expect(y.bothAccept).toEqual(x.bothAccept);
        expect(y.bothReject).toEqual(x.bothReject);
        expect(y.champion).toEqual(x.challenger);
      }),
    );
  });

  it('gives identical swap sets when a model is declared the other way round and its scores negated', () => {
    fc.assert(
      fc.property(smallHoldout, (h) => {
        const flip = (o: HigherIs): HigherIs => (o === 'safer' ? 'riskier' : 'safer');
        const original = preparePolicyData(makeHoldout({ ...h, higherIs: { champion: h.championHigherIs, challenger: h.challengerHigherIs } }), { bands: 3 });
        const flipped = preparePolicyData(
          makeHoldout({
            champion: h.champion.map((s) => -s),
            challenger: h.challenger.map((s) => -s),
            bad: h.bad,
            higherIs: { champion: flip(h.championHigherIs), challenger: flip(h.challengerHigherIs) },
          }),
          { bands: 3 },
        );
        const x = swapSets(original, { basis: 'cutoffs', cutoffs: { champion: h.cutChampion, challenger: h.cutChallenger } }, 0.95);
        const y = swapSets(flipped, { basis: 'cutoffs', cutoffs: { champion: -h.cutChampion, challenger: -h.cutChallenger } }, 0.95);
        const m = swapSets(original, { basis: 'approval-rate', approvalRate: h.rate }, 0.95);
        const w = swapSets(flipped, { basis: 'approval-rate', approvalRate: h.rate }, 0.95);
        for (const [p, q] of [
          [x, y],
          [m, w],
        ]) {
          expect([q.bothAccept, q.swapIn, q.swapOut, q.bothReject]).toEqual([p.bothAccept, p.swapIn, p.swapOut, p.bothReject]);
          expect(q.champion.approvalRate).toBe(p.champion.approvalRate);
          expect(q.champion.cutoff + 0).toBe(-p.champion.cutoff + 0); // + 0 folds −0 into 0
        }
      }),
    );
  });
});
