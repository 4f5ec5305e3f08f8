import fc from 'fast-check';
import { economicsSchema } from '@shared/report';
import { describe, expect, it } from 'vitest';
import { economics } from '@server/stats/economics';
import { preparePolicyData } from '@server/stats/policy-data';
import { makeHoldout } from './policy-fixtures';

const holdout = makeHoldout({
  champion: [1, 2, 3, 4, 5],
  challenger: [5, 4, 3, 2, 1],
  bad: [1, 1, 0, 0, 0],
  exposure: [1000, 2000, 10, 10, 10],
});
const data = preparePolicyData(holdout, { bands: 2 });

describe('economics', () => {
  it('finds the best cut-off with a fixed loss per bad, computed by hand', () => {
    const result = economics(data, { profitPerGood: 100, lossPerBad: 300, lgd: null });
    expect(economicsSchema.parse(result)).toEqual(result);
    // Champion books from the safest: 5 → 100, 4 → 200, 3 → 300, 2 → 0, 1 → −300 (by hand).
    expect(result.champion).toMatchObject({ bestCutoff: 3, bestApprovalRate: 0.6, bestProfit: 300 });
    expect(result.champion.curve.map((p) => [p.approvalRate, p.cutoff, p.profit])).toEqual([
      [0.2, 5, 100],
      [0.4, 4, 200],
      [0.6, 3, 300],
      [0.8, 2, 0],
      [1, 1, -300],
    ]);
    // Challenger (reversed): safest first are the bads: 1 → −300, … all 5 → −300; best 3 goods last:
    // book sizes 1 … 5 give −300, −600, −500, −400, −300; ties go to the higher approval rate.
    expect(result.challenger).toMatchObject({ bestCutoff: 1, bestApprovalRate: 1, bestProfit: -300 });
  });

  it("uses LGD × exposure for a bad's loss when an LGD is given", () => {
    const result = economics(data, { profitPerGood: 100, lossPerBad: null, lgd: 0.5 });
    // Book of 4 (scores 2–5): 300 − 0.5·2000 = −700; all 5: 300 − 1000 − 500 = −1200 (by hand).
    expect(result.champion.curve.map((p) => p.profit)).toEqual([100, 200, 300, -700, -1200]);
    expect(result.champion.bestProfit).toBe(300);
  });

  it('equals a direct search over every score value', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.integer({ min: 0, max: 9 }), fc.boolean()), { minLength: 1, maxLength: 50 }), fc.integer({ min: 1, max: 20 }), fc.integer({ min: 1, max: 200 }), (rows, gain, loss) => {
        const scores = rows.map((r) => r[0]);
        const bad = rows.map((r) => (r[1] ? 1 : 0));
        const prepared = preparePolicyData(makeHoldout({ champion: scores, challenger: scores, bad }), { bands: 2 });
        const result = economics(prepared, { profitPerGood: gain, lossPerBad: loss, lgd: null });
        let best = -Infinity;
        for (const cut of new Set(scores)) {
          let profit = 0;
          rows.forEach(([s, isBad]) => {
            if (s >= cut) profit += isBad ? -loss : gain;
          });
          best = Math.max(best, profit);
        }
        return result.champion.bestProfit === best;
      }),
    );
  });

  it('refuses settings it cannot price', () => {
    expect(() => economics(data, { profitPerGood: 100, lossPerBad: null, lgd: null })).toThrow('economics requires a loss per bad or an LGD');
    const noExposure = preparePolicyData({ ...holdout, exposure: null }, { bands: 2 });
    expect(() => economics(noExposure, { profitPerGood: 100, lossPerBad: null, lgd: 0.4 })).toThrow(/requires an exposure column/);
  });
});
