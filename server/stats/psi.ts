import type { HigherIs } from '@shared/report';
import type { Psi } from '@shared/calibration';
import { argsortAscending, safety } from './order';
import { psiCriticalValue } from './psi-critical-value';
import { StatisticError } from './statistic-error';

/**
 * The population stability index of one model's score between a reference sample (the
 * development sample, or an earlier period) and a compared sample (the holdout, or a later period):
 *   PSI = Σᵢ (aᵢ − eᵢ) ln(aᵢ / eᵢ)
 * over the reference's quantile bands (eᵢ the reference's share in band i, aᵢ the compared
 * sample's). The bands are the band rule of policy-data.ts applied to the reference's scores
 * (equal-count bands that never split a score value, riskiest first); a compared account goes to
 * the band whose score range holds its score, below the first band's range to band 1 and above the
 * last band's to the last (through the reference's band upper bounds).
 * An empty band on either side would make the index infinite: its count is taken as 0.5 (common
 * practice, no source) and the band is counted in `emptyBandsAdjusted`.
 * The critical value is Yurdakul & Naranjo's (psi-critical-value.ts), with the compared sample's
 * Kish effective size when it is weighted. Ratings at 0.1 and 0.25: common practice, no source.
 * The index itself is the trade's (described e.g. in N. Siddiqi 2006, "Credit Risk Scorecards",
 * Wiley, as the system stability index).
 *
 * Weights: the compared sample's accounts may carry weights (`actualWeights`); the reference is
 * taken unweighted. Cost: O(M log M + N log B).
 */

export const PSI_WATCH = 0.1;
export const PSI_SHIFTED = 0.25;

export interface PsiInput {
  reference: Float64Array;
  actual: Float64Array;
  actualWeights: Float64Array | null;
  higherIs: HigherIs;
  bands: number;
  alpha: number;
}

export function psi(input: PsiInput): Psi {
  const { reference, actual, actualWeights, higherIs, bands, alpha } = input;
  const m = reference.length;
  const n = actual.length;
  if (m === 0) throw new StatisticError('psi requires a reference sample with at least one account');
  if (n === 0) throw new StatisticError('psi requires a compared sample with at least one account');
  if (actualWeights !== null && actualWeights.length !== n) throw new StatisticError('psi requires one weight per compared account');
  const safeRef = safety(reference, higherIs);
  const order = argsortAscending(safeRef);
  const sorted = new Float64Array(m);
  const blockEndList: number[] = [];
  for (let k = 0; k < m; k++) {
    sorted[k] = safeRef[order[k]];
    if (k > 0 && sorted[k] !== sorted[k - 1]) blockEndList.push(k);
  }
  blockEndList.push(m);
  // The band rule of policy-data.ts (unweighted): each block of equal scores goes wholly to the band its middle falls in.
  const endList: number[] = [];
  let current = -1;
  let blockStart = 0;
  for (const end of blockEndList) {
    const ideal = Math.floor(((blockStart + end) * bands) / (2 * m));
    if (ideal !== current) {
      if (current >= 0) endList.push(blockStart);
      current = ideal;
    }
    blockStart = end;
  }
  endList.push(m);
  const bandEnds = Uint32Array.from(endList);
  const count = bandEnds.length;
  if (count < 2) throw new StatisticError('psi requires a reference with at least two distinct scores');
  // Upper bound of each band in safety units; the last is open above.
  const upper = new Float64Array(count);
  const referenceCounts = new Float64Array(count);
  let start = 0;
  for (let b = 0; b < count; b++) {
    upper[b] = sorted[bandEnds[b] - 1];
    referenceCounts[b] = bandEnds[b] - start;
    start = bandEnds[b];
  }
  const actualCounts = new Float64Array(count);
  let total = 0;
  let squares = 0;
  for (let i = 0; i < n; i++) {
    const v = higherIs === 'safer' ? actual[i] : -actual[i];
    if (!Number.isFinite(v)) throw new StatisticError(`psi: score of compared account ${i + 1} is not a finite number`);
    // First band whose upper bound is ≥ v (the last band when none is).
    let low = 0;
    let high = count - 1;
    while (low < high) {
      const middle = (low + high) >>> 1;
      if (upper[middle] >= v) high = middle;
      else low = middle + 1;
    }
    const w = actualWeights === null ? 1 : actualWeights[i];
    actualCounts[low] += w;
    total += w;
    squares += w * w;
  }
  if (!(total > 0)) throw new StatisticError('psi requires compared weights that sum to more than 0');
  const effectiveN = actualWeights === null ? n : (total * total) / squares;
  let adjusted = 0;
  let refTotal = m;
  let actTotal = total;
  for (let b = 0; b < count; b++) {
    if (referenceCounts[b] === 0 || actualCounts[b] === 0) adjusted++;
  }
  // With an empty band, both sides' empties take 0.5 (in the side's own units) and shares are renormalised.
  const actualUnit = actualWeights === null ? 1 : total / n;
  if (adjusted > 0) {
    refTotal = 0;
    actTotal = 0;
    for (let b = 0; b < count; b++) {
      if (referenceCounts[b] === 0) referenceCounts[b] = 0.5;
      if (actualCounts[b] === 0) actualCounts[b] = 0.5 * actualUnit;
      refTotal += referenceCounts[b];
      actTotal += actualCounts[b];
    }
  }
  let index = 0;
  const rows: Psi['bands'] = [];
  start = 0;
  for (let b = 0; b < count; b++) {
    const e = referenceCounts[b] / refTotal;
    const a = actualCounts[b] / actTotal;
    const contribution = (a - e) * Math.log(a / e);
    index += contribution;
    const low = sorted[start];
    const high = sorted[bandEnds[b] - 1];
    const range = higherIs === 'safer' ? { scoreMin: low, scoreMax: high } : { scoreMin: -high, scoreMax: -low };
    rows.push({ band: b + 1, ...range, referenceShare: e, actualShare: a, contribution });
    start = bandEnds[b];
  }
  const criticalValue = psiCriticalValue(count, m, effectiveN, alpha);
  return {
    psi: index,
    bands: rows,
    referenceSize: m,
    actualSize: effectiveN,
    criticalValue,
    criticalAlpha: alpha,
    significant: index > criticalValue,
    rating: index < PSI_WATCH ? 'stable' : index < PSI_SHIFTED ? 'watch' : 'shifted',
    emptyBandsAdjusted: adjusted,
  };
}
