import { comparisonStateLabels, type ComparisonState } from '../comparisons';
import { formatPercent } from '../format';
import { type AdoptionPolicy } from '../policy';
import { type Report } from '../report';

/**
 * The governance record in words, as the committee pack (server/pack/sections.ts) and the printable
 * report (src/app/routes/comparisons/report.tsx) both print it: the verdict's heading and criteria,
 * the policy in one sentence, what is said when nothing is decided yet, and the notes under the
 * verdict records and the audit trail. One wording; each lays it out in its own medium.
 */

/** "Verdict under adoption policy version 3" */
export function verdictHeading(verdict: Pick<Report['verdict'], 'policyVersion'>): string {
  return `Verdict under adoption policy version ${verdict.policyVersion}`;
}

/** The adoption criteria: each one met or not, and why. */
export function criteriaTable(verdict: Pick<Report['verdict'], 'criteria'>): { head: string[]; numeric: number[]; rows: string[][] } {
  return {
    head: ['Criterion', 'Result', 'Why'],
    numeric: [],
    rows: verdict.criteria.map((criterion) => [criterion.label, criterion.met ? 'Met' : 'Not met', criterion.detail]),
  };
}

/**
 * The policy a report was judged under, in one sentence: "Policy version 3: α = 0.05 (one-sided),
 * materiality 2 Gini points, interval above zero required, swap rule at a 70.0% approval rate (",
 * and at the worst case" when the policy asks it), at least 300 bads, quorum 2."
 */
export function policyInOneSentence(policy: AdoptionPolicy): string {
  const swapRule = policy.swapRule.enabled
    ? `at a ${formatPercent(policy.swapRule.approvalRate, 1)} approval rate${policy.swapRule.worstCase ? ' and at the worst case' : ''}`
    : 'off';
  return (
    `Policy version ${policy.version}: α = ${policy.alpha} (${policy.sided}), materiality ${policy.materialityGiniPoints} Gini points, ` +
    `interval above zero ${policy.requireIntervalAboveZero ? 'required' : 'not required'}, swap rule ${swapRule}, ` +
    `at least ${policy.minBads} bads, quorum ${policy.quorum || 'none'}.`
  );
}

/** Said on the first page while no committee decision is recorded. */
export function noDecisionSentence(state: ComparisonState): string {
  return `No committee decision is recorded yet: this comparison is ${comparisonStateLabels[state].toLowerCase()}.`;
}

/** Said under "Decision" while there is none. */
export const notDecidedSentence = 'Not decided yet.';

/** The note over the verdict records. */
export const verdictRecordsNote = 'Every verdict given, newest first, each under the policy version it used; a stored verdict never changes.';

/** The last words of the governance part. */
export const committeeDecidesNote = 'The verdict advises and the committee decides; the cautions on the first page apply to every decision recorded here.';

/** Under the audit trail: its hashes are shortened in print. */
export const shortenedHashesNote = 'Hashes are shortened here; the evidence pack holds them in full, with every event’s details.';
