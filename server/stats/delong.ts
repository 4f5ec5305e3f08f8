import type { Interval } from '@shared/report';
import { auc } from './auc';
import { normalQuantile, normalSf } from './normal';
import { type BlockCounts, rowBlocks, type ScoreBlocks } from './order';
import { StatisticError } from './statistic-error';

/**
 * Paired DeLong test of two correlated AUCs on the same accounts (DeLong, DeLong &
 * Clarke-Pearson 1988, Biometrics 44:837–845), with the structural components computed by the
 * O(n log n) midrank algorithm of Sun & Xu 2014 (IEEE Signal Processing Letters 21:1389–1393).
 *
 * Sun & Xu write the placements with midranks: for a good i (the "positive" class here, AUC =
 * P(good safer than bad)), V10_i = (T_Z,i − T_X,i) / n_bad, where T_Z is its midrank among all
 * accounts and T_X among goods; for a bad j, V01_j = 1 − (T_Z,j − T_Y,j) / n_good. A midrank
 * difference is just "accounts of the other class strictly below, plus half of those tied", so
 * one pass over the equal-score blocks of one sort gives every placement:
 *   good in block k: V10 = (bads below k + ½ bads in k) / n_bad
 *   bad in block k:  V01 = (goods above k + ½ goods in k) / n_good
 * Then S10 = cov of the V10 over goods (divisor n_good − 1), S01 likewise over bads, and
 * Var = S10 / n_good + S01 / n_bad — the same estimator as R's pROC (var(), cov(), roc.test).
 *
 * Difference = challenger − champion. se(ΔAUC) is computed from the per-account differences of
 * the placements, which equals sqrt(V1 + V2 − 2C) without its cancellation; z = ΔAUC / se;
 * two-sided p = 2·P(Z > |z|); one-sided p = P(Z > z) for H1 "the challenger's AUC is higher".
 * Intervals: Wald intervals Δ ± z_{1−α/2}·se (for each AUC: AUC ± z·se), then clamped to the
 * range the quantity can take — [0, 1] for an AUC, [−1, 1] for ΔAUC, so [−1, 1] and [−2, 2] in
 * Gini units. The clamp only bites when the unclamped bound lies outside what is possible; the
 * interval is otherwise exactly Δ ± z·se. ΔGini = 2·ΔAUC with twice the se and interval.
 *
 * Edge cases, all defined, never NaN:
 * - one class missing: StatisticError (no AUC).
 * - fewer than 2 goods or fewer than 2 bads: that class's sample variance is undefined, so there
 *   is no variance, no test and no interval: those fields are null and `inference` says why
 *   (the AUCs and their difference are still given).
 * - identical rankings: Δ = 0, se = 0, z = 0, two-sided p = 1 (docs/design.md) and one-sided p = 0.5:
 *   P(Z > 0), the limit of the one-sided p of nearly identical models; 2·min(p, 1 − p) gives the
 *   two-sided 1 back.
 * - se = 0 with Δ ≠ 0 (one model separates perfectly while the other is constant): the evidence
 *   is as strong as the data allow; z = ±Number.MAX_VALUE, p = 0 (one-sided 0 or 1).
 *
 * Sampling weights (blocks.weights, weighted-auc.ts): the placements come from weighted counts,
 *   good in block k: V10 = (weight of bads below k + ½ weight of bads in k) / W_bad
 *   bad in block k:  V01 = (weight of goods above k + ½ weight of goods in k) / W_good
 * and the variance is the linearisation (influence-function) estimator of the weighted
 * Mann–Whitney statistic (Binder 1983, International Statistical Review 51:279–292), with the
 * usual small-sample factor per class of m rows and total weight W:
 *   Var = Σ_classes m/(m−1) · Σ_i (w_i/W)² (V_i − θ)²
 * and the paired covariance and the variance of the difference likewise (products of the two
 * models' centred placements, and their differences). With every weight equal it is the
 * unweighted estimator above exactly: it is computed as [Σ w_i²(V_i−θ)² / (m−1) / m]·(m/W)²,
 * and with weights 1 the factor is exactly 1. Checked against a seeded row bootstrap
 * (tests/reference/weights/).
 *
 * Cost: O(n) after the two sorts.
 */

export interface ModelDelong {
  auc: number;
  /** DeLong variance of the AUC; null with fewer than 2 goods or 2 bads. */
  variance: number | null;
  aucSe: number | null;
  aucCi: Interval | null;
  gini: number;
  giniCi: Interval | null;
}

export interface PairedDelong {
  champion: ModelDelong;
  challenger: ModelDelong;
  difference: {
    auc: number;
    gini: number;
    se: number | null;
    giniSe: number | null;
    z: number | null;
    pTwoSided: number | null;
    pOneSided: number | null;
    aucCi: Interval | null;
    giniCi: Interval | null;
    varianceChampion: number | null;
    varianceChallenger: number | null;
    covariance: number | null;
    correlation: number | null;
    /** Why there is no variance, test or interval; null when they are defined. */
    inference: string | null;
  };
}

/** Why DeLong inference is undefined for these counts (fewer than 2 of a class), or null. */
export function inferenceGap(nGood: number, nBad: number): string | null {
  if (nBad >= 2 && nGood >= 2) return null;
  const which = nBad < 2 ? `${nBad} ${nBad === 1 ? 'bad' : 'bads'}` : `${nGood} ${nGood === 1 ? 'good' : 'goods'}`;
  return `only ${which}: a variance needs at least 2 goods and 2 bads, so there is no standard error, test or interval`;
}

/**
 * Each account's placement: V10 for goods, V01 for bads (weighted counts when the blocks have
 * weights). With the outcome per row (`bad`, the one the blocks were made from), each row looks its
 * block's two placements up in row order (rowBlocks, order.ts); without it, the plain way: every
 * block's rows written in sorted order (placementsReference). The same numbers either way.
 */
export function placements(blocks: ScoreBlocks, n: number, bad?: Uint8Array): Float64Array {
  if (bad === undefined) return placementsReference(blocks, n);
  const { forGood, forBad } = blockPlacements(blocks);
  const rowBlock = rowBlocks(blocks);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = bad[i] ? forBad[rowBlock[i]] : forGood[rowBlock[i]];
  return out;
}

/** The placement of a good and of a bad in each block. */
export function blockPlacements(blocks: BlockCounts): { forGood: Float64Array; forBad: Float64Array } {
  const { count } = blocks;
  const goods = blocks.weights ? blocks.weights.goods : blocks.goods;
  const bads = blocks.weights ? blocks.weights.bads : blocks.bads;
  const nGood = blocks.weights ? blocks.weights.good : blocks.nGood;
  const nBad = blocks.weights ? blocks.weights.bad : blocks.nBad;
  const forGood = new Float64Array(count);
  const forBad = new Float64Array(count);
  let badsBelow = 0;
  let goodsAbove = nGood;
  for (let k = 0; k < count; k++) {
    const g = goods[k];
    const b = bads[k];
    goodsAbove -= g;
    forGood[k] = (badsBelow + b / 2) / nBad;
    forBad[k] = (goodsAbove + g / 2) / nGood;
    badsBelow += b;
  }
  return { forGood, forBad };
}

/** placements() the plain way: each block's rows written in sorted order. */
export function placementsReference(blocks: ScoreBlocks, n: number): Float64Array {
  const { order, sortedBad, count, start } = blocks;
  const { forGood, forBad } = blockPlacements(blocks);
  const out = new Float64Array(n);
  for (let k = 0; k < count; k++) {
    for (let at = start[k]; at < start[k + 1]; at++) out[order[at]] = sortedBad[at] ? forBad[k] : forGood[k];
  }
  return out;
}

function interval(centre: number, se: number, q: number, lo: number, hi: number): Interval {
  return [Math.max(lo, centre - q * se), Math.min(hi, centre + q * se)];
}

export function pairedDelong(
  champion: ScoreBlocks,
  challenger: ScoreBlocks,
  bad: Uint8Array,
  confidence: number,
): PairedDelong {
  const n = bad.length;
  const { nGood, nBad } = champion;
  if (challenger.nGood !== nGood || challenger.nBad !== nBad || champion.order.length !== n || challenger.order.length !== n) {
    throw new StatisticError('paired DeLong requires both models scored on the same accounts');
  }
  if (nGood === 0 || nBad === 0) throw new StatisticError('auc requires at least one good and one bad');
  if (!(confidence > 0 && confidence < 1)) throw new StatisticError(`confidence must be between 0 and 1, got ${confidence}`);

  const thetaA = auc(champion);
  const thetaB = auc(challenger);
  const gap = inferenceGap(nGood, nBad);
  if (gap !== null) return pairedWithoutVariance(thetaA, thetaB, gap);
  const pa = placements(champion, n, bad);
  const pb = placements(challenger, n, bad);

  // Sums of squares and cross-products of centred placements, per class.
  let gAA = 0;
  let gBB = 0;
  let gAB = 0;
  let gDD = 0;
  let bAA = 0;
  let bBB = 0;
  let bAB = 0;
  let bDD = 0;
  const weights = champion.weights?.row ?? null;
  if (weights !== null && !challenger.weights) throw new StatisticError('paired DeLong requires both models weighted alike');
  for (let i = 0; i < n; i++) {
    const a = pa[i] - thetaA;
    const b = pb[i] - thetaB;
    const d = b - a;
    // Each account's squared weight: 1 without weights (a·a is then unchanged to the bit).
    const ww = weights === null ? 1 : weights[i] * weights[i];
    if (bad[i]) {
      bAA += ww * (a * a);
      bBB += ww * (b * b);
      bAB += ww * (a * b);
      bDD += ww * (d * d);
    } else {
      gAA += ww * (a * a);
      gBB += ww * (b * b);
      gAB += ww * (a * b);
      gDD += ww * (d * d);
    }
  }
  return pairedFromSums(champion, thetaA, thetaB, { gAA, gBB, gAB, gDD, bAA, bBB, bAB, bDD }, confidence);
}

/** The paired result when there is no variance (fewer than 2 goods or 2 bads, `gap` says so): the AUCs and their difference only. */
export function pairedWithoutVariance(thetaA: number, thetaB: number, gap: string): PairedDelong {
  const bare = (theta: number): ModelDelong => ({ auc: theta, variance: null, aucSe: null, aucCi: null, gini: 2 * theta - 1, giniCi: null });
  return {
    champion: bare(thetaA),
    challenger: bare(thetaB),
    difference: {
      auc: thetaB - thetaA,
      gini: 2 * (thetaB - thetaA),
      se: null,
      giniSe: null,
      z: null,
      pTwoSided: null,
      pOneSided: null,
      aucCi: null,
      giniCi: null,
      varianceChampion: null,
      varianceChallenger: null,
      covariance: null,
      correlation: null,
      inference: gap,
    },
  };
}

/**
 * Per class (g: goods, b: bads), the weighted sums over the accounts of the centred placements'
 * squares and cross-product, A the champion's, B the challenger's, D = B − A (squared weights).
 */
export interface PlacementSums {
  gAA: number;
  gBB: number;
  gAB: number;
  gDD: number;
  bAA: number;
  bBB: number;
  bAB: number;
  bDD: number;
}

/**
 * The paired test from its sums (pairedDelong, or several-challengers.ts summing every pair in one
 * pass: the same sums give the same bits). `champion` gives the class sizes and weights.
 */
export function pairedFromSums(champion: BlockCounts, thetaA: number, thetaB: number, sums: PlacementSums, confidence: number): PairedDelong {
  const { nGood, nBad } = champion;
  const { gAA, gBB, gAB, gDD, bAA, bBB, bAB, bDD } = sums;
  const delta = thetaB - thetaA;
  const weights = champion.weights?.row ?? null;
  const wGood = champion.weights ? champion.weights.good : nGood;
  const wBad = champion.weights ? champion.weights.bad : nBad;
  // m/(m−1)·Σ(w/W)²(V−θ)², as [Σw²(V−θ)²/(m−1)/m]·(m/W)²: the unweighted form when W = m.
  const component = (sum: number, size: number, total: number) => {
    if (size <= 1) return 0;
    const base = sum / (size - 1) / size;
    return weights === null ? base : base * (size / total) * (size / total);
  };
  const varianceA = component(gAA, nGood, wGood) + component(bAA, nBad, wBad);
  const varianceB = component(gBB, nGood, wGood) + component(bBB, nBad, wBad);
  const covariance = component(gAB, nGood, wGood) + component(bAB, nBad, wBad);
  const varianceDelta = component(gDD, nGood, wGood) + component(bDD, nBad, wBad);

  const se = Math.sqrt(Math.max(0, varianceDelta));
  let z: number;
  let pTwoSided: number;
  let pOneSided: number;
  if (se > 0) {
    z = delta / se;
    pTwoSided = Math.min(1, 2 * normalSf(Math.abs(z)));
    pOneSided = normalSf(z);
  } else if (delta === 0) {
    z = 0;
    pTwoSided = 1;
    pOneSided = 0.5;
  } else {
    z = delta > 0 ? Number.MAX_VALUE : -Number.MAX_VALUE;
    pTwoSided = 0;
    pOneSided = delta > 0 ? 0 : 1;
  }

  const q = normalQuantile(1 - (1 - confidence) / 2);
  const model = (theta: number, variance: number): ModelDelong => {
    const aucSe = Math.sqrt(Math.max(0, variance));
    const aucCi = interval(theta, aucSe, q, 0, 1);
    return {
      auc: theta,
      variance,
      aucSe,
      aucCi,
      gini: 2 * theta - 1,
      giniCi: [2 * aucCi[0] - 1, 2 * aucCi[1] - 1],
    };
  };
  const aucCi = interval(delta, se, q, -1, 1);
  return {
    champion: model(thetaA, varianceA),
    challenger: model(thetaB, varianceB),
    difference: {
      auc: delta,
      gini: 2 * delta,
      se,
      giniSe: 2 * se,
      z,
      pTwoSided,
      pOneSided,
      aucCi,
      giniCi: [2 * aucCi[0], 2 * aucCi[1]],
      varianceChampion: varianceA,
      varianceChallenger: varianceB,
      covariance,
      correlation: varianceA > 0 && varianceB > 0 ? covariance / Math.sqrt(varianceA * varianceB) : null,
      inference: null,
    },
  };
}
