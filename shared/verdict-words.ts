import type { Criterion, VerdictOutcome } from './report';

/**
 * The sentence under a verdict's outcome, worded by the criteria that actually failed: "not
 * proven" when only materiality fails must not say the evidence fails to show the challenger is
 * better when p = 10⁻⁸. One copy, used by the verdict tab, the report and the e-mails.
 */
const phrases: Record<Criterion['id'], string> = {
  significance: 'the uplift is not statistically significant',
  materiality: 'the uplift is smaller than the policy requires',
  interval: 'the interval of the uplift does not lie above zero',
  'swap-bad-rate': 'the accounts the challenger swaps in are riskier than those it swaps out (or the rule could not be checked)',
  'minimum-bads': 'the holdout has fewer bads than the policy requires',
  segments: 'the challenger is significantly worse in at least one segment value',
  calibration: "the challenger's probabilities of default are significantly too low for the whole portfolio (Jeffreys test)",
  psi: "the challenger's score distribution has shifted from the reference sample by more than the policy allows (PSI)",
  'period-sign': 'the uplift changes sign in at least one period with enough bads',
};

export function verdictExplanation(verdict: { outcome: VerdictOutcome; criteria: readonly Criterion[] }): string {
  if (verdict.outcome === 'champion-better') return 'The champion separates good from bad significantly better than the challenger.';
  const failed = verdict.criteria.filter((criterion) => !criterion.met);
  if (verdict.outcome === 'supported' || failed.length === 0) return 'Every criterion of the adoption policy is met: the evidence supports the challenger.';
  const reasons = failed.map((criterion) => phrases[criterion.id]);
  const list = reasons.length === 1 ? reasons[0] : `${reasons.slice(0, -1).join('; ')}; and ${reasons.at(-1)}`;
  const statisticallyBetter = !failed.some((criterion) => criterion.id === 'significance');
  return `${failed.length === 1 ? 'One criterion is' : `${failed.length} criteria are`} not met: ${list}.${
    statisticallyBetter ? ' The challenger is significantly better overall, but the policy asks for more before adoption.' : ''
  }`;
}
