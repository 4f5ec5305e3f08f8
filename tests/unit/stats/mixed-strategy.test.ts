import { mixedStrategyResultSchema } from '@shared/mixed-strategy';
import { describe, expect, it } from 'vitest';
import { mixedStrategy, resolveKept } from '@server/stats/mixed-strategy';
import { preparePolicyData } from '@server/stats/policy-data';
import { swapSets } from '@server/stats/swap-sets';
import { makeHoldout } from './policy-fixtures';

// Eight accounts, both scores higher = safer, one segment column:
//   account     1       2       3       4       5       6       7       8
//   channel     branch  branch  branch  branch  broker  broker  broker  broker
//   champion    8       7       6       5       4       3       2       1
//   challenger  8       3       7       2       6       1       5       4
//   bad         0       1       0       0       1       0       0       1
function holdout(weight?: number[]) {
  const base = makeHoldout({ champion: [8, 7, 6, 5, 4, 3, 2, 1], challenger: [8, 3, 7, 2, 6, 1, 5, 4], bad: [0, 1, 0, 0, 1, 0, 0, 1] });
  base.segments = [{ column: 'channel', levels: ['branch', 'broker'], codes: Uint32Array.from([0, 0, 0, 0, 1, 1, 1, 1]) }];
  if (weight) base.weight = Float64Array.from(weight);
  return preparePolicyData(base, { bands: 2 });
}
const brokers = [{ column: 'channel', value: 'broker' }];

describe('mixedStrategy', () => {
  it('gives the champion, pure adoption and the mixed strategy computed by hand', () => {
    const result = mixedStrategy(holdout(), 0.5, brokers);
    expect(mixedStrategyResultSchema.parse(result)).toEqual(result);
    // At 50%: k = 4. Champion: the 4th safest score is 5 → accounts 1–4 (bad: 2) → 4 approved, 1 bad.
    // Challenger: scores 8, 7, 6, 5 are the 4 safest → accounts 1, 3, 5, 7 (bad: 5) → 4 approved, 1 bad.
    expect(result.cutoffs).toEqual({ champion: 5, challenger: 5 });
    expect(result.champion).toEqual({ accepted: 4, bads: 1, approvalRate: 0.5, badRate: 0.25 });
    // Pure adoption: swap-in = 5, 7 (champion declines; 1 bad), swap-out = 2, 4 (1 bad).
    expect(result.pure).toEqual({
      accepted: 4,
      bads: 1,
      approvalRate: 0.5,
      badRate: 0.25,
      swapIn: { count: 2, bads: 1, badRate: 0.5 },
      swapOut: { count: 2, bads: 1, badRate: 0.5 },
    });
    // Keep the brokers on the champion: brokers (5–8) by the champion's cut-off 5 → none approved;
    // branch (1–4) by the challenger's cut-off 5 → 1 and 3 (no bad). Mixed: 2 approved of 8, 0 bads;
    // no swap-in; swap-out = 2 and 4 (champion approves them, the challenger declines; 1 bad).
    expect(result.keptAccounts).toBe(4);
    expect(result.accounts).toBe(8);
    expect(result.mixed).toEqual({
      accepted: 2,
      bads: 0,
      approvalRate: 0.25,
      badRate: 0,
      swapIn: { count: 0, bads: 0, badRate: null },
      swapOut: { count: 2, bads: 1, badRate: 0.5 },
    });
    expect(result.bySegment).toEqual([
      {
        column: 'channel',
        value: 'branch',
        kept: false,
        accounts: 4,
        champion: { accepted: 4, bads: 1, approvalRate: 1, badRate: 0.25 },
        mixed: { accepted: 2, bads: 0, approvalRate: 0.5, badRate: 0, swapIn: { count: 0, bads: 0, badRate: null }, swapOut: { count: 2, bads: 1, badRate: 0.5 } },
      },
      {
        column: 'channel',
        value: 'broker',
        kept: true,
        accounts: 4,
        champion: { accepted: 0, bads: 0, approvalRate: 0, badRate: null },
        mixed: { accepted: 0, bads: 0, approvalRate: 0, badRate: null, swapIn: { count: 0, bads: 0, badRate: null }, swapOut: { count: 0, bads: 0, badRate: null } },
      },
    ]);
  });

  it('keeps pure adoption equal to the swap sets at the same approval rate', () => {
    const data = holdout();
    const result = mixedStrategy(data, 0.5, brokers);
    const swap = swapSets(data, { basis: 'approval-rate', approvalRate: 0.5 }, 0.95);
    expect(result.pure.swapIn.count).toBe(swap.swapIn.count);
    expect(result.pure.swapOut.count).toBe(swap.swapOut.count);
    expect(result.pure.swapIn.bads).toBe(swap.swapIn.bads);
  });

  it('sums weights as accounts (by hand)', () => {
    // Account 5 stands for 3 applicants: W = 10. At 50%, 5 accounts: champion book from the safest,
    // 1, 2, 3, 4 hold 4 → add account 5 (3 more: 7 ≥ 5) → cut-off 4, accounts 1–5, 7 accounts, bads
    // 2 (w 1) and 5 (w 3) = 4. Challenger: 1 (8), 3 (7), 5 (6, w 3) = 5 ≥ 5 → cut-off 6, 5 accounts,
    // bads 3 (account 5). Mixed keeping brokers: branch by the challenger's 6 → 1, 3 (2 accounts, 0
    // bads); brokers by the champion's 4 → 5 (3 accounts, 3 bads): 5 accounts, 3 bads, rate 0.6.
    const result = mixedStrategy(holdout([1, 1, 1, 1, 3, 1, 1, 1]), 0.5, brokers);
    expect(result.champion).toEqual({ accepted: 7, bads: 4, approvalRate: 0.7, badRate: 4 / 7 });
    expect(result.pure).toMatchObject({ accepted: 5, bads: 3, approvalRate: 0.5, badRate: 0.6 });
    expect(result.mixed).toMatchObject({ accepted: 5, bads: 3, approvalRate: 0.5, badRate: 0.6, swapOut: { count: 2, bads: 1, badRate: 0.5 } });
    expect(result.keptAccounts).toBe(6);
  });

  it('states the inferred bad rates when the run infers the bads of applicants without an outcome (by hand)', () => {
    // Accounts 5 and 7 have no outcome (the champion declines them), with inferred probabilities of
    // bad 0.4 and 0.1 from a mapped column. At 50% (4 accounts) the pure adoption's swap-in is 5 and
    // 7: no known outcome, so its known bad rate is null, and its inferred rate is
    // (0.4 + 0.1) / 2 = 0.25. The champion's book (1–4) is all known: 1 bad in 4, inferred 0.25 too.
    // Pure adoption's book 1, 3, 5, 7: known bads 0 of 2 known, inferred (0 + 0 + 0.4 + 0.1) / 4 = 0.125.
    const base = makeHoldout({ champion: [8, 7, 6, 5, 4, 3, 2, 1], challenger: [8, 3, 7, 2, 6, 1, 5, 4], bad: [0, 1, 0, 0, 0, 0, 0, 1] });
    base.segments = [{ column: 'channel', levels: ['branch', 'broker'], codes: Uint32Array.from([0, 0, 0, 0, 1, 1, 1, 1]) }];
    base.known = Uint8Array.from([1, 1, 1, 1, 0, 1, 0, 1]);
    base.inferredBad = Float64Array.from([0, 0, 0, 0, 0.4, 0, 0.1, 0]);
    const data = preparePolicyData(base, { bands: 2, inference: { method: 'column', parcelFactor: 1 } });
    const result = mixedStrategy(data, 0.5, brokers);
    expect(mixedStrategyResultSchema.parse(result)).toEqual(result);
    expect(result.inference).toBe('column');
    expect(result.champion).toEqual({ accepted: 4, bads: 1, approvalRate: 0.5, badRate: 0.25, inferredBadRate: 0.25 });
    expect(result.pure.swapIn).toEqual({ count: 2, bads: 0, badRate: null, inferredBadRate: 0.25 });
    expect(result.pure.badRate).toBe(0);
    expect(result.pure.inferredBadRate).toBeCloseTo(0.125, 15);
    // Without inference the field is absent, so plain reports read as before.
    const plain = mixedStrategy(preparePolicyData(base, { bands: 2 }), 0.5, brokers);
    expect(plain.inference).toBeUndefined();
    expect(plain.pure.swapIn).toEqual({ count: 2, bads: 0, badRate: null });
  });

  it('names segment values that do not exist', () => {
    const data = holdout();
    expect(resolveKept(data.segments, [...brokers, { column: 'channel', value: 'fax' }, { column: 'region', value: 'north' }], data.n).unknown).toEqual([
      { column: 'channel', value: 'fax' },
      { column: 'region', value: 'north' },
    ]);
    expect(() => mixedStrategy(data, 0.5, [{ column: 'channel', value: 'fax' }])).toThrow('no such segment value: channel = fax');
  });
});
