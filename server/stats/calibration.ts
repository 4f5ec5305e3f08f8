import type { CalibrationRow, ModelCalibration } from '@shared/calibration';
import { binomialTestUpper } from './binomial-test';
import { brierScore } from './brier';
import { jeffreysTest } from './jeffreys';
import { StatisticError } from './statistic-error';
import { wilsonEffective } from './wilson-effective';

/**
 * Calibration of one model whose score is a probability of default, per group (the model's
 * quantile bands, or the grades of a mapped column) and for the whole portfolio: accounts, mean
 * PD, observed bad rate with its Wilson interval (wilson.ts), expected (Σ PD) against observed
 * bads, the Jeffreys test (jeffreys.ts, ECB 2019) and the exact binomial test (binomial-test.ts)
 * of H0 "the PD is not underestimated", and the Brier score with Murphy's decomposition over the
 * same groups (brier.ts). A group fails when its Jeffreys p is below α.
 *
 * Weights (sampling weights, one per account, or null): the mean PD and the bad rate are
 * weighted; the tests and the interval use Kish's effective counts, N_eff = (Σw)² / Σw² and
 * D_eff = (weighted bad rate) · N_eff, so that weights that sum to a population total do not
 * pretend to more evidence than the accounts observed (L. Kish 1965, "Survey Sampling", Wiley).
 * Without weights N_eff = N and D_eff = D exactly.
 * Cost: O(n) plus O(√N) per group for the tests.
 */

export interface CalibrationGroups {
  /** Group of each account, 0-based. */
  codes: ArrayLike<number>;
  /** One label per group, e.g. "Band 3" or a grade's value. */
  labels: readonly string[];
  /** Band number per group (1 = riskiest), or null for grades. */
  bandNumbers: readonly number[] | null;
  /** The order in which groups are reported (indexes into labels). */
  order: readonly number[];
}

export interface CalibrationInput {
  pd: Float64Array;
  bad: Uint8Array;
  weights: Float64Array | null;
  groups: CalibrationGroups;
  groupedBy: ModelCalibration['groupedBy'];
  alpha: number;
  confidence: number;
  /** The score column's name, for messages. */
  column: string;
}

interface Sums {
  accounts: number;
  bads: number;
  weight: number;
  weightSquares: number;
  pd: number;
  badWeight: number;
  pdMin: number;
  pdMax: number;
}

const emptySums = (): Sums => ({ accounts: 0, bads: 0, weight: 0, weightSquares: 0, pd: 0, badWeight: 0, pdMin: Infinity, pdMax: -Infinity });

function row(label: string, band: number | null, s: Sums, weighted: boolean, alpha: number, confidence: number): CalibrationRow {
  const meanPd = s.pd / s.weight;
  const rate = s.badWeight / s.weight;
  const effective = weighted ? (s.weight * s.weight) / s.weightSquares : s.accounts;
  // Effective defaults, clamped against rounding so that 0 ≤ D ≤ N holds exactly.
  const defaults = weighted ? Math.min(effective, Math.max(0, rate * effective)) : s.bads;
  const jeffreysP = jeffreysTest(Math.min(1, Math.max(0, meanPd)), defaults, effective);
  return {
    label,
    band,
    accounts: s.accounts,
    bads: s.bads,
    weight: weighted ? s.weight : null,
    effectiveAccounts: effective,
    meanPd,
    pdMin: s.pdMin,
    pdMax: s.pdMax,
    observedBadRate: rate,
    observedBadRateCi: wilsonEffective(s.badWeight, s.weight, s.weightSquares, confidence),
    expectedBads: s.pd,
    observedBads: s.badWeight,
    jeffreysP,
    binomialP: binomialTestUpper(Math.min(1, Math.max(0, meanPd)), defaults, effective),
    fails: jeffreysP < alpha,
  };
}

export function calibration(input: CalibrationInput): ModelCalibration {
  const { pd, bad, weights, groups, alpha, confidence } = input;
  const n = pd.length;
  if (n === 0) throw new StatisticError('calibration requires at least one account');
  if (bad.length !== n || groups.codes.length !== n || (weights !== null && weights.length !== n)) {
    throw new StatisticError('calibration requires one PD, outcome, group (and weight) per account');
  }
  const count = groups.labels.length;
  const sums = Array.from({ length: count }, emptySums);
  const all = emptySums();
  for (let i = 0; i < n; i++) {
    const p = pd[i];
    if (!(p >= 0 && p <= 1)) {
      throw new StatisticError(`column ${input.column}: account ${i + 1} has ${p}, which is not a probability of default (0 to 1)`, 'not_a_probability');
    }
    const w = weights === null ? 1 : weights[i];
    if (!(w >= 0 && Number.isFinite(w))) throw new StatisticError(`weight of account ${i + 1} is ${w}; weights must be finite and not negative`, 'bad_weight');
    for (const s of [sums[groups.codes[i]], all]) {
      s.accounts++;
      s.bads += bad[i];
      s.weight += w;
      s.weightSquares += w * w;
      s.pd += w * p;
      s.badWeight += w * bad[i];
      if (p < s.pdMin) s.pdMin = p;
      if (p > s.pdMax) s.pdMax = p;
    }
  }
  if (!(all.weight > 0)) throw new StatisticError('calibration requires weights that sum to more than 0', 'bad_weight');
  const weighted = weights !== null;
  const rows: CalibrationRow[] = [];
  for (const g of groups.order) {
    if (sums[g].accounts === 0 || !(sums[g].weight > 0)) continue;
    rows.push(row(groups.labels[g], groups.bandNumbers === null ? null : groups.bandNumbers[g], sums[g], weighted, alpha, confidence));
  }
  return {
    groupedBy: input.groupedBy,
    rows,
    portfolio: row('Portfolio', null, all, weighted, alpha, confidence),
    brier: brierScore(pd, bad, weights, groups.codes, count),
    failing: rows.filter((r) => r.fails).length,
  };
}
