import type { Calibration, Stability } from '@shared/calibration';
import { formatCount, formatDecimal, formatFixed, formatGiniDelta, formatPercent, formatPInWords } from '@shared/format';
import type { AdoptionPolicy } from '@shared/policy';
import type { Criterion } from '@shared/report';

/**
 * The adoption policy's calibration and stability criteria (each off by default), for verdict.ts:
 * - calibration: the challenger's portfolio Jeffreys p above α, when its score is a probability
 *   of default (a challenger in points is outside the rule, which then says so and is met);
 * - psi: the PSI of the challenger's score against the reference sample below the threshold (not
 *   met without a reference sample: there is nothing to judge);
 * - period-sign: the uplift has the whole holdout's sign in every period with at least N bads (not
 *   met without a period column, or when no period has N bads). Read from the period rows, so a
 *   stored report can be re-judged under another N.
 * Reports stored before these sections existed have neither: the enabled criteria are then not met
 * and say that the report predates them. Cost: O(periods).
 */

export interface StabilityEvidence {
  calibration?: Calibration;
  stability?: Stability;
  difference: { gini: number };
}

export function stabilityCriteria(report: StabilityEvidence, policy: AdoptionPolicy): Criterion[] {
  const criteria: Criterion[] = [];
  const predates = 'this report was made before the engine computed it (run the analysis again)';
  if (policy.calibrationRule.enabled) {
    const base = { id: 'calibration' as const, label: "Challenger's PDs not underestimated" };
    const alpha = policy.calibrationRule.alpha;
    const model = report.calibration?.challenger ?? null;
    if (!report.calibration) criteria.push({ ...base, met: false, detail: `calibration: ${predates}` });
    else if (model === null) criteria.push({ ...base, met: true, detail: "does not apply: the challenger's score is not marked as a probability of default" });
    else {
      const { portfolio } = model;
      const met = portfolio.jeffreysP > alpha;
      criteria.push({
        ...base,
        met,
        detail: `portfolio Jeffreys ${formatPInWords(portfolio.jeffreysP)} ${met ? '>' : '≤'} α = ${alpha}: mean PD ${formatPercent(portfolio.meanPd, 2)} against an observed bad rate of ${formatPercent(
          portfolio.observedBadRate,
          2,
        )} (${formatCount(portfolio.expectedBads)} bads expected, ${formatCount(portfolio.observedBads)} observed)${
          model.failing > 0 ? `; ${model.failing} ${model.groupedBy.kind === 'grades' ? 'grade' : 'band'}${model.failing === 1 ? '' : 's'} below α on their own` : ''
        }`,
      });
    }
  }
  if (policy.psiRule.enabled) {
    const base = { id: 'psi' as const, label: "Challenger's score population stable" };
    const threshold = policy.psiRule.threshold;
    const section = report.stability?.psi ?? null;
    if (!report.stability) criteria.push({ ...base, met: false, detail: `stability: ${predates}` });
    else if (section === null) criteria.push({ ...base, met: false, detail: 'no reference sample was given (a development sample, or one period of the holdout), so the PSI cannot be checked' });
    else {
      const value = section.challenger.psi;
      const met = value < threshold;
      const against = section.reference.kind === 'file' ? `the reference sample ${section.reference.fileName}` : `period ${section.reference.period}`;
      criteria.push({
        ...base,
        met,
        detail: `PSI = ${formatFixed(value, 3)} against ${against}, ${met ? 'below' : 'not below'} the ${threshold} threshold (critical value ${formatFixed(section.challenger.criticalValue, 4)} at α = ${formatDecimal(section.challenger.criticalAlpha, 3)})`,
      });
    }
  }
  if (policy.periodSignRule.enabled) {
    const base = { id: 'period-sign' as const, label: 'Uplift keeps its sign over time' };
    const minBads = policy.periodSignRule.minBads;
    const stability = report.stability;
    if (!stability) criteria.push({ ...base, met: false, detail: `stability: ${predates}` });
    else if (stability.periodColumn === null) criteria.push({ ...base, met: false, detail: 'no period column is mapped, so the uplift cannot be followed over time' });
    else {
      const sign = Math.sign(report.difference.gini);
      const counted = stability.periods.filter((row) => row.bads >= minBads && row.deltaGini !== null);
      const changed = counted.filter((row) => sign !== 0 && Math.sign(row.deltaGini!) !== 0 && Math.sign(row.deltaGini!) !== sign);
      if (counted.length === 0) {
        criteria.push({ ...base, met: false, detail: `no period of ${stability.periodColumn} has ${minBads} bads, so the uplift cannot be followed over time` });
      } else if (changed.length === 0) {
        criteria.push({ ...base, met: true, detail: `ΔGini has the overall sign in ${counted.length === 1 ? 'the one period' : `all ${counted.length} periods`} with at least ${minBads} bads` });
      } else {
        criteria.push({
          ...base,
          met: false,
          detail: `ΔGini changes sign in ${changed.length} of ${counted.length} periods with at least ${minBads} bads: ${changed
            .map((row) => `${row.period} (${formatGiniDelta(row.deltaGini)} points)`)
            .join(', ')}`,
        });
      }
    }
  }
  return criteria;
}
