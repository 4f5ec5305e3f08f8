import { beforeAll, describe, expect, it } from 'vitest';
import { auc } from '@server/stats/auc';
import { pairedDelong } from '@server/stats/delong';
import type { Holdout } from '@server/stats/holdout';
import { ks } from '@server/stats/ks';
import { safety, scoreBlocks } from '@server/stats/order';
import { cases, loadCase, proc, scipyKs } from './reference-fixtures';

// Expected values: tests/reference/holdouts/proc.json (R 4.2.2, pROC 1.18.0, printed by proc.R)
// and ks.json (scipy 1.10.1, printed by scipy_ks.py), on the CSVs written by generate.py.
// Tolerances near the measured agreement: AUC 1e-9 absolute (measured ≤ 4.5e-16); variances,
// covariance, se, z, intervals and p 1e-10 relative (measured ≤ 6.2e-14 over every case and
// segment, p included); KS exact.
const relative = (value: number, truth: number) => (truth === 0 ? Math.abs(value) : Math.abs(value - truth) / Math.abs(truth));

describe.each(cases.filter((c) => !c.single))('reference holdout $file', (referenceCase) => {
  let holdout: Holdout;
  beforeAll(async () => {
    holdout = await loadCase(referenceCase);
  });
  const expected = proc.cases[referenceCase.file];
  const blocksOf = (h: Holdout) => ({
    champion: scoreBlocks(safety(h.champion, h.higherIs.champion), h.bad),
    challenger: scoreBlocks(safety(h.challenger, h.higherIs.challenger), h.bad),
  });

  it('reads the same goods and bads as R', () => {
    expect(holdout.n).toBe(expected.n);
    expect(holdout.bad.reduce((sum, b) => sum + b, 0)).toBe(expected.bads);
  });

  it('agrees with pROC: AUCs, DeLong variances, covariance, z, p and intervals', () => {
    const blocks = blocksOf(holdout);
    const result = pairedDelong(blocks.champion, blocks.challenger, holdout.bad, 0.95);
    // pROC: auc(roc(...)) for each model
    expect(Math.abs(result.champion.auc - expected.champion.auc)).toBeLessThan(1e-9);
    expect(Math.abs(result.challenger.auc - expected.challenger.auc)).toBeLessThan(1e-9);
    expect(Math.abs(auc(blocks.champion) - expected.champion.auc)).toBeLessThan(1e-9);
    // pROC: var(roc, method = "delong"), cov(roc2, roc1, method = "delong")
    expect(relative(result.champion.variance!, expected.champion.var)).toBeLessThan(1e-10);
    expect(relative(result.challenger.variance!, expected.challenger.var)).toBeLessThan(1e-10);
    expect(relative(result.difference.covariance!, expected.cov)).toBeLessThan(1e-10);
    // pROC: ci.auc(roc, method = "delong") — se-based, 1e-10 relative
    expect(relative(result.champion.aucCi![0], expected.champion.ciLower)).toBeLessThan(1e-10);
    expect(relative(result.champion.aucCi![1], expected.champion.ciUpper)).toBeLessThan(1e-10);
    expect(relative(result.challenger.aucCi![0], expected.challenger.ciLower)).toBeLessThan(1e-10);
    expect(relative(result.challenger.aucCi![1], expected.challenger.ciUpper)).toBeLessThan(1e-10);
    // pROC: roc.test(challenger, champion, method = "delong", paired = TRUE): statistic, p.value,
    // conf.int; and alternative = "greater" for the one-sided p.
    expect(relative(result.difference.z!, expected.z!)).toBeLessThan(1e-10);
    expect(relative(result.difference.se!, (expected.challenger.auc - expected.champion.auc) / expected.z!)).toBeLessThan(1e-10);
    expect(relative(result.difference.pTwoSided!, expected.pTwoSided!)).toBeLessThan(1e-10);
    expect(relative(result.difference.pOneSided!, expected.pOneSided!)).toBeLessThan(1e-10);
    expect(relative(result.difference.aucCi![0], expected.ciLower)).toBeLessThan(1e-10);
    expect(relative(result.difference.aucCi![1], expected.ciUpper)).toBeLessThan(1e-10);
    // sqrt(V1 + V2 − 2C) is the se computed from the placement differences
    const { varianceChampion, varianceChallenger, covariance } = result.difference;
    expect(relative(result.difference.se!, Math.sqrt(varianceChampion! + varianceChallenger! - 2 * covariance!))).toBeLessThan(1e-9);
    expect(result.difference.gini).toBeCloseTo(2 * result.difference.auc, 15);
  });

  it('agrees with scipy.stats.ks_2samp: the statistic exactly, and where it is reached', () => {
    const blocks = blocksOf(holdout);
    for (const model of ['champion', 'challenger'] as const) {
      const expectedKs = scipyKs.cases[referenceCase.file][model];
      const result = ks(blocks[model], holdout.higherIs[model]);
      // the exact fraction |B·n_good − G·n_bad| / (n_bad·n_good), rounded once (exact integers in Python)
      expect(result.ks).toBe(expectedKs.exactFraction);
      // scipy's own statistic: identical in its exact mode, within 2 ulp in its asymptotic mode
      if (expectedKs.scipyMode === 'exact') expect(result.ks).toBe(expectedKs.statistic);
      else expect(Math.abs(result.ks - expectedKs.statistic)).toBeLessThanOrEqual(2 * Number.EPSILON * expectedKs.statistic);
      // location: the riskiest score where the largest gap is reached (numpy, exact integers);
      // equal to scipy's statistic_location when the gap is reached at one score only
      expect(result.score).toBe(expectedKs.riskiestReached);
      if (expectedKs.reachedAt.length === 1) expect(result.score).toBe(expectedKs.statisticLocation);
    }
  });

  if (referenceCase.segment) {
    it('agrees with pROC within each segment', () => {
      const column = holdout.segments[0];
      for (const expectedSegment of expected.segments!) {
        const code = column.levels.indexOf(expectedSegment.value);
        const rows: number[] = [];
        for (let i = 0; i < holdout.n; i++) if (column.codes[i] === code) rows.push(i);
        const sub: Holdout = {
          ...holdout,
          n: rows.length,
          bad: Uint8Array.from(rows, (i) => holdout.bad[i]),
          champion: Float64Array.from(rows, (i) => holdout.champion[i]),
          challenger: Float64Array.from(rows, (i) => holdout.challenger[i]),
          segments: [],
        };
        const blocks = blocksOf(sub);
        const result = pairedDelong(blocks.champion, blocks.challenger, sub.bad, 0.95);
        expect(sub.n).toBe(expectedSegment.n);
        expect(Math.abs(result.champion.auc - expectedSegment.champion.auc)).toBeLessThan(1e-9);
        expect(relative(result.difference.z!, expectedSegment.z!)).toBeLessThan(1e-10);
        expect(relative(result.difference.pOneSided!, expectedSegment.pOneSided!)).toBeLessThan(1e-10);
      }
    });
  }
});
