import { type AdoptionPolicy } from '@shared/policy';
import { formatCount, formatPercent, formatShare } from '@/lib/format';

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
        ? `Swap-in bad rate not above the swap-out bad rate at a ${percent(policy.swapRule.approvalRate)} approval rate`
        : 'Not checked',
    },
    { label: 'Minimum bads', value: `At least ${formatCount(policy.minBads)} bads in the holdout` },
    { label: 'Quorum', value: policy.quorum > 0 ? `${policy.quorum} committee ${policy.quorum === 1 ? 'vote' : 'votes'} before a decision` : 'None' },
  ];
}

/**
 * The policy a report was judged under, in one sentence (the printable report's note under the
 * adoption criteria): "Policy version 3: α = 0.05 (one-sided), materiality 2 Gini points, interval
 * above zero required, swap rule at a 70.0% approval rate, at least 300 bads, quorum 2."
 */
export function policyInOneSentence(policy: AdoptionPolicy): string {
  const swapRule = policy.swapRule.enabled ? `at a ${formatPercent(policy.swapRule.approvalRate, 1)} approval rate` : 'off';
  return (
    `Policy version ${policy.version}: α = ${policy.alpha} (${policy.sided}), materiality ${policy.materialityGiniPoints} Gini points, ` +
    `interval above zero ${policy.requireIntervalAboveZero ? 'required' : 'not required'}, swap rule ${swapRule}, ` +
    `at least ${policy.minBads} bads, quorum ${policy.quorum || 'none'}.`
  );
}
