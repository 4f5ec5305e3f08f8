import type { BlockCounts } from './order';
import { StatisticError } from './statistic-error';
import { weightedAuc } from './weighted-auc';

/**
 * AUC: the Mann–Whitney probability that a good account scores safer than a bad one, ties
 * counting one half (Bamber 1975, J. Math. Psychol. 12:387–415; Hanley & McNeil 1982, Radiology
 * 143:29–36). From the equal-score blocks of the "higher = safer" scores:
 *
 *   AUC = Σ_k goods_k · (bads below block k + ½ bads_k) / (n_good · n_bad)
 *
 * All counts and products are float64 integers (exact below 2^53, i.e. for any holdout under
 * 94 million rows); nothing is formed in 32-bit integers. Clamped to [0, 1].
 * Cost: O(blocks) after the sort in scoreBlocks (O(n log n), or O(n) for points).
 *
 * With sampling weights (blocks.weights) the counts become summed weights: the weighted
 * Mann–Whitney statistic, each pair counting w_good·w_bad, ties one half, over W_good·W_bad
 * (weighted-auc.ts). With every weight 1 the sums are the same float64 integers, so the value is
 * the unweighted one to the last bit.
 */
export function auc(blocks: BlockCounts): number {
  const { count, goods, bads, nGood, nBad } = blocks;
  if (nGood === 0 || nBad === 0) throw new StatisticError('auc requires at least one good and one bad');
  if (blocks.weights) return weightedAuc(blocks.weights, count);
  let below = 0;
  let wins = 0;
  for (let k = 0; k < count; k++) {
    const b = bads[k];
    wins += goods[k] * (below + b / 2);
    below += b;
  }
  return Math.min(1, Math.max(0, wins / (nGood * nBad)));
}
