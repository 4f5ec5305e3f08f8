import { type AdoptionPolicy } from '@shared/policy';
import { formatCount, formatShare } from '@/lib/format';

/** Each rule of the adoption policy in words, for the summary and the version history. */
export function policyRules(policy: Omit<AdoptionPolicy, 'version'>): { label: string; value: string }[] {
  const percent = (fraction: number) => formatShare(fraction);
  return [
    { label: 'Significance', value: `${policy.sided === 'one-sided' ? 'One-sided' : 'Two-sided'} DeLong test of ΔGini at α = ${policy.alpha}` },
    { label: 'Materiality', value: `ΔGini of at least ${policy.materialityGiniPoints} Gini points` },
    { label: 'Interval', value: policy.requireIntervalAboveZero ? 'The lower bound of the ΔGini interval must be above 0' : 'Not required' },
    {
      label: 'Swap sets',
      value: policy.swapRule.enabled
        ? `Swap-in bad rate not above the swap-out bad rate at a ${percent(policy.swapRule.approvalRate)} approval rate${
            policy.swapRule.worstCase ? ', also at the worst case (every applicant without an outcome bad in the swap-in, good in the swap-out)' : ''
          }`
        : 'Not checked',
    },
    { label: 'Minimum bads', value: `At least ${formatCount(policy.minBads)} bads in the holdout` },
    // Calibration and stability criteria.
    {
      label: 'PD calibration',
      value: policy.calibrationRule.enabled ? `A PD challenger's portfolio Jeffreys p above α = ${policy.calibrationRule.alpha}` : 'Not checked',
    },
    { label: 'Population stability', value: policy.psiRule.enabled ? `The challenger's PSI against the reference sample below ${policy.psiRule.threshold}` : 'Not checked' },
    {
      label: 'Uplift over time',
      value: policy.periodSignRule.enabled ? `ΔGini keeps its sign in every period with at least ${formatCount(policy.periodSignRule.minBads)} bads` : 'Not checked',
    },
    { label: 'Quorum', value: policy.quorum > 0 ? `${policy.quorum} committee ${policy.quorum === 1 ? 'vote' : 'votes'} before a decision` : 'None' },
  ];
}

/** The policy a report was judged under, in one sentence: the committee pack's wording (shared). */
export { policyInOneSentence } from '@shared/pack/record-words';
