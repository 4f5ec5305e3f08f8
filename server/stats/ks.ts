import type { HigherIs } from '@shared/report';
import type { ScoreBlocks } from './order';
import { StatisticError } from './statistic-error';

export interface KsResult {
  /** max over score values of |F_bad − F_good|, in [0, 1]. */
  ks: number;
  /** The score, in the model's own units, where the gap is reached (see below). */
  score: number;
}

/**
 * Kolmogorov–Smirnov distance between the score distributions of bads and goods (Kolmogorov
 * 1933, Giorn. Ist. Ital. Attuari 4:83–91; Smirnov 1948, Ann. Math. Stat. 19:279–281).
 *
 * The gap F_bad(s) − F_good(s) is evaluated after each block of equal scores (each block taken
 * whole), in "higher = safer" order, in exact integer arithmetic: |B·n_good − G·n_bad| for the
 * cumulative bads B and goods G (float64 integers, exact below 2^53), and the largest is divided
 * once by n_bad·n_good, i.e. the exact fraction correctly rounded. That is scipy.stats.ks_2samp's
 * statistic to the last bit whenever scipy runs its exact mode (samples up to 10,000); in its
 * asymptotic mode scipy subtracts two rounded shares and can differ in the last bit (≤ 2 ulp).
 * tests/reference/holdouts/ks.json holds scipy's values and the exact fractions.
 *
 * Location: the riskiest score at which the largest gap is reached, i.e. the accounts at that
 * score or riskier are where bads and goods differ most. For a "higher = safer" model this is
 * scipy's `statistic_location` of ks_2samp(bad scores, good scores) whenever the largest gap is
 * reached at a single score value (when several values reach it, scipy reports the first of its
 * concatenated input, we report the riskiest). For a "higher = riskier" model it is the same
 * statement on the negated scores: scipy's location on −score, negated back.
 *
 * Weighted (blocks.weights): B and G are the cumulative summed weights of bads and goods and the
 * gap |B·W_good − G·W_bad| / (W_bad·W_good): the KS of the weighted distribution functions, i.e.
 * of the row-expanded file for integer weights (checked with scipy, tests/reference/weights/).
 *
 * Cost: O(blocks) after the sort.
 */
export function ks(blocks: ScoreBlocks, higherIs: HigherIs): KsResult {
  const { count, value } = blocks;
  if (blocks.nGood === 0 || blocks.nBad === 0) throw new StatisticError('ks requires at least one good and one bad');
  // With sampling weights the cumulative shares are of summed weights (weighted empirical
  // distribution functions); with every weight 1 the arithmetic is the same to the last bit.
  const goods = blocks.weights ? blocks.weights.goods : blocks.goods;
  const bads = blocks.weights ? blocks.weights.bads : blocks.bads;
  const nGood = blocks.weights ? blocks.weights.good : blocks.nGood;
  const nBad = blocks.weights ? blocks.weights.bad : blocks.nBad;
  let cumBad = 0;
  let cumGood = 0;
  let best = -1;
  let at = 0;
  for (let k = 0; k < count; k++) {
    cumBad += bads[k];
    cumGood += goods[k];
    const gap = Math.abs(cumBad * nGood - cumGood * nBad);
    if (gap > best) {
      best = gap;
      at = k;
    }
  }
  const safetyValue = value[at];
  return { ks: best / (nBad * nGood), score: higherIs === 'safer' ? safetyValue : -safetyValue };
}
