import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { auc } from '@server/stats/auc';
import { pairedDelong } from '@server/stats/delong';
import { safety, scoreBlocks } from '@server/stats/order';
import { StatisticError } from '@server/stats/statistic-error';
import { cases, loadCase, proc } from './reference-fixtures';

const blocks = (scores: number[], bad: number[], higherIs: 'safer' | 'riskier' = 'safer') =>
  scoreBlocks(safety(Float64Array.from(scores), higherIs), Uint8Array.from(bad));

/** AUC by definition, over every good–bad pair (O(n²)); the oracle for the property tests. */
function pairwiseAuc(scores: number[], bad: number[]): number {
  let wins = 0;
  let pairs = 0;
  for (let i = 0; i < scores.length; i++) {
    if (bad[i]) continue;
    for (let j = 0; j < scores.length; j++) {
      if (!bad[j]) continue;
      pairs++;
      wins += scores[i] > scores[j] ? 1 : scores[i] === scores[j] ? 0.5 : 0;
    }
  }
  return wins / pairs;
}

const holdoutArbitrary = fc
  .array(fc.tuple(fc.integer({ min: -5, max: 5 }), fc.boolean()), { minLength: 2, maxLength: 60 })
  .filter((rows) => rows.some(([, b]) => b) && rows.some(([, b]) => !b));

describe('auc', () => {
  it("matches scikit-learn's documented example: y = [0, 0, 1, 1], s = [0.1, 0.4, 0.35, 0.8] → 0.75", () => {
    // sklearn.metrics.roc_auc_score docs; 1 is the event (bad), higher score = riskier. Exact.
    expect(auc(blocks([0.1, 0.4, 0.35, 0.8], [0, 0, 1, 1], 'riskier'))).toBe(0.75);
  });

  it('reproduces Hanley & McNeil 1982, Table 1 (AUC 0.8931710615) and pROC on it', async () => {
    // Radiology 143:29–36, Table 1 rating counts (normal 33, 6, 6, 11, 2; abnormal 3, 2, 2, 11, 33);
    // AUC 0.893 in the paper, 0.8931710615 to ten digits (issue 3); pROC prints 0.89317106152806.
    const referenceCase = cases.find((c) => c.single)!;
    const holdout = await loadCase(referenceCase);
    const b = scoreBlocks(safety(holdout.champion, 'riskier'), holdout.bad);
    expect(Math.abs(auc(b) - 0.8931710615)).toBeLessThan(1e-10);
    expect(Math.abs(auc(b) - proc.cases[referenceCase.file].champion.auc)).toBeLessThan(1e-9);
    // DeLong variance vs pROC's var(roc): 1e-10 relative (measured 5.7e-16). Hanley & McNeil's own formula gives
    // 0.0325 (proc.R computes it), published as SE 0.032 (from memory); DeLong's SE is 0.0307.
    const result = pairedDelong(b, b, holdout.bad, 0.95);
    const expected = proc.cases[referenceCase.file];
    expect(Math.abs(result.champion.variance! - expected.champion.var) / expected.champion.var).toBeLessThan(1e-10);
    expect(expected.hanleyMcNeilSe!).toBeCloseTo(0.032, 3);
    expect(result.champion.aucSe).toBeGreaterThan(0.025);
    expect(result.champion.aucSe).toBeLessThan(0.035);
  });

  it('counts tied scores as one half', () => {
    // computed by hand: one good and one bad, tied → ½; plus a good above the bad → (½ + 1) / 2
    expect(auc(blocks([3, 3], [0, 1]))).toBe(0.5);
    expect(auc(blocks([3, 3, 4], [0, 1, 0]))).toBe(0.75);
  });

  it('equals the pairwise Mann–Whitney count on random holdouts with ties', () => {
    fc.assert(
      fc.property(holdoutArbitrary, (rows) => {
        const scores = rows.map(([s]) => s);
        const bad = rows.map(([, b]) => (b ? 1 : 0));
        expect(Math.abs(auc(blocks(scores, bad)) - pairwiseAuc(scores, bad))).toBeLessThan(1e-12);
      }),
    );
  });

  it('satisfies AUC(−s) = 1 − AUC(s), i.e. flipping the orientation', () => {
    fc.assert(
      fc.property(holdoutArbitrary, (rows) => {
        const scores = rows.map(([s]) => s);
        const bad = rows.map(([, b]) => (b ? 1 : 0));
        const up = auc(blocks(scores, bad, 'safer'));
        const down = auc(blocks(scores, bad, 'riskier'));
        expect(Math.abs(up + down - 1)).toBeLessThan(1e-12);
      }),
    );
  });

  it('is 1 for perfect separation, 0 for the reverse, ½ for constant scores', () => {
    expect(auc(blocks([1, 2, 3, 4], [1, 1, 0, 0]))).toBe(1);
    expect(auc(blocks([1, 2, 3, 4], [0, 0, 1, 1]))).toBe(0);
    expect(auc(blocks([7, 7, 7, 7, 7], [0, 1, 0, 0, 1]))).toBe(0.5);
  });

  it('refuses a holdout with one class only, with a clear message', () => {
    expect(() => auc(blocks([1, 2, 3], [0, 0, 0]))).toThrow(StatisticError);
    expect(() => auc(blocks([1, 2, 3], [1, 1, 1]))).toThrow('auc requires at least one good and one bad');
  });

  it('does not overflow when n_good·n_bad passes 2^32', () => {
    // 100,000 goods above 50,000 bads: n_good·n_bad = 5e9 > 2^32; AUC exactly 1, then ½ for ties.
    const n = 150_000;
    const bad = new Uint8Array(n);
    const scores = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      bad[i] = i < 50_000 ? 1 : 0;
      scores[i] = bad[i] ? 1 : 2;
    }
    expect(auc(scoreBlocks(scores, bad))).toBe(1);
    expect(auc(scoreBlocks(new Float64Array(n), bad))).toBe(0.5);
  });
});
