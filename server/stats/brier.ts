import type { Brier } from '@shared/calibration';

/**
 * The Brier score of probabilities of default, BS = Σ wᵢ (pᵢ − yᵢ)² / Σ wᵢ (G. W. Brier 1950,
 * "Verification of forecasts expressed in terms of probability", Monthly Weather Review 78:1–3),
 * with Murphy's decomposition over groups k (bands or grades) of total weight W_k, mean PD p̄_k
 * and observed bad rate ō_k, around the overall bad rate ō:
 *   reliability = Σ W_k (p̄_k − ō_k)² / W,   resolution = Σ W_k (ō_k − ō)² / W,
 *   uncertainty = ō (1 − ō),                BS = reliability − resolution + uncertainty + within
 * (A. H. Murphy 1973, "A new vector partition of the probability score", Journal of Applied
 * Meteorology 12:595–600). The identity is exact when every account of a group has the same PD;
 * otherwise `withinGroup` holds the remainder, the PD's spread within the groups (D. B.
 * Stephenson, C. A. S. Coelho & I. T. Jolliffe 2008, Weather and Forecasting 23:752–757).
 * Lower reliability is better calibration, higher resolution better separation.
 * Checked against sklearn.metrics.brier_score_loss in tests/reference/calibration/.
 * Cost: O(n).
 */
export function brierScore(pd: Float64Array, bad: Uint8Array, weights: Float64Array | null, group: ArrayLike<number>, groups: number): Brier {
  const n = pd.length;
  if (n === 0) throw new RangeError('brier score requires at least one account');
  if (bad.length !== n || group.length !== n || (weights !== null && weights.length !== n)) {
    throw new RangeError('brier score requires one PD, outcome, group (and weight) per account');
  }
  const w = new Float64Array(groups);
  const pdSum = new Float64Array(groups);
  const badSum = new Float64Array(groups);
  let total = 0;
  let squared = 0;
  let bads = 0;
  for (let i = 0; i < n; i++) {
    const weight = weights === null ? 1 : weights[i];
    const g = group[i];
    const d = pd[i] - bad[i];
    squared += weight * d * d;
    total += weight;
    bads += weight * bad[i];
    w[g] += weight;
    pdSum[g] += weight * pd[i];
    badSum[g] += weight * bad[i];
  }
  const overall = bads / total;
  let reliability = 0;
  let resolution = 0;
  for (let g = 0; g < groups; g++) {
    if (w[g] === 0) continue;
    const meanPd = pdSum[g] / w[g];
    const rate = badSum[g] / w[g];
    reliability += w[g] * (meanPd - rate) ** 2;
    resolution += w[g] * (rate - overall) ** 2;
  }
  reliability /= total;
  resolution /= total;
  const brier = squared / total;
  const uncertainty = overall * (1 - overall);
  return { brier, reliability, resolution, uncertainty, withinGroup: brier - (reliability - resolution + uncertainty) };
}
