import { MAX_CHALLENGERS } from '@shared/report';
import { delongCovariance } from './delong-covariance';
import { inferenceGap, pairedDelong, type PairedDelong, pairedFromSums } from './delong';
import { normalSf } from './normal';
import { holm } from './holm';
import { jointDelongTest, type JointTest } from './joint-delong';
import type { ScoreBlocks } from './order';
import { StatisticError } from './statistic-error';

/**
 * One champion against 1 to 5 challengers on the same accounts:
 * - each challenger against the champion: the paired DeLong test of delong.ts, unchanged (so with
 *   one challenger every figure is the two-model comparison's, to the bit), with Holm's
 *   adjustment (holm.ts) of the one- and two-sided p across the K comparisons;
 * - each pair of challengers (b against a, b listed after a): the same paired test;
 * - the joint test that every challenger equals the champion (joint-delong.ts) on the DeLong
 *   covariance matrix of all K + 1 AUCs (delong-covariance.ts).
 * Checked against pROC and an R contrast computation in tests/reference/challengers/.
 * With fewer than 2 goods or 2 bads there is no variance: the joint test is null and `inference`
 * says why (the pairwise results carry the same reason, as in delong.ts).
 * Cost: O(K²·n) after the sorts (K ≤ 5).
 */
export { MAX_CHALLENGERS };

export interface ChallengerAgainstChampion {
  delong: PairedDelong;
  /** Holm-adjusted p across the K challengers; null when the test could not be run. */
  pOneSidedHolm: number | null;
  pTwoSidedHolm: number | null;
}

export interface ChallengerPair {
  /** Challenger indices (0-based among the challengers), b after a; the difference is b − a. */
  a: number;
  b: number;
  deltaGini: number;
  giniSe: number | null;
  z: number | null;
  pTwoSided: number | null;
}

export interface SeveralChallengers {
  vsChampion: ChallengerAgainstChampion[];
  pairwise: ChallengerPair[];
  joint: JointTest | null;
  /** DeLong covariance matrix of the AUCs, champion first; null without a variance. */
  covariance: number[][] | null;
  inference: string | null;
}

export function severalChallengers(
  champion: ScoreBlocks,
  challengers: readonly ScoreBlocks[],
  bad: Uint8Array,
  confidence: number,
): SeveralChallengers {
  if (challengers.length < 1 || challengers.length > MAX_CHALLENGERS) {
    throw new StatisticError(`a comparison has 1 to ${MAX_CHALLENGERS} challengers, got ${challengers.length}`);
  }
  const gap = inferenceGap(champion.nGood, champion.nBad);
  const models = [champion, ...challengers];
  // With a variance: each model's placements once and every sum in one pass over the accounts
  // (delong-covariance.ts); each challenger's paired test from its sums, the same bits as delong.ts.
  const all = gap === null ? delongCovariance(models, bad) : null;
  const vs = challengers.map((challenger, k) =>
    all === null ? pairedDelong(champion, challenger, bad, confidence) : pairedFromSums(champion, all.auc[0], all.auc[k + 1], all.pairSums(0, k + 1), confidence),
  );
  const oneSided = holm(vs.map((v) => v.difference.pOneSided));
  const twoSided = holm(vs.map((v) => v.difference.pTwoSided));
  const pairwise: ChallengerPair[] = [];
  let covariance: number[][] | null = null;
  let joint: JointTest | null = null;
  if (all === null) {
    for (let a = 0; a < challengers.length; a++) {
      for (let b = a + 1; b < challengers.length; b++) {
        const { difference } = pairedDelong(challengers[a], challengers[b], bad, confidence);
        pairwise.push({ a, b, deltaGini: difference.gini, giniSe: difference.giniSe, z: difference.z, pTwoSided: difference.pTwoSided });
      }
    }
  } else {
    covariance = all.covariance;
    joint = jointDelongTest(all.auc, all.covariance);
    // Every pair of challengers from the same pass: the paired test's variance of the difference.
    for (let a = 0; a < challengers.length; a++) {
      for (let b = a + 1; b < challengers.length; b++) {
        const delta = all.auc[b + 1] - all.auc[a + 1];
        const test = zTest(delta, Math.sqrt(Math.max(0, all.differenceVariance[a + 1][b + 1])));
        pairwise.push({ a, b, deltaGini: 2 * delta, giniSe: 2 * test.se, z: test.z, pTwoSided: test.pTwoSided });
      }
    }
  }
  return {
    vsChampion: vs.map((delong, k) => ({ delong, pOneSidedHolm: oneSided[k], pTwoSidedHolm: twoSided[k] })),
    pairwise,
    joint,
    covariance,
    inference: gap,
  };
}

/** z and two-sided p of a difference and its standard error, as delong.ts states them (a zero se included). */
function zTest(delta: number, se: number): { se: number; z: number; pTwoSided: number } {
  if (se > 0) {
    const z = delta / se;
    return { se, z, pTwoSided: Math.min(1, 2 * normalSf(Math.abs(z))) };
  }
  if (delta === 0) return { se, z: 0, pTwoSided: 1 };
  return { se, z: delta > 0 ? Number.MAX_VALUE : -Number.MAX_VALUE, pTwoSided: 0 };
}
