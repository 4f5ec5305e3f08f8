import type { Curves } from '@shared/report';
import { accountsAt, knownAt, type PreparedHoldout, type PreparedModel } from './policy-data';

/**
 * ROC, CAP and KS-chart points of both models, walking the accounts riskiest first and taking a
 * point after each block of equal scores (so ties make one diagonal step):
 *   ROC  x = share of goods declined, y = share of bads declined (Hanley & McNeil 1982);
 *   CAP  x = share of all accounts declined, y = share of bads declined (Engelmann, Hayden &
 *        Tasche 2003, Bundesbank DP 2003/01);
 *   KS   per score value: the cumulative shares of bads and goods at or below it in risk order
 *        (Kolmogorov 1933 / Smirnov 1948).
 * Downsampling (common practice, no source): when a curve has more than 500 points, keep both
 * endpoints, the point of the largest |cumBad − cumGood| gap (the KS point), and for each of 497
 * evenly spaced x values the first point at or beyond it (x is the share of goods declined for
 * ROC and the share of accounts declined for CAP and the KS chart, so outlying scores do not
 * starve the bulk of points). The whole range is covered; nothing is dropped from the tail.
 * Weighted: shares of summed weights (the engine passes data of the rows with a known outcome).
 * Cost: O(distinct scores) per model on prepared data.
 */

const MAX_POINTS = 500;

export function curves(data: PreparedHoldout): Curves {
  if (data.bads === 0 || data.goods === 0) throw new Error('curves require at least one good and one bad');
  const champion = modelCurves(data, data.champion);
  const challenger = modelCurves(data, data.challenger);
  return {
    roc: { champion: champion.roc, challenger: challenger.roc },
    cap: { champion: champion.cap, challenger: challenger.cap },
    ks: { champion: champion.ks, challenger: challenger.ks },
  };
}

function modelCurves(data: PreparedHoldout, model: PreparedModel) {
  const { bads, goods } = data;
  const total = data.accounts;
  const m = model.blockEnds.length;
  // Point j (0 … m) is after the first j blocks: position P_j, P_0 = 0.
  const position = new Float64Array(m + 1);
  position.set(model.blockEnds, 1);
  const badShare = new Float64Array(m + 1);
  const goodShare = new Float64Array(m + 1);
  const populationShare = new Float64Array(m + 1);
  let ksIndex = 0;
  let ksGap = -1;
  for (let j = 0; j <= m; j++) {
    const cumBad = model.badsBefore[position[j]];
    badShare[j] = cumBad / bads;
    goodShare[j] = (knownAt(model, position[j]) - cumBad) / goods;
    populationShare[j] = accountsAt(model, position[j]) / total;
    const gap = Math.abs(badShare[j] - goodShare[j]);
    if (gap > ksGap) {
      ksGap = gap;
      ksIndex = j;
    }
  }
  const rocIndices = downsample(goodShare, 0, m, ksIndex);
  const capIndices = downsample(populationShare, 0, m, ksIndex);
  const ksIndices = downsample(populationShare, 1, m, Math.max(1, ksIndex));
  const scoreAt = (j: number) => {
    const s = model.sorted[position[j] - 1];
    return model.higherIs === 'safer' ? s : -s;
  };
  return {
    roc: rocIndices.map((j) => ({ x: goodShare[j], y: badShare[j] })),
    cap: capIndices.map((j) => ({ x: populationShare[j], y: badShare[j] })),
    ks: ksIndices.map((j) => ({ score: scoreAt(j), cumBad: badShare[j], cumGood: goodShare[j] })),
  };
}

/** Indices first … last of a curve with non-decreasing x, at most MAX_POINTS of them (see header). */
function downsample(x: Float64Array, first: number, last: number, keep: number): number[] {
  const all = last - first + 1;
  if (all <= MAX_POINTS) return Array.from({ length: all }, (_, i) => first + i);
  const picked = new Set<number>([first, last, keep]);
  const targets = MAX_POINTS - 3;
  const low = x[first];
  const span = x[last] - low;
  let j = first;
  for (let t = 1; t <= targets; t++) {
    const target = low + (span * t) / (targets + 1);
    while (j < last && x[j] < target) j++;
    picked.add(j);
  }
  return [...picked].sort((p, q) => p - q);
}
