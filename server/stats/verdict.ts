import { formatCount, formatFixed, formatPInWords, formatPercent, formatShare } from '@shared/format';
import type { AdoptionPolicy } from '@shared/policy';
import { type Criterion, inferenceOf, type Report, type SegmentRow, type SwapSets, type Verdict } from '@shared/report';
import { normalCdf } from './normal';
import { stabilityCriteria } from './verdict-stability';
import { segmentFlags, tooFewBads } from './segment-flags';
import { inferenceWords } from '@shared/population-words';
import { swapCriterionWithUnknowns } from './verdict-swap-unknown';

/**
 * The verdict: an adoption policy (shared/policy.ts) applied to a report's evidence. Each criterion
 * the policy enables is shown met or not met with its numbers; the outcome is
 *   champion-better  the report has at least the policy's minimum bads, a DeLong test exists, and
 *                    the challenger is significantly worse at the policy's α (one-sided: the
 *                    opposite one-sided test, p = Φ(z); two-sided: p < α with ΔGini < 0), or the
 *                    ΔGini interval lies entirely below 0;
 *   supported        otherwise, when every criterion is met;
 *   not-proven       otherwise.
 * With fewer than 2 goods or 2 bads there is no DeLong test or interval (delong.ts): the
 * significance and interval criteria are not met and say why, so the outcome is not-proven.
 * The segment criterion (on unless the policy version predates it) fails when a segment value with
 * enough bads is significantly worse (segment-flags.ts), and names those values here and in the
 * summary. Defaults and thresholds: docs/design.md "Verdict" (materiality and minimum bads are common
 * practice, no source). The criteria use the report's ΔGini interval at the report's confidence.
 *
 * A pure function of the report, the policy, and the swap sets at the policy's approval rate
 * (which can differ from the report's): a stored report can be re-judged under a new policy
 * version. When `swapAtPolicyRate` is not given, the report's own swap sets are used if they were
 * matched to the policy's approval rate; otherwise the swap criterion is not met and says so.
 * The summary says where its approval rate comes from ("at the policy's 70% approval rate") and,
 * when the run's own swap sets use another rate or cut-offs, says that too.
 * Cost: O(segment rows).
 */

export type VerdictEvidence = Pick<Report, 'bads' | 'settings' | 'difference' | 'swap'> & Partial<Pick<Report, 'calibration' | 'stability'>> & { segments?: Report['segments'] };

/**
 * Several challengers: the challenger is one of `challengers` tested against the champion, and the
 * significance criterion (and the summary's p) use its Holm-adjusted p across them (holm.ts),
 * stated as such. With one challenger the plain p is used and nothing is said (the same words).
 */
export interface Multiplicity {
  challengers: number;
  pOneSided: number | null;
  pTwoSided: number | null;
}

export function verdict(report: VerdictEvidence, policy: AdoptionPolicy, swapAtPolicyRate?: SwapSets | null, multiplicity?: Multiplicity): Verdict {
  const adjusted = multiplicity !== undefined && multiplicity.challengers >= 2 ? multiplicity : null;
  const difference = adjusted === null ? report.difference : { ...report.difference, pOneSided: adjusted.pOneSided, pTwoSided: adjusted.pTwoSided };
  // "one-sided p = 0.003" becomes "Holm-adjusted one-sided p = 0.003 … across 3 challengers".
  const holmed = (sided: string) => (adjusted === null ? sided : `Holm-adjusted ${sided}`);
  const across = adjusted === null ? '' : ` across ${adjusted.challengers} challengers`;
  const alpha = policy.alpha;
  const level = `${percent(report.settings.confidence)} interval`;
  const giniPoints = difference.gini * 100;
  const ci = difference.giniCi;
  const criteria: Criterion[] = [];
  const noTest = difference.inference ?? (difference.pOneSided === null || difference.pTwoSided === null || ci === null ? 'no DeLong test for this report' : null);

  if (noTest !== null) {
    criteria.push({ id: 'significance', label: 'Significant uplift', met: false, detail: `no DeLong test: ${noTest}` });
  } else if (policy.sided === 'one-sided') {
    const p = difference.pOneSided!;
    criteria.push({
      id: 'significance',
      label: 'Significant uplift',
      met: p < alpha,
      detail:
        p < alpha
          ? `${holmed('one-sided')} ${pText(p)} < α = ${alpha} (DeLong test that the challenger's Gini is higher${across})`
          : `${holmed('one-sided')} ${pText(p)} is not below α = ${alpha} (DeLong test that the challenger's Gini is higher${across})`,
    });
  } else {
    const p = difference.pTwoSided!;
    const higher = difference.gini > 0;
    criteria.push({
      id: 'significance',
      label: 'Significant uplift',
      met: p < alpha && higher,
      detail:
        p < alpha
          ? `${holmed('two-sided')} ${pText(p)} < α = ${alpha} (DeLong test${across})${higher ? " and the challenger's Gini is higher" : ", but the challenger's Gini is not higher"}`
          : `${holmed('two-sided')} ${pText(p)} is not below α = ${alpha} (DeLong test${across})`,
    });
  }

  const required = policy.materialityGiniPoints;
  const material = giniPoints >= required - 1e-9;
  const digits = Math.abs(giniPoints - required) < 0.05 ? 2 : 1;
  criteria.push({
    id: 'materiality',
    label: 'Material uplift',
    met: material,
    detail: `ΔGini = ${signedPoints(giniPoints, digits)} points, ${material ? 'at least' : 'below'} the ${formatFixed(required, digits)} points required`,
  });

  if (policy.requireIntervalAboveZero) {
    if (ci === null) {
      criteria.push({ id: 'interval', label: 'Interval above zero', met: false, detail: `no interval of ΔGini: ${noTest}` });
    } else {
      const above = ci[0] > 0;
      criteria.push({
        id: 'interval',
        label: 'Interval above zero',
        met: above,
        detail: `the ${level} of ΔGini is ${signedPoints(ci[0] * 100)} to ${signedPoints(ci[1] * 100)} points: ${
          above ? 'its lower bound is above 0' : ci[1] < 0 ? 'it lies entirely below 0' : 'it includes 0'
        }`,
      });
    }
  }

  const swap = policy.swapRule.enabled ? swapAt(report, policy, swapAtPolicyRate) : null;
  if (policy.swapRule.enabled) {
    // Swap sets with applicants without an outcome: judged under the reject inference, and named so.
    const unknowns = swap !== null && [swap.bothAccept, swap.swapIn, swap.swapOut, swap.bothReject].some((cell) => (cell.unknown ?? 0) > 0);
    criteria.push(unknowns ? swapCriterionWithUnknowns(swap, policy, report.settings) : swapCriterion(swap, policy.swapRule.approvalRate));
  }

  const enoughBads = report.bads >= policy.minBads;
  criteria.push({
    id: 'minimum-bads',
    label: 'Enough bads',
    met: enoughBads,
    detail: enoughBads
      ? `${count(report.bads)} bads in the holdout, at least the ${count(policy.minBads)} required`
      : `only ${count(report.bads)} bads in the holdout; the policy requires at least ${count(policy.minBads)}`,
  });
  criteria.push(...stabilityCriteria(report, policy));

  const worseSegments = policy.segmentRule.enabled ? segmentsWorse(report.segments ?? [], policy) : null;
  if (policy.segmentRule.enabled) criteria.push(segmentCriterion(report.segments ?? [], worseSegments!, policy));

  const significantlyWorse =
    noTest === null &&
    (policy.sided === 'one-sided' ? normalCdf(difference.z!) < alpha : difference.pTwoSided! < alpha && difference.gini < 0);
  const championBetter = enoughBads && noTest === null && (significantlyWorse || ci![1] < 0);
  const outcome = championBetter ? 'champion-better' : criteria.every((c) => c.met) ? 'supported' : 'not-proven';

  const direction =
    Math.abs(giniPoints) < 0.05
      ? "The challenger's Gini is the same as the champion's to one decimal"
      : `The challenger's Gini is ${unsignedPoints(giniPoints)} points ${giniPoints > 0 ? 'higher' : 'lower'}`;
  const p = policy.sided === 'one-sided' ? difference.pOneSided : difference.pTwoSided;
  let summary =
    noTest !== null || ci === null || p === null
      ? `${direction} (no interval or test: ${noTest})`
      : `${direction} (${level} ${signedPoints(ci[0] * 100)} to ${signedPoints(ci[1] * 100)}, ${holmed(policy.sided)} ${pText(p)}${across})`;
  const clauses: string[] = [];
  if (swap) clauses.push(swapSummary(swap, policy.swapRule.approvalRate, inferenceOf(report.settings)) + runRateNote(report, policy.swapRule.approvalRate));
  if (worseSegments && worseSegments.length > 0) clauses.push(`it is significantly worse in ${worseSegments.map(segmentText).join(', ')}`);
  summary += clauses.length > 0 ? `; ${clauses.join('; ')}.` : '.';

  return { outcome, policyVersion: policy.version, criteria, summary };
}

/** The segment values the policy's rule catches: significantly worse, with enough bads. */
function segmentsWorse(rows: readonly SegmentRow[], policy: AdoptionPolicy): SegmentRow[] {
  return rows.filter((row) => row.pTwoSided !== null && segmentFlags(row, policy).includes('significantly-worse'));
}

function segmentText(row: SegmentRow): string {
  return `${row.column} = ${row.value} (ΔGini ${signedPoints((row.deltaGini ?? 0) * 100)} points, Holm-adjusted ${pText(row.pHolm ?? 1)})`;
}

function segmentCriterion(rows: readonly SegmentRow[], worse: SegmentRow[], policy: AdoptionPolicy): Criterion {
  const base = { id: 'segments' as const, label: 'No segment value significantly worse' };
  if (rows.length === 0) return { ...base, met: true, detail: 'no segment columns are mapped, so there is nothing to check' };
  if (rows.some((row) => row.deltaGini !== null && row.pTwoSided === null && row.note === null)) {
    return {
      ...base,
      met: false,
      detail: 'this report predates two-sided segment tests (engine before 1.2); run the analysis again to check the segments',
    };
  }
  const few = rows.filter((row) => tooFewBads(row, policy)).length;
  const leftOut = few > 0 ? `; ${count(few)} ${few === 1 ? 'value' : 'values'} with fewer than ${count(policy.segmentRule.minBads)} bads left out` : '';
  const test = `Holm-adjusted two-sided DeLong test, α = ${policy.alpha}`;
  if (worse.length === 0) {
    return { ...base, met: true, detail: `no segment value is significantly worse (${test})${leftOut}` };
  }
  return { ...base, met: false, detail: `significantly worse in ${worse.map(segmentText).join(', ')} (${test})${leftOut}` };
}

/** ", while the run's own swap sets are at 55%" when the report was set up with another rate or cut-offs. */
function runRateNote(report: VerdictEvidence, policyRate: number): string {
  const own = report.swap;
  if (own.basis === 'approval-rate' && own.requestedApprovalRate !== null && Math.abs(own.requestedApprovalRate - policyRate) < 1e-12) return '';
  if (own.basis === 'approval-rate' && own.requestedApprovalRate !== null) {
    return ` (the run's own swap sets are at ${percent(own.requestedApprovalRate)})`;
  }
  return " (the run's own swap sets use the cut-offs it was set up with)";
}

function swapAt(report: VerdictEvidence, policy: AdoptionPolicy, given: SwapSets | null | undefined): SwapSets | null {
  const rate = policy.swapRule.approvalRate;
  const matches = (s: SwapSets) =>
    s.basis === 'approval-rate' && s.requestedApprovalRate !== null && Math.abs(s.requestedApprovalRate - rate) < 1e-12;
  if (given) {
    if (!matches(given)) throw new Error(`verdict needs swap sets matched to the policy's ${percent(rate)} approval rate`);
    return given;
  }
  return matches(report.swap) ? report.swap : null;
}

function swapCriterion(swap: SwapSets | null, rate: number): Criterion {
  const base = { id: 'swap-bad-rate' as const, label: 'Swap-in bad rate not above swap-out' };
  const at = `at the policy's ${percent(rate)} approval rate`;
  if (!swap) {
    return { ...base, met: false, detail: `swap sets ${at} were not computed for this report, so the rule cannot be checked` };
  }
  const { swapOut, test } = swap;
  const swapIn = swap.swapIn;
  if (swapIn.count === 0 && swapOut.count === 0) {
    return { ...base, met: true, detail: `${at} both models accept the same accounts: there is no swap-in and no swap-out` };
  }
  if (swapIn.count === 0) {
    return { ...base, met: true, detail: `${at} there is no swap-in; the swap-out is ${group(accountsOf(swapOut), swapOut.badRate)}` };
  }
  if (swapOut.count === 0) {
    return {
      ...base,
      met: false,
      detail: `${at} there is no swap-out to compare the swap-in (${group(accountsOf(swapIn), swapIn.badRate)}) with`,
    };
  }
  // swapIn.bads / swapIn.count ≤ swapOut.bads / swapOut.count, compared exactly in integers
  // (in accounts with weights: summed weights, every outcome known here).
  const met = swapIn.bads * (swapOut.accounts ?? swapOut.count) <= swapOut.bads * (swapIn.accounts ?? swapIn.count);
  const testText =
    test.p === null ? '' : ` (two-sided ${pText(test.p)}, ${test.method === 'fisher-exact' ? "Fisher's exact test" : 'two-proportion z test'})`;
  return {
    ...base,
    met,
    detail: `${at} the swap-in is ${group(accountsOf(swapIn), swapIn.badRate)} and the swap-out ${group(accountsOf(swapOut), swapOut.badRate)}: the swap-in bad rate is ${
      met ? 'not above' : 'above'
    } the swap-out's${testText}`,
  };
}

function swapSummary(swap: SwapSets, rate: number, inference: ReturnType<typeof inferenceOf>): string {
  const at = `at the policy's ${percent(rate)} approval rate`;
  const { swapIn, swapOut } = swap;
  if (swapIn.count === 0 && swapOut.count === 0) return `${at} both models accept the same accounts`;
  // Weighted holdouts: applicants (rounded), the bad rate of those with an outcome.
  const inAccounts = Math.round(swapIn.accounts ?? swapIn.count);
  const outAccounts = Math.round(swapOut.accounts ?? swapOut.count);
  const unknowns = (swapIn.unknown ?? 0) + (swapOut.unknown ?? 0) > 0;
  // Applicants without an outcome: the rates the swap rule judged, named (inferred, or known only).
  const inferred = unknowns && inference.method !== 'known-only';
  const stated = (cell: SwapSets['swapIn']) =>
    inferred ? `an inferred ${rateText(cell.inferred?.badRate ?? null)} bad rate` : cell.badRate === null ? 'no known bad rate' : `a ${rateText(cell.badRate)}${unknowns ? ' known' : ''} bad rate`;
  const inText = swapIn.count === 0 ? 'no accounts' : `${accounts(inAccounts)} with ${stated(swapIn)}`;
  const outText = swapOut.count === 0 ? 'none' : `${count(outAccounts)} with ${stated(swapOut)}`;
  return `${at} it swaps in ${inText} for ${outText}${inferred ? ` (${inferenceWords(inference)})` : ''}`;
}

/** A swap cell's accounts: summed weights (rounded) with weights, else its rows. */
function accountsOf(cell: SwapSets['swapIn']): number {
  return Math.round(cell.accounts ?? cell.count);
}

function group(n: number, badRate: number | null): string {
  return `${accounts(n)} with a ${rateText(badRate)} bad rate`;
}

function accounts(n: number): string {
  return `${count(n)} ${n === 1 ? 'account' : 'accounts'}`;
}

const count = (n: number) => formatCount(n);

function rateText(rate: number | null): string {
  return rate === null ? 'undefined' : formatPercent(rate);
}

/** 0.7 → "70%", 0.725 → "72.5%". */
const percent = (fraction: number) => formatShare(fraction);

/** Gini points with a real minus sign, no "+": 4.1, −3.0, 0.0. */
const signedPoints = (points: number, digits = 1) => formatFixed(points, digits);

function unsignedPoints(points: number): string {
  return signedPoints(Math.abs(points));
}

/** "p = 0.012", "p = 3.0 × 10⁻⁴", "p < 1 × 10⁻³⁰⁰": shared/format.ts's rule for p-values in sentences. */
const pText = (p: number) => formatPInWords(p);
