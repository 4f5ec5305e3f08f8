import { describe, expect, it } from 'vitest';
import { defaultAdoptionPolicy } from '@shared/policy';
import { policyInOneSentence, policyRules } from '@/features/policy/components/policy-words';

// The adoption policy in words (src/features/policy/components/policy-words.ts); expected sentences
// written out by hand from shared/policy.ts's defaults and the variations below.

describe('the adoption policy in words', () => {
  it('says the policy a report was judged under in one sentence', () => {
    expect(policyInOneSentence(defaultAdoptionPolicy)).toBe(
      'Policy version 2: α = 0.05 (one-sided), materiality 2 Gini points, interval above zero required, swap rule at a 70.0% approval rate, at least 300 bads, quorum 2.',
    );
    expect(
      policyInOneSentence({ ...defaultAdoptionPolicy, version: 4, sided: 'two-sided', alpha: 0.01, requireIntervalAboveZero: false, swapRule: { enabled: false, approvalRate: 0.725 }, quorum: 2 }),
    ).toBe('Policy version 4: α = 0.01 (two-sided), materiality 2 Gini points, interval above zero not required, swap rule off, at least 300 bads, quorum 2.');
    expect(policyInOneSentence({ ...defaultAdoptionPolicy, swapRule: { enabled: true, approvalRate: 0.7, worstCase: true } })).toBe(
      'Policy version 2: α = 0.05 (one-sided), materiality 2 Gini points, interval above zero required, swap rule at a 70.0% approval rate and at the worst case, at least 300 bads, quorum 2.',
    );
  });

  it('lists each rule with shares and counts written as everywhere else', () => {
    const rules = Object.fromEntries(policyRules({ ...defaultAdoptionPolicy, swapRule: { enabled: true, approvalRate: 0.725 }, minBads: 1500, quorum: 1 }).map((rule) => [rule.label, rule.value]));
    expect(rules['Swap sets']).toBe('Swap-in bad rate not above the swap-out bad rate at a 72.5% approval rate');
    expect(rules['Minimum bads']).toBe('At least 1,500 bads in the holdout');
    expect(rules.Quorum).toBe('1 committee vote before a decision');
    const worst = Object.fromEntries(policyRules({ ...defaultAdoptionPolicy, swapRule: { enabled: true, approvalRate: 0.7, worstCase: true } }).map((rule) => [rule.label, rule.value]));
    expect(worst['Swap sets']).toBe(
      'Swap-in bad rate not above the swap-out bad rate at a 70% approval rate, also at the worst case (every applicant without an outcome bad in the swap-in, good in the swap-out)',
    );
  });
});
