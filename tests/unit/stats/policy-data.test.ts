import { describe, expect, it } from 'vitest';
import { argsortAscending, safety } from '@server/stats/order';
import { preparePolicyData } from '@server/stats/policy-data';
import { makeHoldout } from './policy-fixtures';

describe('preparePolicyData', () => {
  it('sorts riskiest first, counts bads cumulatively and finds the blocks of equal scores', () => {
    const data = preparePolicyData(
      makeHoldout({ champion: [3, 1, 2, 2], challenger: [0.1, 0.4, 0.2, 0.2], bad: [0, 1, 1, 0], higherIs: { champion: 'safer', challenger: 'riskier' } }),
      { bands: 2 },
    );
    // Computed by hand: champion safety 1, 2, 2, 3 → rows 1, 2, 3, 0; bads 1, 1, 0, 0.
    expect(Array.from(data.champion.order)).toEqual([1, 2, 3, 0]);
    expect(Array.from(data.champion.badsBefore)).toEqual([0, 1, 2, 2, 2]);
    expect(Array.from(data.champion.blockEnds)).toEqual([1, 3, 4]);
    // Challenger PDs 0.4, 0.2, 0.2, 0.1 riskiest first: the same rows.
    expect(Array.from(data.challenger.order)).toEqual([1, 2, 3, 0]);
    expect(data.bads).toBe(2);
    expect(data.goods).toBe(2);
  });

  it('keeps every block of equal scores in one band (middle-of-block rule)', () => {
    // n = 10, B = 5, scores 1,1,1,2,3,3,3,3,4,5: blocks [0,3) [3,4) [4,8) [8,9) [9,10);
    // ⌊(start + end)·5/20⌋ = 0, 1, 3, 4, 4 → bands 1, 2, 3, 4, 4 after renumbering (by hand).
    const data = preparePolicyData(makeHoldout({ champion: [1, 1, 1, 2, 3, 3, 3, 3, 4, 5], challenger: [1, 2, 3, 4, 5, 6, 7, 8, 9, 10], bad: [1, 0, 0, 0, 0, 0, 0, 0, 0, 1] }), { bands: 5 });
    expect(Array.from(data.champion.band)).toEqual([0, 0, 0, 1, 2, 2, 2, 2, 3, 3]);
    expect(Array.from(data.champion.bandEnds)).toEqual([3, 4, 8, 10]);
    // Distinct scores 1..10 with B = 5: two accounts per band.
    expect(Array.from(data.challenger.bandEnds)).toEqual([2, 4, 6, 8, 10]);
  });

  it('uses orders the caller already has, and refuses ones that are not ascending by safety', () => {
    const holdout = makeHoldout({ champion: [5, 4, 3], challenger: [1, 2, 3], bad: [0, 1, 0], higherIs: { champion: 'riskier', challenger: 'safer' } });
    const order = argsortAscending(safety(holdout.champion, 'riskier'));
    const data = preparePolicyData(holdout, { bands: 2, orders: { champion: order } });
    expect(data.champion.order).toBe(order);
    expect(() => preparePolicyData(holdout, { bands: 2, orders: { champion: Uint32Array.from([2, 1, 0]) } })).toThrow(/not ascending/);
  });

  it('rejects scores that are not finite numbers and band counts out of range', () => {
    expect(() => preparePolicyData(makeHoldout({ champion: [1, Number.NaN], challenger: [1, 2], bad: [0, 1] }), { bands: 2 })).toThrow(
      'champion score is not a finite number for account 2',
    );
    expect(() => preparePolicyData(makeHoldout({ champion: [1, 2], challenger: [1, 2], bad: [0, 1] }), { bands: 1 })).toThrow(/bands/);
  });
});
