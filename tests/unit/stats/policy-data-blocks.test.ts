import { describe, expect, it } from 'vitest';
import { safety, scoreBlocks, weighBlocks } from '@server/stats/order';
import { type PreparedModel, preparePolicyData } from '@server/stats/policy-data';
import { makeHoldout } from './policy-fixtures';

/**
 * preparePolicyData from the models' ScoreBlocks (issue 20: the sorted values and outcomes taken
 * from the blocks instead of gathered row by row) against the row-by-row preparation from the
 * same orders: every array the same, element by element, the sign of a zero included.
 */

function seeded(seed: number) {
  let state = seed >>> 0 || 1;
  return () => {
    state ^= state << 13;
    state ^= state >>> 17;
    state ^= state << 5;
    return (state >>> 0) / 2 ** 32;
  };
}

const sameModel = (fast: PreparedModel, plain: PreparedModel) => {
  for (const key of ['order', 'sorted', 'safety', 'badsBefore', 'blockEnds', 'band', 'bandEnds'] as const) {
    const a = fast[key];
    const b = plain[key];
    expect(a.length, key).toBe(b.length);
    for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) expect.fail(`${key}[${i}]: ${a[i]} against ${b[i]}`);
  }
  for (const key of ['accountsBefore', 'knownBefore'] as const) {
    const a = fast[key];
    const b = plain[key];
    if (a === null || b === null) {
      expect(a, key).toBe(b);
      continue;
    }
    expect(a.length, key).toBe(b.length);
    for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) expect.fail(`${key}[${i}]: ${a[i]} against ${b[i]}`);
  }
};

describe('policy data from the score blocks', () => {
  const cases: [string, (random: () => number) => number][] = [
    ['points', (random) => 300 + Math.floor(random() * 500)],
    ['PD scores, six decimals', (random) => Math.round(random() * 1e6) / 1e6],
    ['scores with zeros of both signs and negatives', (random) => [0, -0, -1.5, 2.25, 0, -3][Math.floor(random() * 6)] * (random() < 0.5 ? 1 : -1)],
    ['a constant score', () => 0.5],
  ];
  it.each(cases)('gives the arrays of the row-by-row preparation (%s)', (_, draw) => {
    for (const [seed, n, higherIs] of [
      [1, 5_000, 'safer'],
      [2, 20_000, 'riskier'],
      [3, 1, 'riskier'],
    ] as const) {
      const random = seeded(seed);
      const bad = Array.from({ length: n }, () => (random() < 0.2 ? 1 : 0));
      const holdout = makeHoldout({
        champion: Array.from({ length: n }, () => draw(random)),
        challenger: Array.from({ length: n }, () => draw(random)),
        bad,
        higherIs: { champion: higherIs, challenger: 'safer' },
      });
      const champion = scoreBlocks(safety(holdout.champion, holdout.higherIs.champion), holdout.bad);
      const challenger = scoreBlocks(safety(holdout.challenger, holdout.higherIs.challenger), holdout.bad);
      const orders = { champion: champion.order, challenger: challenger.order };
      const fast = preparePolicyData(holdout, { bands: 10, orders, blocks: { champion, challenger } });
      const plain = preparePolicyData(holdout, { bands: 10, orders });
      sameModel(fast.champion, plain.champion);
      sameModel(fast.challenger, plain.challenger);
    }
  });

  // Issue 12: with sampling weights (and rows without an outcome) the cumulative sums too, to the bit.
  it.each([
    ['weights by outcome', (_random: () => number, bad: number) => (bad ? 1 : 4), false],
    ['weights 1–4 at random', (random: () => number) => 1 + Math.floor(random() * 4), false],
    ['fractional weights', (random: () => number) => 0.1 + random() * 3, false],
    ['fractional weights and rows without an outcome', (random: () => number) => 0.1 + random() * 3, true],
  ] as const)('gives the weighted arrays of the row-by-row preparation (%s)', (_, weigh, unknown) => {
    for (const [label, draw] of cases) {
      for (const [seed, n, higherIs] of [
        [4, 5_000, 'safer'],
        [5, 20_000, 'riskier'],
        [6, 1, 'riskier'],
      ] as const) {
        const random = seeded(seed);
        const bad = Array.from({ length: n }, () => (random() < 0.2 ? 1 : 0));
        const holdout = makeHoldout({
          champion: Array.from({ length: n }, () => draw(random)),
          challenger: Array.from({ length: n }, () => draw(random)),
          bad,
          higherIs: { champion: higherIs, challenger: 'safer' },
        });
        const weight = Float64Array.from(bad, (b) => weigh(random, b));
        holdout.weight = weight;
        if (unknown) holdout.known = Uint8Array.from(bad, (b) => (b || random() < 0.8 ? 1 : 0));
        const champion = scoreBlocks(safety(holdout.champion, holdout.higherIs.champion), holdout.bad);
        const challenger = scoreBlocks(safety(holdout.challenger, holdout.higherIs.challenger), holdout.bad);
        const orders = { champion: champion.order, challenger: challenger.order };
        const plain = preparePolicyData(holdout, { bands: 10, orders });
        // The blocks as scoreBlocks gives them (weights read row by row) and weighed as report.ts
        // weighs them (weights read from the blocks in sorted order).
        for (const blocks of [{ champion, challenger }, { champion: weighBlocks(champion, weight), challenger: weighBlocks(challenger, weight) }]) {
          const fast = preparePolicyData(holdout, { bands: 10, orders, blocks });
          expect(fast.champion.accountsBefore, label).not.toBeNull();
          expect(fast.champion.knownBefore === null, label).toBe(!unknown);
          sameModel(fast.champion, plain.champion);
          sameModel(fast.challenger, plain.challenger);
        }
      }
    }
  });

  it('refuses blocks of other scores', () => {
    const holdout = makeHoldout({ champion: [1, 2, 3, 4], challenger: [4, 3, 2, 1], bad: [0, 1, 0, 1] });
    const champion = scoreBlocks(holdout.champion, holdout.bad);
    const challenger = scoreBlocks(holdout.challenger, holdout.bad);
    expect(() => preparePolicyData(holdout, { bands: 2, blocks: { champion: challenger, challenger: champion } })).toThrow(/do not match the scores/);
  });
});
