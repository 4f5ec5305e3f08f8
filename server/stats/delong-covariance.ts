import { auc } from './auc';
import { type PlacementSums, placements } from './delong';
import type { ScoreBlocks } from './order';
import { StatisticError } from './statistic-error';

/**
 * The DeLong covariance matrix of the AUCs of several models scored on the same accounts
 * (DeLong, DeLong & Clarke-Pearson 1988, Biometrics 44:837–845, their S = S10/m + S01/n): for
 * models r and s, with each account's placement V (delong.ts, Sun & Xu 2014's midrank form),
 *   S[r][s] = Σ_goods (V_r − θ_r)(V_s − θ_s) / ((n_good − 1)·n_good)
 *           + Σ_bads  (V_r − θ_r)(V_s − θ_s) / ((n_bad − 1)·n_bad),
 * the diagonal being each AUC's variance and every entry the same number pROC's var() and cov()
 * give (tests/reference/challengers/). With sampling weights, the linearisation form of delong.ts:
 * each product weighted by w², and each class's term multiplied by (m / W)².
 *
 * Needs at least 2 goods and 2 bads (delong.ts, inferenceGap); the caller checks.
 * Beside the matrix, the variance of every difference θ_s − θ_r (r < s) summed from the centred
 * differences (V_s − θ_s) − (V_r − θ_r) as delong.ts does, without the cancellation of
 * S_rr + S_ss − 2·S_rs: the same products in the same order, so the same bits as the paired test.
 * Cost: O(M·n) for the placements after the sorts (each account's read through its block
 * number, rowBlocks in order.ts), and one pass of O(M²) sums per account (M ≤ 6 models).
 */
export interface AucCovariance {
  /** The AUC of each model, in the order given. */
  auc: number[];
  /** The symmetric M × M DeLong covariance matrix of those AUCs. */
  covariance: number[][];
  /** differenceVariance[r][s], r < s: the DeLong variance of θ_s − θ_r (0 elsewhere). */
  differenceVariance: number[][];
  /** The paired test's sums for models r < s (r in the champion's place): pairedFromSums in delong.ts gives its bits. */
  pairSums: (r: number, s: number) => PlacementSums;
}

export function delongCovariance(models: readonly ScoreBlocks[], bad: Uint8Array): AucCovariance {
  const n = bad.length;
  const m = models.length;
  if (m === 0) throw new StatisticError('the DeLong covariance needs at least one model');
  const { nGood, nBad } = models[0];
  for (const model of models) {
    if (model.nGood !== nGood || model.nBad !== nBad || model.order.length !== n) {
      throw new StatisticError('the DeLong covariance requires every model scored on the same accounts');
    }
    if (Boolean(model.weights) !== Boolean(models[0].weights)) throw new StatisticError('the DeLong covariance requires every model weighted alike');
  }
  if (nGood < 2 || nBad < 2) throw new StatisticError('the DeLong covariance needs at least 2 goods and 2 bads');

  const theta = models.map((model) => auc(model));
  // Each account's placement, model by model (placements: its block's, looked up in row order),
  // written out before the pass: looked up inside it, M lookups per account in tables as large as
  // the holdout (continuous scores) miss the caches together (0.42 → 0.61 s for four models on a
  // million continuous scores, `npm run bench -- --only challengers:continuous`).
  const placed = models.map((model) => placements(model, n, bad));
  const weights = models[0].weights?.row ?? null;
  // One pass over the accounts: for each pair r ≤ s the products of the centred placements and,
  // for r < s, the squared centred differences, each sum in account order (the order of delong.ts,
  // so its variances are these to the bit). Sums laid out pair by pair in flat arrays.
  const pairs = (m * (m + 1)) / 2;
  const productGood = new Float64Array(pairs);
  const productBad = new Float64Array(pairs);
  const differenceGood = new Float64Array(pairs);
  const differenceBad = new Float64Array(pairs);
  const centred = new Float64Array(m);
  for (let i = 0; i < n; i++) {
    for (let r = 0; r < m; r++) centred[r] = placed[r][i] - theta[r];
    const ww = weights === null ? 1 : weights[i] * weights[i];
    const products = bad[i] ? productBad : productGood;
    const differences = bad[i] ? differenceBad : differenceGood;
    let p = 0;
    for (let r = 0; r < m; r++) {
      const a = centred[r];
      products[p++] += ww * (a * a);
      for (let s = r + 1; s < m; s++) {
        const b = centred[s];
        const d = b - a;
        products[p] += ww * (a * b);
        differences[p] += ww * (d * d);
        p++;
      }
    }
  }
  const goodSums = Array.from({ length: m }, () => new Float64Array(m));
  const badSums = Array.from({ length: m }, () => new Float64Array(m));
  const goodDifferences = Array.from({ length: m }, () => new Float64Array(m));
  const badDifferences = Array.from({ length: m }, () => new Float64Array(m));
  for (let r = 0, p = 0; r < m; r++) {
    for (let s = r; s < m; s++, p++) {
      goodSums[r][s] = goodSums[s][r] = productGood[p];
      badSums[r][s] = badSums[s][r] = productBad[p];
      goodDifferences[r][s] = differenceGood[p];
      badDifferences[r][s] = differenceBad[p];
    }
  }
  const wGood = models[0].weights ? models[0].weights.good : nGood;
  const wBad = models[0].weights ? models[0].weights.bad : nBad;
  const component = (sum: number, size: number, total: number) => {
    const base = sum / (size - 1) / size;
    return weights === null ? base : base * (size / total) * (size / total);
  };
  const covariance = Array.from({ length: m }, (_, r) =>
    Array.from({ length: m }, (_, s) => component(goodSums[r][s], nGood, wGood) + component(badSums[r][s], nBad, wBad)),
  );
  const differenceVariance = Array.from({ length: m }, (_, r) =>
    Array.from({ length: m }, (_, s) => (s > r ? component(goodDifferences[r][s], nGood, wGood) + component(badDifferences[r][s], nBad, wBad) : 0)),
  );
  const pairSums = (r: number, s: number): PlacementSums => ({
    gAA: goodSums[r][r],
    gBB: goodSums[s][s],
    gAB: goodSums[r][s],
    gDD: goodDifferences[r][s],
    bAA: badSums[r][r],
    bBB: badSums[s][s],
    bAB: badSums[r][s],
    bDD: badDifferences[r][s],
  });
  return { auc: theta, covariance, differenceVariance, pairSums };
}
