import type { Calibration, ModelCalibration, Stability } from '@shared/calibration';
import type { AdoptionPolicy } from '@shared/policy';
import type { AnalysisSettings } from '@shared/report';
import { calibration, type CalibrationGroups } from './calibration';
import { levelOrder, type Holdout, type ModelName } from './holdout';
import type { PreparedHoldout } from './policy-data';
import { psi } from './psi';
import { stabilityByPeriod } from './stability';
import { StatisticError } from './statistic-error';

/**
 * The report's calibration and stability sections (shared/calibration.ts), from the holdout, the
 * data prepared for the band tables (policy-data.ts: each model's bands), the settings, the
 * adoption policy (the calibration α, the period rule's minimum bads) and the reference sample.
 *
 * - Calibration for each model the mapping marks as a probability of default: by its grade column
 *   when one is mapped (grades in descending mean PD), else by its quantile bands (calibration.ts).
 * - Stability by period when a period column is mapped (stability.ts), and the PSI of each model's
 *   score against the reference sample (psi.ts): a reference file's scores, or the accounts of the
 *   settings' reference period against the other periods.
 * Weights: `weights` is the per-account sampling weight or null; calibration and PSI take it.
 * Cost: O(n log n) (periods sorted one by one) plus O(M log M) for the reference.
 */

export interface ReferenceSample {
  fileName: string;
  sha256: string;
  champion: Float64Array;
  challenger: Float64Array;
}

export interface CalibrationStabilityInput {
  holdout: Holdout;
  data: PreparedHoldout;
  settings: AnalysisSettings;
  policy: AdoptionPolicy;
  pd: { champion: boolean; challenger: boolean };
  columns: { champion: string; challenger: string };
  weights: Float64Array | null;
  overallDeltaGini: number;
  reference: ReferenceSample | null;
}

function groupsFor(input: CalibrationStabilityInput, name: ModelName): { groups: CalibrationGroups; groupedBy: ModelCalibration['groupedBy'] } {
  const grade = input.holdout.grades?.[name] ?? null;
  if (grade !== null) {
    // Grades in descending mean PD (riskiest first, as bands are), ties by the values' order.
    const sum = new Float64Array(grade.levels.length);
    const size = new Float64Array(grade.levels.length);
    const scores = input.holdout[name];
    for (let i = 0; i < scores.length; i++) {
      sum[grade.codes[i]] += scores[i];
      size[grade.codes[i]]++;
    }
    const byValue = levelOrder(grade.levels);
    const rank = new Map(byValue.map((level, at) => [level, at]));
    const order = [...byValue].sort((x, y) => sum[y] / (size[y] || 1) - sum[x] / (size[x] || 1) || rank.get(x)! - rank.get(y)!);
    return { groups: { codes: grade.codes, labels: grade.levels, bandNumbers: null, order }, groupedBy: { kind: 'grades', column: grade.column } };
  }
  const model = input.data[name];
  const count = model.bandEnds.length;
  const labels = Array.from({ length: count }, (_, b) => `Band ${b + 1}`);
  return {
    groups: { codes: model.band, labels, bandNumbers: labels.map((_, b) => b + 1), order: labels.map((_, b) => b) },
    groupedBy: { kind: 'bands' },
  };
}

export function calibrationSection(input: CalibrationStabilityInput): Calibration {
  const alpha = input.policy.calibrationRule.alpha;
  const model = (name: ModelName): ModelCalibration | null => {
    if (!input.pd[name]) return null;
    if (input.holdout.higherIs[name] !== 'riskier') {
      throw new StatisticError(`the ${name}'s score is marked as a probability of default but its orientation is higher = safer`, 'pd_orientation');
    }
    const { groups, groupedBy } = groupsFor(input, name);
    return calibration({
      pd: input.holdout[name],
      bad: input.holdout.bad,
      weights: input.weights,
      groups,
      groupedBy,
      alpha,
      confidence: input.settings.confidence,
      column: input.columns[name],
    });
  };
  return {
    alpha,
    confidence: input.settings.confidence,
    weighted: input.weights !== null,
    champion: model('champion'),
    challenger: model('challenger'),
  };
}

function select(values: Float64Array, keep: (i: number) => boolean): Float64Array {
  let count = 0;
  for (let i = 0; i < values.length; i++) if (keep(i)) count++;
  const out = new Float64Array(count);
  let at = 0;
  for (let i = 0; i < values.length; i++) if (keep(i)) out[at++] = values[i];
  return out;
}

export function stabilitySection(input: CalibrationStabilityInput): Stability {
  const { holdout, settings } = input;
  const period = holdout.period ?? null;
  const minBads = input.policy.periodSignRule.minBads;
  const alpha = 1 - settings.confidence;
  const periods =
    period === null
      ? []
      : stabilityByPeriod({
          bad: holdout.bad,
          champion: holdout.champion,
          challenger: holdout.challenger,
          higherIs: holdout.higherIs,
          weights: input.weights,
          period,
          overallDeltaGini: input.overallDeltaGini,
          minBads,
          confidence: settings.confidence,
          bands: settings.bands,
          alpha,
        });

  let psiSection: Stability['psi'] = null;
  const both = (reference: { champion: Float64Array; challenger: Float64Array }, actual: { champion: Float64Array; challenger: Float64Array }, weights: Float64Array | null) => ({
    champion: psi({ reference: reference.champion, actual: actual.champion, actualWeights: weights, higherIs: holdout.higherIs.champion, bands: settings.bands, alpha }),
    challenger: psi({ reference: reference.challenger, actual: actual.challenger, actualWeights: weights, higherIs: holdout.higherIs.challenger, bands: settings.bands, alpha }),
  });
  if (input.reference !== null) {
    psiSection = {
      reference: { kind: 'file', fileName: input.reference.fileName, sha256: input.reference.sha256, rows: input.reference.champion.length },
      actual: 'the holdout',
      ...both(input.reference, holdout, input.weights),
    };
  } else if (settings.referencePeriod !== null) {
    if (period === null) throw new StatisticError(`a reference period (${settings.referencePeriod}) needs a period column in the mapping`, 'reference_period');
    const level = period.levels.indexOf(settings.referencePeriod);
    if (level === -1) {
      throw new StatisticError(`column ${period.column} has no value ${JSON.stringify(settings.referencePeriod)} to use as the reference period`, 'reference_period');
    }
    const inReference = (i: number) => period.codes[i] === level;
    const rest = (i: number) => period.codes[i] !== level;
    const reference = { champion: select(holdout.champion, inReference), challenger: select(holdout.challenger, inReference) };
    const actual = { champion: select(holdout.champion, rest), challenger: select(holdout.challenger, rest) };
    if (actual.champion.length === 0) throw new StatisticError('the reference period holds every account: there is nothing to compare it with', 'reference_period');
    psiSection = {
      reference: { kind: 'period', period: settings.referencePeriod, rows: reference.champion.length },
      actual: 'the other periods',
      ...both(reference, actual, input.weights === null ? null : select(input.weights, rest)),
    };
  }
  return {
    periodColumn: period === null ? null : period.column,
    minBads,
    periods,
    signChanges: periods.filter((row) => row.signChanged).map((row) => row.period),
    psi: psiSection,
  };
}
