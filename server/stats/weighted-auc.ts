import type { BlockWeights } from './order';
import { StatisticError } from './statistic-error';

/**
 * Weighted AUC: the Mann–Whitney probability that a good scores safer than a bad, each pair of a
 * good i and a bad j counting w_i·w_j, ties one half, i.e. the AUC of the population the
 * weighted sample stands for. From the equal-score blocks ("higher = safer") with the summed
 * weights of each block's goods G_k and bads B_k (midranks with weighted ties):
 *
 *   AUC = Σ_k G_k · (Σ_{l<k} B_l + ½ B_k) / (W_good · W_bad)
 *
 * Source: the Mann–Whitney form of the AUC (Bamber 1975, J. Math. Psychol. 12:387–415) with each
 * pair weighted by the product of its sampling weights, the estimator of the population AUC
 * under sampling (a ratio of weighted sums, as in survey estimation; its linearisation variance,
 * Binder 1983, International Statistical Review 51:279–292, is in delong.ts). Checked against
 * pROC and sklearn on the row-expanded file (tests/reference/weights/). With every weight 1, G_k
 * and B_k are the unweighted counts as the same float64 integers, so the result equals auc.ts's
 * to the last bit.
 * Cost: O(blocks).
 */
export function weightedAuc(weights: BlockWeights, count: number): number {
  const { goods, bads, good, bad } = weights;
  if (!(good > 0 && bad > 0)) throw new StatisticError('auc requires at least one good and one bad');
  let below = 0;
  let wins = 0;
  for (let k = 0; k < count; k++) {
    const b = bads[k];
    wins += goods[k] * (below + b / 2);
    below += b;
  }
  return Math.min(1, Math.max(0, wins / (good * bad)));
}
