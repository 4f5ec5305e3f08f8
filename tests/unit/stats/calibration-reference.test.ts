import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { binomialTestUpper } from '@server/stats/binomial-test';
import { brierScore } from '@server/stats/brier';
import { calibration } from '@server/stats/calibration';
import { chiSquareQuantile } from '@server/stats/chi-square';
import { regularizedIncompleteBeta } from '@server/stats/incomplete-beta';
import { jeffreysTest } from '@server/stats/jeffreys';
import { psi } from '@server/stats/psi';
import { psiCriticalValue } from '@server/stats/psi-critical-value';

// Every expected value below comes from tests/reference/calibration/values.json, written by
// tests/reference/calibration/generate.py with scipy, scikit-learn, numpy and mpmath (versions in
// the file; its printed output in generate.out). No project code ran to make them.
interface GroupValues {
  accounts: number;
  meanPd: number;
  observedBadRate: number;
  effectiveAccounts: number;
  jeffreysP: number;
  binomialP: number;
  wilson: [number, number];
}
interface GradeSection {
  rows: Record<string, GroupValues>;
  brierSklearn: number;
  reliability: number;
  resolution: number;
  uncertainty: number;
  binomtestScipy?: Record<string, number>;
}
const values = JSON.parse(readFileSync('tests/reference/calibration/values.json', 'utf8')) as {
  incompleteBeta: { x: number; a: number; b: number; mpmath: number; scipy: number }[];
  tests: { pd: number; defaults: number; accounts: number; jeffreysScipy: number; jeffreysMpmath: number; binomialScipy: number }[];
  chiSquare: { q: number; df: number; scipy: number }[];
  grades_unweighted: GradeSection;
  grades_weighted: GradeSection;
  psi: {
    reference: number[];
    actual: number[];
    actualWeights: number[];
    unweighted: { psi: number; actualShares: number[]; criticalValue: number };
    weighted: { psi: number; actualShares: number[]; effectiveSize: number; criticalValue: number };
  };
  psiNull: Record<string, { M: number; N: number; bands: number; simulatedQuantile95: number; simulatedQuantile99: number }>;
};

const rel = (actual: number, expected: number) => (expected === 0 ? Math.abs(actual) : Math.abs(actual - expected) / Math.abs(expected));

describe('regularized incomplete beta', () => {
  it.each(values.incompleteBeta)('matches mpmath at 50 digits for x = $x, a = $a, b = $b', ({ x, a, b, mpmath }) => {
    // Measured: at most 1.1e-14 relative (the prefactor in Loader's form keeps its digits at large a, b).
    expect(rel(regularizedIncompleteBeta(x, a, b), mpmath)).toBeLessThan(1e-13);
  });

  it('agrees with scipy.special.betainc to scipy own accuracy', () => {
    // scipy (cephes) differs from mpmath by up to 9.6e-11 relative on these cases (generate.out);
    // we are closer to mpmath than scipy is, so the agreement with scipy is bounded by scipy's error.
    for (const { x, a, b, scipy } of values.incompleteBeta) expect(rel(regularizedIncompleteBeta(x, a, b), scipy)).toBeLessThan(2e-10);
  });
});

describe('Jeffreys and exact binomial tests', () => {
  it.each(values.tests)('match scipy for PD $pd, $defaults defaults of $accounts', ({ pd, defaults, accounts, jeffreysScipy, jeffreysMpmath, binomialScipy }) => {
    // Measured: 3.8e-14 against mpmath.
    expect(rel(jeffreysTest(pd, defaults, accounts), jeffreysMpmath)).toBeLessThan(1e-13);
    expect(rel(jeffreysTest(pd, defaults, accounts), jeffreysScipy)).toBeLessThan(2e-10);
    // scipy.stats.binomtest (its binom.sf); measured agreement 4.6e-13.
    expect(rel(binomialTestUpper(pd, defaults, accounts), binomialScipy)).toBeLessThan(1e-11);
  });
});

describe('chi-square quantile', () => {
  it.each(values.chiSquare)('matches scipy.stats.chi2.ppf($q, $df)', ({ q, df, scipy }) => {
    expect(rel(chiSquareQuantile(q, df), scipy)).toBeLessThan(1e-12);
  });
});

describe('calibration by grade on a holdout with tied PDs and weights', () => {
  const [, ...lines] = readFileSync('tests/reference/calibration/holdout-weighted.csv', 'utf8').trim().split('\n');
  const n = lines.length;
  const pd = new Float64Array(n);
  const bad = new Uint8Array(n);
  const weight = new Float64Array(n);
  const labels = ['A', 'B', 'C', 'D', 'E'];
  const codes = new Uint32Array(n);
  lines.forEach((line, i) => {
    const [grade, p, y, w] = line.split(',');
    codes[i] = labels.indexOf(grade);
    pd[i] = Number(p);
    bad[i] = Number(y);
    weight[i] = Number(w);
  });
  const groups = { codes, labels, bandNumbers: null, order: [0, 1, 2, 3, 4] };

  for (const [name, weights, section] of [
    ['unweighted', null, values.grades_unweighted],
    ['weighted', weight, values.grades_weighted],
  ] as const) {
    it(`matches scipy and numpy per grade and for the portfolio (${name})`, () => {
      const result = calibration({ pd, bad, weights, groups, groupedBy: { kind: 'grades', column: 'grade' }, alpha: 0.05, confidence: 0.95, column: 'pd' });
      const rows = [...result.rows, result.portfolio];
      for (const [i, key] of [...labels, 'portfolio'].entries()) {
        const expected = section.rows[key];
        const row = rows[i];
        expect(row.accounts).toBe(expected.accounts);
        expect(rel(row.meanPd, expected.meanPd)).toBeLessThan(1e-13);
        expect(rel(row.observedBadRate, expected.observedBadRate)).toBeLessThan(1e-13);
        expect(rel(row.effectiveAccounts, expected.effectiveAccounts)).toBeLessThan(1e-12);
        // scipy.stats.beta.cdf / scipy.special.betainc carry their own ~1e-10 (see above).
        expect(rel(row.jeffreysP, expected.jeffreysP)).toBeLessThan(2e-10);
        expect(rel(row.binomialP, expected.binomialP)).toBeLessThan(2e-10);
        expect(rel(row.observedBadRateCi![0], expected.wilson[0])).toBeLessThan(1e-12);
        expect(rel(row.observedBadRateCi![1], expected.wilson[1])).toBeLessThan(1e-12);
      }
      const brier = brierScore(pd, bad, weights, codes, labels.length);
      expect(rel(brier.brier, section.brierSklearn)).toBeLessThan(1e-13);
      expect(rel(brier.reliability, section.reliability)).toBeLessThan(1e-11);
      expect(rel(brier.resolution, section.resolution)).toBeLessThan(1e-11);
      expect(rel(brier.uncertainty, section.uncertainty)).toBeLessThan(1e-13);
      expect(result.brier).toEqual(brier);
    });
  }

  it('matches scipy.stats.binomtest on whole counts', () => {
    const result = calibration({ pd, bad, weights: null, groups, groupedBy: { kind: 'grades', column: 'grade' }, alpha: 0.05, confidence: 0.95, column: 'pd' });
    for (const [i, label] of labels.entries()) expect(rel(result.rows[i].binomialP, values.grades_unweighted.binomtestScipy![label])).toBeLessThan(1e-11);
  });

  it('flags the grade whose PD the generator made too low (C: true rate 1.6 × PD)', () => {
    const result = calibration({ pd, bad, weights: null, groups, groupedBy: { kind: 'grades', column: 'grade' }, alpha: 0.05, confidence: 0.95, column: 'pd' });
    expect(result.rows.filter((row) => row.fails).map((row) => row.label)).toContain('C');
  });
});

describe('population stability index', () => {
  const { reference, actual, actualWeights } = values.psi;
  for (const [name, weights, expected] of [
    ['unweighted', null, values.psi.unweighted],
    ['weighted', Float64Array.from(actualWeights), values.psi.weighted],
  ] as const) {
    it(`matches numpy over the reference's deciles with tied compared scores (${name})`, () => {
      const result = psi({ reference: Float64Array.from(reference), actual: Float64Array.from(actual), actualWeights: weights, higherIs: 'safer', bands: 10, alpha: 0.05 });
      expect(result.bands).toHaveLength(10);
      result.bands.forEach((band, b) => {
        expect(band.referenceShare).toBeCloseTo(0.1, 15);
        expect(rel(band.actualShare, expected.actualShares[b])).toBeLessThan(1e-13);
      });
      expect(rel(result.psi, expected.psi)).toBeLessThan(1e-12);
      expect(rel(result.criticalValue, expected.criticalValue)).toBeLessThan(1e-12);
    });
  }

  it('gives the same index for a "higher = riskier" score as for its negation "higher = safer"', () => {
    const negate = (xs: number[]) => Float64Array.from(xs, (x) => -x);
    const result = psi({ reference: negate(reference), actual: negate(actual), actualWeights: null, higherIs: 'riskier', bands: 10, alpha: 0.05 });
    expect(rel(result.psi, values.psi.unweighted.psi)).toBeLessThan(1e-12);
  });

  it.each(Object.entries(values.psiNull))("Yurdakul & Naranjo's critical value is the simulated null quantile (%s)", (_key, sim) => {
    // 20,000 simulated PSIs of two samples from one distribution (numpy); the formula is written
    // from memory (psi-critical-value.ts). Measured: within 0.5% at 95% and 99%; allowed 2% (the
    // simulation's own error at 20,000 replicates is about 1%).
    expect(rel(psiCriticalValue(sim.bands, sim.M, sim.N, 0.05), sim.simulatedQuantile95)).toBeLessThan(0.02);
    expect(rel(psiCriticalValue(sim.bands, sim.M, sim.N, 0.01), sim.simulatedQuantile99)).toBeLessThan(0.02);
  });
});
